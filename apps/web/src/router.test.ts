import { afterEach, describe, expect, it, vi } from "vitest";
import { createPinia } from "pinia";
import { createMemoryHistory } from "vue-router";
import { transport } from "./api/http.ts";
import { createGrainyardRouter, safeNextPath } from "./router.ts";
import { useSessionStore } from "./stores/session.ts";

afterEach(() => transport.useFetch(undefined));

function routerWithSession(account: unknown, fails = false) {
  const fetchMock = vi.fn(async () => {
    if (fails) throw new TypeError("Failed to fetch");
    return new Response(JSON.stringify({ account, csrfToken: "t" }), { status: 200 });
  });
  transport.useFetch(fetchMock as unknown as typeof fetch);
  const pinia = createPinia();
  return { router: createGrainyardRouter(pinia, createMemoryHistory()), session: useSessionStore(pinia) };
}

const buyer = {
  id: "acc_3",
  email: "juniper@example.org",
  displayName: "Juniper Oake",
  role: "buyer",
  emailVerified: true,
  yardName: null,
  yardSlug: null,
  yardStory: null,
  pickupTown: null,
  createdAt: "2025-02-01T12:00:00.000Z",
};

describe("route guards", () => {
  it("sends anonymous people to sign in, remembering where they were going", async () => {
    const { router } = routerWithSession(null);
    await router.push("/yard");
    expect(router.currentRoute.value.path).toBe("/sign-in");
    expect(router.currentRoute.value.query.next).toBe("/yard");
    // The first navigation compiles the lazy views on the fly: slow on a busy machine.
  }, 20_000);

  it("lets the wrong role reach the page (App shows 'not for your account')", async () => {
    const { router, session } = routerWithSession(buyer);
    await router.push("/admin");
    expect(router.currentRoute.value.path).toBe("/admin");
    expect(session.role).toBe("buyer");
  });

  it("sends a signed-in buyer away from sign-in to their own home", async () => {
    const { router } = routerWithSession(buyer);
    await router.push("/sign-in");
    expect(router.currentRoute.value.path).toBe("/account");
  });

  it("does not bounce to sign-in when the session cannot be read (offline)", async () => {
    const { router, session } = routerWithSession(null, true);
    await router.push("/yard");
    expect(router.currentRoute.value.path).toBe("/yard");
    expect(session.status).toBe("error");
    expect(session.loadError?.code).toBe("offline");
  });

  it("shows unknown paths as not found", async () => {
    const { router } = routerWithSession(null);
    // (/slabs/:listingId is the slab page now; an address with no route at all is not found.)
    await router.push("/sawdust/does-not-exist");
    expect(router.currentRoute.value.name).toBe("not-found");
  });
});

describe("safeNextPath", () => {
  it("keeps paths inside the app and drops everything else", () => {
    expect(safeNextPath("/account?tab=orders")).toBe("/account?tab=orders");
    expect(safeNextPath("//evil.example")).toBeNull();
    expect(safeNextPath("/\\evil.example")).toBeNull();
    expect(safeNextPath("https://evil.example")).toBeNull();
    expect(safeNextPath(["/a"])).toBeNull();
  });
});

describe("operator desk pages", () => {
  it("every /admin page is for admins only", async () => {
    const { routes } = await import("./router.ts");
    const adminPages = routes.filter((r) => r.path.startsWith("/admin"));
    expect(adminPages.map((r) => r.path).sort()).toEqual([
      "/admin",
      "/admin/audit",
      "/admin/buyer-reviews",
      "/admin/orders",
      "/admin/outbox",
      "/admin/payouts",
      "/admin/problems",
      "/admin/reports",
      "/admin/review",
      "/admin/settings",
      "/admin/users",
    ]);
    for (const page of adminPages) expect(page.meta?.roles).toEqual(["admin"]);
  });
});
