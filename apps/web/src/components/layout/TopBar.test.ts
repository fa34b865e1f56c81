import { afterEach, describe, expect, it } from "vitest";
import { flushPromises } from "@vue/test-utils";
import { messageEndpoints } from "@grainyard/contracts";
import { transport } from "../../api/http.ts";
import { mountView } from "../../test/mount-view.ts";
import { buyerAccount, sawyerAccount, threadSummary } from "../../test/fixtures.ts";
import TopBar from "./TopBar.vue";

afterEach(() => {
  transport.useFetch(undefined);
  document.body.innerHTML = "";
});

const threads = {
  status: 200,
  body: { threads: [threadSummary({ unreadCount: 2 }), threadSummary({ id: "thr_2", unreadCount: 1 }), threadSummary({ id: "thr_3" })] },
};

describe("top bar", () => {
  it("gives a buyer the buyer tools and the unread count on Messages and on the phone's menu button", async () => {
    const { wrapper } = await mountView(TopBar, {
      path: "/browse",
      session: { account: buyerAccount },
      answers: { [`GET ${messageEndpoints.listThreads.path}`]: [threads] },
    });
    await flushPromises();
    expect(wrapper.findAll(".topbar__list a").map((a) => a.text().replace(/\s+/g, " ").trim())).toEqual([
      "Browse",
      "Favourites",
      "Saved searches",
      "Messages 3 unread",
      "My orders",
      "My account",
    ]);
    expect(wrapper.find('[data-test="unread-badge"]').text()).toBe("3 unread");
    expect(wrapper.find('[data-test="menu-unread"]').text()).toContain("3");
    wrapper.unmount();
  });

  it("gives a sawyer Messages beside the yard, with no badge when all is read", async () => {
    const { wrapper } = await mountView(TopBar, {
      path: "/yard",
      session: { account: sawyerAccount },
      answers: {
        [`GET ${messageEndpoints.listThreads.path}`]: [{ status: 200, body: { threads: [threadSummary({ myRole: "sawyer" })] } }],
      },
    });
    await flushPromises();
    expect(wrapper.findAll(".topbar__list a").map((a) => a.text().trim())).toEqual([
      "My yard",
      "Offers",
      "Orders",
      "Messages",
      "Payouts",
      "Security",
    ]);
    expect(wrapper.find('[data-test="unread-badge"]').exists()).toBe(false);
    wrapper.unmount();
  });

  it("asks for no messages for someone not signed in", async () => {
    const { wrapper, fetchMock } = await mountView(TopBar, { path: "/" });
    await flushPromises();
    expect(fetchMock.mock.calls.some(([url]) => String(url).startsWith(messageEndpoints.listThreads.path))).toBe(false);
    expect(wrapper.find('[data-test="nav-messages"]').exists()).toBe(false);
    wrapper.unmount();
  });
});
