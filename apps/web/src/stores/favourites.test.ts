import { afterEach, describe, expect, it, vi } from "vitest";
import { flushPromises } from "@vue/test-utils";
import { pathOf, catalogueEndpoints, buyerEndpoints } from "@grainyard/contracts";
import { transport } from "../api/http.ts";
import { mountView, type StubbedAnswer } from "../test/mount-view.ts";
import { buyerAccount, oakCard } from "../test/fixtures.ts";
import BrowseView from "../views/BrowseView.vue";
import FavouritesView from "../views/FavouritesView.vue";
import { useFavouritesStore } from "./favourites.ts";

afterEach(() => {
  transport.useFetch(undefined);
  document.body.innerHTML = "";
});

const page: StubbedAnswer = {
  status: 200,
  body: { results: [oakCard], total: 1, totalIsAtLeast: false, nextCursor: null, near: null, fitTop: null },
};
const put = `PUT ${pathOf(buyerEndpoints.addFavourite, { listingId: oakCard.listingId })}`;
const del = `DELETE ${pathOf(buyerEndpoints.addFavourite, { listingId: oakCard.listingId })}`;

/** A promise the test settles by hand, to look at the heart while the request is on its way. */
function deferred() {
  let resolve!: (answer: StubbedAnswer) => void;
  const promise = new Promise<StubbedAnswer>((r) => (resolve = r));
  return { promise, resolve };
}

describe("favourites", () => {
  it("fills the heart at once, keeps it when the API agrees, and a second tap takes it off", async () => {
    const { wrapper, fetchMock } = await mountView(BrowseView, {
      path: "/browse",
      session: { account: buyerAccount },
      answers: {
        [`GET ${catalogueEndpoints.searchCatalogue.path}`]: [page],
        [`GET ${buyerEndpoints.listFavourites.path}`]: [{ status: 200, body: { favourites: [] } }],
        [put]: [{ status: 200, body: { favourite: { listingId: oakCard.listingId, createdAt: "2026-12-02T10:00:00.000Z" } } }],
        [del]: [{ status: 204 }],
      },
    });
    const heart = () => wrapper.find('[data-test="favourite-toggle"]');
    expect(heart().attributes("aria-pressed")).toBe("false");
    await heart().trigger("click");
    // Optimistic: pressed before the answer is read.
    expect(heart().attributes("aria-pressed")).toBe("true");
    await flushPromises();
    expect(heart().attributes("aria-pressed")).toBe("true");
    expect(
      fetchMock.mock.calls.some(
        ([url, init]) =>
          String(url) === pathOf(buyerEndpoints.addFavourite, { listingId: oakCard.listingId }) && (init as RequestInit).method === "PUT",
      ),
    ).toBe(true);
    // The click did not open the slab page (the heart sits on the card's link).
    expect(wrapper.vm.$router.currentRoute.value.path).toBe("/browse");

    await heart().trigger("click");
    await flushPromises();
    expect(heart().attributes("aria-pressed")).toBe("false");
  });

  it("takes the heart back and says why when the API refuses", async () => {
    const { wrapper } = await mountView(BrowseView, {
      path: "/browse",
      session: { account: buyerAccount },
      answers: {
        [`GET ${catalogueEndpoints.searchCatalogue.path}`]: [page],
        [`GET ${buyerEndpoints.listFavourites.path}`]: [{ status: 200, body: { favourites: [] } }],
        [put]: [{ status: 404, body: { error: { code: "not_found", message: "That slab is not for sale here." } } }],
      },
    });
    await wrapper.find('[data-test="favourite-toggle"]').trigger("click");
    expect(wrapper.find('[data-test="favourite-toggle"]').attributes("aria-pressed")).toBe("true");
    await flushPromises();
    expect(wrapper.find('[data-test="favourite-toggle"]').attributes("aria-pressed")).toBe("false");
    expect(wrapper.find('[data-test="favourite-error"]').text()).toBe("This slab is no longer for sale, so it can't be saved.");
  });

  it("ignores a second tap while the first is on its way", async () => {
    const slow = deferred();
    const { session } = await mountView(BrowseView, {
      path: "/browse",
      session: { account: buyerAccount },
      answers: {
        [`GET ${catalogueEndpoints.searchCatalogue.path}`]: [page],
        [`GET ${buyerEndpoints.listFavourites.path}`]: [{ status: 200, body: { favourites: [] } }],
      },
    });
    expect(session.isBuyer).toBe(true);
    const store = useFavouritesStore();
    let puts = 0;
    transport.useFetch((async (url: string, init?: RequestInit) => {
      if (init?.method === "PUT") {
        puts++;
        const answer = await slow.promise;
        return new Response(JSON.stringify(answer.body), { status: answer.status });
      }
      return new Response("{}", { status: 200 });
    }) as unknown as typeof fetch);
    const first = store.toggle(oakCard.listingId);
    const second = store.toggle(oakCard.listingId);
    expect(await second).toBe(true);
    slow.resolve({ status: 200, body: { favourite: { listingId: oakCard.listingId, createdAt: "2026-12-02T10:00:00.000Z" } } });
    expect(await first).toBe(true);
    expect(puts).toBe(1);
    expect(store.isFavourite(oakCard.listingId)).toBe(true);
  });

  it("sends an anonymous person to sign in and back to the same page", async () => {
    const { wrapper, router } = await mountView(BrowseView, {
      path: "/browse?seats=8",
      answers: { [`GET ${catalogueEndpoints.searchCatalogue.path}`]: [page] },
    });
    await wrapper.find('[data-test="favourite-toggle"]').trigger("click");
    // The sign-in page loads on demand: wait for the navigation to finish.
    await vi.waitFor(() => expect(router.currentRoute.value.path).toBe("/sign-in"), { timeout: 5000 });
    expect(router.currentRoute.value.query.next).toBe("/browse?seats=8");
  });

  it("lists the favourites page's cards, and a heart tapped off there leaves the list", async () => {
    const { wrapper } = await mountView(FavouritesView, {
      path: "/favourites",
      session: { account: buyerAccount },
      answers: {
        [`GET ${buyerEndpoints.listFavourites.path}`]: [{ status: 200, body: { favourites: [oakCard] } }],
        [del]: [{ status: 204 }],
      },
    });
    expect(wrapper.findAll('[data-test="catalogue-card"]')).toHaveLength(1);
    expect(wrapper.find('[data-test="favourite-toggle"]').attributes("aria-pressed")).toBe("true");
    await wrapper.find('[data-test="favourite-toggle"]').trigger("click");
    await flushPromises();
    expect(wrapper.findAll('[data-test="catalogue-card"]')).toHaveLength(0);
    expect(wrapper.find('[data-test="favourites-empty"]').exists()).toBe(true);
  });

  it("shows the empty state when nothing is saved", async () => {
    const { wrapper } = await mountView(FavouritesView, {
      path: "/favourites",
      session: { account: buyerAccount },
      answers: { [`GET ${buyerEndpoints.listFavourites.path}`]: [{ status: 200, body: { favourites: [] } }] },
    });
    expect(wrapper.find('[data-test="favourites-empty"]').text()).toContain("Tap the heart");
  });
});
