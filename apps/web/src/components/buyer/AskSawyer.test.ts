import { afterEach, describe, expect, it } from "vitest";
import { flushPromises, mount } from "@vue/test-utils";
import { createPinia, setActivePinia } from "pinia";
import { createMemoryHistory } from "vue-router";
import { pathOf, messageEndpoints } from "@grainyard/contracts";
import { transport } from "../../api/http.ts";
import { appPlugins } from "../../test/app-plugins.ts";
import { createGrainyardRouter } from "../../router.ts";
import { useSessionStore } from "../../stores/session.ts";
import { buyerAccount, sawyerAccount, threadSummary } from "../../test/fixtures.ts";
import AskSawyer from "./AskSawyer.vue";

afterEach(() => {
  transport.useFetch(undefined);
  document.body.innerHTML = "";
});

async function mountAsk(account: unknown, answers: Record<string, { status: number; body?: unknown }>) {
  const requests: { key: string; body: unknown }[] = [];
  transport.useFetch((async (url: string, init?: RequestInit) => {
    const key = `${init?.method ?? "GET"} ${String(url).split("?")[0]}`;
    requests.push({ key, body: init?.body ? JSON.parse(String(init.body)) : undefined });
    const answer = answers[key];
    if (!answer) return new Response(JSON.stringify({ account, csrfToken: "t" }), { status: 200 });
    return new Response(answer.body === undefined ? null : JSON.stringify(answer.body), { status: answer.status });
  }) as unknown as typeof fetch);
  const pinia = createPinia();
  setActivePinia(pinia);
  transport.useCsrfToken(() => useSessionStore(pinia).csrfToken);
  const router = createGrainyardRouter(pinia, createMemoryHistory());
  await router.push("/slabs/lst_oak");
  await router.isReady();
  await useSessionStore(pinia).load();
  const wrapper = mount(AskSawyer, {
    props: { listingId: "lst_oak", yardName: "Ridgeback Urban Timber" },
    global: { plugins: appPlugins(pinia, router) },
  });
  await flushPromises();
  return { wrapper, requests };
}

describe("Ask the sawyer", () => {
  it("sends a buyer's question and links the conversation", async () => {
    const thread = threadSummary({ lastMessage: null });
    const { wrapper, requests } = await mountAsk(buyerAccount, {
      [`GET ${messageEndpoints.listThreads.path}`]: { status: 200, body: { threads: [] } },
      [`POST ${pathOf(messageEndpoints.askAboutListing, { listingId: "lst_oak" })}`]: {
        status: 201,
        body: {
          thread,
          message: {
            id: "1",
            threadId: thread.id,
            authorId: "acc_buyer",
            authorName: "Ana",
            fromMe: true,
            body: "Is it flat?",
            createdAt: thread.createdAt,
            readAt: null,
          },
        },
      },
    });
    await wrapper.find('[data-test="ask-body"]').setValue("Is it flat?");
    await wrapper.find("form").trigger("submit");
    expect(wrapper.find('[data-test="ask-send"]').text()).toBe("Sending…");
    await flushPromises();
    expect(requests.find((r) => r.key.startsWith("POST"))?.body).toEqual({ body: "Is it flat?" });
    expect(wrapper.find('[data-test="ask-sent"]').text()).toContain("Sent to Ridgeback Urban Timber");
    expect(wrapper.find('[data-test="ask-open-thread"]').attributes("href")).toBe(`/messages/${thread.id}`);
  }, 20_000); // The first mount compiles the slab page on the fly: slow on a busy machine.

  it("points to the earlier conversation when the buyer asked before", async () => {
    const { wrapper } = await mountAsk(buyerAccount, {
      [`GET ${messageEndpoints.listThreads.path}`]: { status: 200, body: { threads: [threadSummary({ id: "thr_old" })] } },
    });
    expect(wrapper.find('[data-test="ask-open-thread"]').attributes("href")).toBe("/messages/thr_old");
  });

  it("shows the API's reason and keeps the question when it is refused", async () => {
    const { wrapper } = await mountAsk(buyerAccount, {
      [`GET ${messageEndpoints.listThreads.path}`]: { status: 200, body: { threads: [] } },
      [`POST ${pathOf(messageEndpoints.askAboutListing, { listingId: "lst_oak" })}`]: {
        status: 404,
        body: { error: { code: "not_found", message: "That slab is not for sale here." } },
      },
    });
    await wrapper.find('[data-test="ask-body"]').setValue("Still there?");
    await wrapper.find("form").trigger("submit");
    await flushPromises();
    expect(wrapper.find('[data-test="ask-error"]').text()).toBe("That slab is not for sale here.");
    expect((wrapper.find('[data-test="ask-body"]').element as HTMLTextAreaElement).value).toBe("Still there?");
  });

  it("asks anyone not signed in to sign in first, and hides from sawyers", async () => {
    const anonymous = await mountAsk(null, {});
    expect(anonymous.wrapper.find('[data-test="ask-sign-in"]').attributes("href")).toBe("/sign-in?next=/slabs/lst_oak");
    const sawyer = await mountAsk(sawyerAccount, {});
    expect(sawyer.wrapper.find('[data-test="ask-sawyer"]').exists()).toBe(false);
  });
});
