import { afterEach, describe, expect, it, vi } from "vitest";
import { createPinia, setActivePinia } from "pinia";
import { useQueryCache } from "@pinia/colada";
import { transport } from "../api/http.ts";
import { queryKeys } from "../queries/keys.ts";
import { buyerAccount, sawyerAccount } from "../test/fixtures.ts";
import { useSessionStore } from "./session.ts";

afterEach(() => transport.useFetch(undefined));

/** The session endpoints answering with `account` (sign-in, sign-out and the session read alike). */
function answerAs(account: unknown) {
  transport.useFetch(
    vi.fn(async () => new Response(JSON.stringify({ account, csrfToken: "t" }), { status: 200 })) as unknown as typeof fetch,
  );
}

describe("session store", () => {
  it("forgets the last person's answers when the account changes, and keeps the public ones", async () => {
    const pinia = createPinia();
    setActivePinia(pinia);
    const session = useSessionStore(pinia);
    const cache = useQueryCache(pinia);
    answerAs(sawyerAccount);
    await session.load();

    cache.setQueryData(queryKeys.yard.slabs, [{ id: "slab-1" }]);
    cache.setQueryData(queryKeys.messages.threads(sawyerAccount.id), []);
    cache.setQueryData(queryKeys.catalogue.listing("listing-1"), { title: "Oak" });
    cache.setQueryData(queryKeys.checkout.quote("listing-1"), { totalMinor: 100 });

    // The same person again (a fresh anti-forgery token): nothing is forgotten.
    await session.load();
    expect(cache.getQueryData(queryKeys.yard.slabs)).toEqual([{ id: "slab-1" }]);

    answerAs(null);
    await session.signOut();
    expect(cache.getQueryData(queryKeys.yard.slabs)).toBeUndefined();
    expect(cache.getQueryData(queryKeys.messages.threads(sawyerAccount.id))).toBeUndefined();
    expect(cache.getQueryData(queryKeys.catalogue.listing("listing-1"))).toEqual({ title: "Oak" });
    expect(cache.getQueryData(queryKeys.checkout.quote("listing-1"))).toEqual({ totalMinor: 100 });

    // From no one to someone: nothing to forget.
    answerAs(buyerAccount);
    await session.signIn({ email: buyerAccount.email, password: "long enough password" });
    expect(cache.getQueryData(queryKeys.catalogue.listing("listing-1"))).toEqual({ title: "Oak" });

    // Another person signs in on the same tab: the buyer's answers go.
    cache.setQueryData(queryKeys.messages.threads(buyerAccount.id), [{ id: "thread-1" }]);
    answerAs(sawyerAccount);
    await session.signIn({ email: sawyerAccount.email, password: "long enough password" });
    expect(cache.getQueryData(queryKeys.messages.threads(buyerAccount.id))).toBeUndefined();
  });
});
