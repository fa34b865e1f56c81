import { afterEach, describe, expect, it } from "vitest";
import { flushPromises, mount } from "@vue/test-utils";
import { createPinia, setActivePinia } from "pinia";
import { createMemoryHistory } from "vue-router";
import { orderReviewEndpoints, pathOf, type Order, type OrderReview } from "@grainyard/contracts";
import { transport } from "../../api/http.ts";
import { createGrainyardRouter } from "../../router.ts";
import { useSessionStore } from "../../stores/session.ts";
import { appPlugins } from "../../test/app-plugins.ts";
import { buyerAccount, sawyerAccount } from "../../test/fixtures.ts";
import OrderReviewPanel from "./OrderReviewPanel.vue";

const orderId = "0d7e7a52-2222-4000-8000-000000000002";
const reviewPath = pathOf(orderReviewEndpoints.getOrderReview, { orderId });
const order = (viewerIs: Order["viewerIs"]) =>
  ({
    id: orderId,
    status: "completed",
    viewerIs,
    parties: { buyerName: "Ana and Theo Brandt", yardName: "Ridgeback Urban Timber" },
  }) as Order;
const review: OrderReview = {
  id: "rev_1",
  orderId,
  listingId: "lst_oak",
  sawyerId: "acc_sawyer",
  yardName: "Ridgeback Urban Timber",
  title: "Wide red oak dining slab, seats eight",
  buyerName: "Ana and Theo Brandt",
  buyerLabel: "Ana and Theo B.",
  rating: 4,
  matchedListing: false,
  matchedListingComment: "One end was 8 mm thinner.",
  handoverWentWell: true,
  handoverComment: "",
  body: "Lovely grain.",
  createdAt: "2026-11-02T10:00:00.000Z",
  editedAt: null,
  editableUntil: "2026-11-16T10:00:00.000Z",
  answer: null,
  hidden: null,
};

afterEach(() => {
  transport.useFetch(undefined);
  document.body.innerHTML = "";
});

async function mountPanel(account: unknown, viewerIs: Order["viewerIs"], answers: Record<string, { status: number; body?: unknown }[]>) {
  const requests: { key: string; body: unknown }[] = [];
  transport.useFetch((async (url: string, init?: RequestInit) => {
    const key = `${init?.method ?? "GET"} ${String(url).split("?")[0]}`;
    requests.push({ key, body: init?.body ? JSON.parse(String(init.body)) : undefined });
    const answer = answers[key]?.shift();
    if (!answer) return new Response(JSON.stringify({ account, csrfToken: "t" }), { status: 200 });
    return new Response(JSON.stringify(answer.body), { status: answer.status });
  }) as unknown as typeof fetch);
  const pinia = createPinia();
  setActivePinia(pinia);
  transport.useCsrfToken(() => useSessionStore(pinia).csrfToken);
  const router = createGrainyardRouter(pinia, createMemoryHistory());
  await router.push(`/orders/${orderId}`);
  await router.isReady();
  const wrapper = mount(OrderReviewPanel, {
    props: { order: order(viewerIs) },
    global: { plugins: appPlugins(pinia, router) },
    attachTo: document.body,
  });
  await flushPromises();
  return { wrapper, requests };
}

describe("OrderReviewPanel", () => {
  it("lets the buyer write a review: a no needs a comment before anything is sent; then the review shows with its change button", async () => {
    const { wrapper, requests } = await mountPanel(buyerAccount, "buyer", {
      [`GET ${reviewPath}`]: [{ status: 200, body: { review: null, actions: ["write"] } }],
      [`POST ${reviewPath}`]: [{ status: 201, body: { review, actions: ["edit"] } }],
    });
    expect(wrapper.find("h2").text()).toBe("How did it go?");
    await wrapper.find('[data-test="rating-4"]').setValue(true);
    await wrapper.find('[data-test="matched-no"]').setValue(true);
    await wrapper.find('[data-test="handover-yes"]').setValue(true);
    await wrapper.find('[data-test="review-form"]').trigger("submit");
    expect(wrapper.text()).toContain("Say what did not match");
    expect(requests.some((r) => r.key === `POST ${reviewPath}`)).toBe(false);

    await wrapper.find('[data-test="matched-comment"]').setValue("One end was 8 mm thinner.");
    await wrapper.find('[data-test="review-text"]').setValue("Lovely grain.");
    await wrapper.find('[data-test="review-form"]').trigger("submit");
    await flushPromises();
    expect(requests.find((r) => r.key === `POST ${reviewPath}`)?.body).toEqual({
      rating: 4,
      matchedListing: false,
      matchedListingComment: "One end was 8 mm thinner.",
      handoverWentWell: true,
      handoverComment: "",
      body: "Lovely grain.",
    });
    expect(wrapper.find('[data-test="review-rating"]').text()).toBe("4 of 5");
    expect(wrapper.find('[data-test="review-notice"]').text()).toContain("your review is on the yard's page");
    expect(wrapper.find('[data-test="edit-review"]').exists()).toBe(true);
  });

  it("lets the sawyer answer once and report the review", async () => {
    const answerPath = pathOf(orderReviewEndpoints.answerReview, { orderId });
    const answered = { ...review, answer: { body: "Sorry about that end; glad you like it.", answeredAt: "2026-11-03T09:00:00.000Z" } };
    const { wrapper, requests } = await mountPanel(sawyerAccount, "sawyer", {
      [`GET ${reviewPath}`]: [{ status: 200, body: { review, actions: ["answer"] } }],
      [`POST ${answerPath}`]: [{ status: 201, body: { review: answered, actions: [] } }],
    });
    expect(wrapper.find('[data-test="report-review"]').exists()).toBe(true);
    await wrapper.find('[data-test="answer-text"]').setValue("Sorry about that end; glad you like it.");
    await wrapper.find('[data-test="answer-form"]').trigger("submit");
    await flushPromises();
    expect(requests.find((r) => r.key === `POST ${answerPath}`)?.body).toEqual({ body: "Sorry about that end; glad you like it." });
    expect(wrapper.find('[data-test="review-answer"]').text()).toContain("Answer from Ridgeback Urban Timber");
    expect(wrapper.find('[data-test="answer-form"]').exists()).toBe(false);
  });

  it("shows its buyer why a review is hidden, with nothing left to change", async () => {
    const hidden = { ...review, hidden: { reason: "Contact details in the text.", hiddenAt: "2026-11-04T09:00:00.000Z" } };
    const { wrapper } = await mountPanel(buyerAccount, "buyer", {
      [`GET ${reviewPath}`]: [{ status: 200, body: { review: hidden, actions: [] } }],
    });
    expect(wrapper.find('[data-test="review-hidden"]').text()).toContain("Contact details in the text.");
    expect(wrapper.find('[data-test="edit-review"]').exists()).toBe(false);
  });
});
