import { afterEach, describe, expect, it } from "vitest";
import { flushPromises, mount } from "@vue/test-utils";
import { createPinia, setActivePinia } from "pinia";
import { createMemoryHistory } from "vue-router";
import { orderReviewEndpoints, pathOf, type PublicReview } from "@grainyard/contracts";
import { transport } from "../../api/http.ts";
import { createGrainyardRouter } from "../../router.ts";
import { appPlugins } from "../../test/app-plugins.ts";
import YardReviewList from "./YardReviewList.vue";

const sawyerId = "acc_sawyer";
const reviewsPath = pathOf(orderReviewEndpoints.yardReviews, { sawyerId });
const review = (n: number): PublicReview => ({
  id: `rev_${n}`,
  listingId: `lst_${n}`,
  title: `Slab number ${n}`,
  buyerLabel: "Ines C.",
  rating: 5,
  matchedListing: true,
  matchedListingComment: "",
  handoverWentWell: true,
  handoverComment: "",
  body: `Review body ${n}.`,
  createdAt: "2026-10-14T10:00:00.000Z",
  editedAt: null,
  answer: null,
});
const page = (numbers: number[], nextCursor: string | null) => ({
  yard: { id: sawyerId, name: "Ridgeback Urban Timber", town: "Lakemont" },
  rating: { count: 3, average: 5, matchedListingPct: 100, handoverPct: 100 },
  reviews: numbers.map(review),
  nextCursor,
});
const cursor = "1792000000000.0d7e7a52-2222-4000-8000-000000000002";

afterEach(() => {
  transport.useFetch(undefined);
  document.body.innerHTML = "";
});

async function mountList(answers: { status: number; body: unknown }[]) {
  const urls: string[] = [];
  transport.useFetch((async (url: string) => {
    urls.push(String(url));
    const answer = String(url).startsWith(reviewsPath) ? answers.shift() : undefined;
    if (!answer) return new Response(JSON.stringify({ account: null, csrfToken: "t" }), { status: 200 });
    return new Response(JSON.stringify(answer.body), { status: answer.status });
  }) as unknown as typeof fetch);
  const pinia = createPinia();
  setActivePinia(pinia);
  const router = createGrainyardRouter(pinia, createMemoryHistory());
  await router.push("/");
  await router.isReady();
  const wrapper = mount(YardReviewList, { props: { sawyerId, pageSize: 2 }, global: { plugins: appPlugins(pinia, router) } });
  await flushPromises();
  return { wrapper, urls: () => urls.filter((url) => url.startsWith(reviewsPath)) };
}

describe("YardReviewList", () => {
  it("shows the first page, appends the next with the API's cursor, and hides the button after the last", async () => {
    const { wrapper, urls } = await mountList([
      { status: 200, body: page([1, 2], cursor) },
      { status: 200, body: page([3], null) },
    ]);
    expect(wrapper.text()).toContain("Review body 2.");
    expect(urls()).toHaveLength(1);
    expect(new URL(urls()[0]!, "http://x").searchParams.get("limit")).toBe("2");

    await wrapper.find('[data-test="more-reviews"]').trigger("click");
    await flushPromises();
    expect(new URL(urls()[1]!, "http://x").searchParams.get("cursor")).toBe(cursor);
    expect(wrapper.findAll(".yard-reviews__list > li")).toHaveLength(3);
    expect(wrapper.text()).toContain("Review body 3.");
    expect(wrapper.find('[data-test="more-reviews"]').exists()).toBe(false);
  });

  it("keeps the reviews shown when the next page fails, and says why", async () => {
    const { wrapper } = await mountList([
      { status: 200, body: page([1, 2], cursor) },
      { status: 503, body: { error: { code: "service_unavailable", message: "The reviews could not be read just now." } } },
    ]);
    await wrapper.find('[data-test="more-reviews"]').trigger("click");
    await flushPromises();
    expect(wrapper.findAll(".yard-reviews__list > li")).toHaveLength(2);
    expect(wrapper.find('[role="alert"]').text()).toContain("could not be read");
  });

  it("says so when the yard has no reviews", async () => {
    const { wrapper } = await mountList([{ status: 200, body: page([], null) }]);
    expect(wrapper.text()).toContain("No reviews yet.");
    expect(wrapper.find('[data-test="more-reviews"]').exists()).toBe(false);
  });
});
