import { afterEach, beforeEach, describe, expect, it } from "vitest";
import { flushPromises } from "@vue/test-utils";
import { catalogueEndpoints, buyerEndpoints } from "@grainyard/contracts";
import { transport } from "../../api/http.ts";
import { mountView, type StubbedAnswer } from "../../test/mount-view.ts";
import { buyerAccount, oakCard, sawyerAccount, savedSearch } from "../../test/fixtures.ts";
import { UNITS_STORAGE_KEY } from "../../stores/units.ts";
import BrowseView from "../../views/BrowseView.vue";

beforeEach(() => localStorage.setItem(UNITS_STORAGE_KEY, "metric"));
afterEach(() => {
  transport.useFetch(undefined);
  localStorage.removeItem(UNITS_STORAGE_KEY);
  document.body.innerHTML = "";
});

const SEARCH = `GET ${catalogueEndpoints.searchCatalogue.path}`;
const page: StubbedAnswer = {
  status: 200,
  body: { results: [oakCard], total: 1, totalIsAtLeast: false, nextCursor: null, near: null, fitTop: null },
};
const noFavourites: StubbedAnswer = { status: 200, body: { favourites: [] } };

function posted(fetchMock: { mock: { calls: unknown[][] } }) {
  return fetchMock.mock.calls
    .filter(([url, init]) => String(url) === buyerEndpoints.listSavedSearches.path && (init as RequestInit | undefined)?.method === "POST")
    .map(([, init]) => JSON.parse(String((init as RequestInit).body)));
}

describe("Save this search, on the catalogue", () => {
  it("saves the search in the URL (without its sort) under the name and alerts the buyer chose", async () => {
    const { wrapper, fetchMock } = await mountView(BrowseView, {
      path: "/browse?seats=8&species=northern-red-oak&sort=price_low",
      session: { account: buyerAccount },
      answers: {
        [SEARCH]: [page],
        [`GET ${buyerEndpoints.listFavourites.path}`]: [noFavourites],
        [`POST ${buyerEndpoints.listSavedSearches.path}`]: [
          {
            status: 201,
            body: { savedSearch: savedSearch({ name: "Oak for eight", query: "species=northern-red-oak&seats=8", alerts: false }) },
          },
        ],
      },
    });
    await wrapper.find('[data-test="save-search-open"]').trigger("click");
    const name = wrapper.find<HTMLInputElement>('[data-test="save-search-name"]');
    // A first name from the filters, in words.
    expect(name.element.value).toBe("Northern red oak, Table for 8");
    await name.setValue("Oak for eight");
    await wrapper.find('[data-test="save-search-alerts"]').setValue(false);
    await wrapper.find('[data-test="save-search-form"]').trigger("submit");
    await flushPromises();

    expect(posted(fetchMock)).toEqual([{ name: "Oak for eight", query: "species=northern-red-oak&seats=8", alerts: false }]);
    expect(wrapper.find('[data-test="save-search-done"]').text()).toContain("Saved as “Oak for eight”");
    expect(wrapper.find('[data-test="save-search-done"] a').attributes("href")).toBe("/saved-searches");
  });

  it("keeps the form and shows the API's messages when it refuses", async () => {
    const { wrapper } = await mountView(BrowseView, {
      path: "/browse?seats=8",
      session: { account: buyerAccount },
      answers: {
        [SEARCH]: [page],
        [`GET ${buyerEndpoints.listFavourites.path}`]: [noFavourites],
        [`POST ${buyerEndpoints.listSavedSearches.path}`]: [
          {
            status: 409,
            body: {
              error: { code: "too_many_saved_searches", message: "You can keep up to 50 saved searches. Delete one you no longer use." },
            },
          },
        ],
      },
    });
    await wrapper.find('[data-test="save-search-open"]').trigger("click");
    await wrapper.find('[data-test="save-search-form"]').trigger("submit");
    await flushPromises();
    expect(wrapper.find('[data-test="save-search-error"]').text()).toContain("up to 50 saved searches");
    expect(wrapper.find('[data-test="save-search-form"]').exists()).toBe(true);
    expect((wrapper.find('[data-test="save-search-submit"]').element as HTMLButtonElement).disabled).toBe(false);
  });

  it("asks for a name without calling the API when the name is blank", async () => {
    const { wrapper, fetchMock } = await mountView(BrowseView, {
      path: "/browse?seats=8",
      session: { account: buyerAccount },
      answers: { [SEARCH]: [page], [`GET ${buyerEndpoints.listFavourites.path}`]: [noFavourites] },
    });
    await wrapper.find('[data-test="save-search-open"]').trigger("click");
    await wrapper.find('[data-test="save-search-name"]').setValue("   ");
    await wrapper.find('[data-test="save-search-form"]').trigger("submit");
    await flushPromises();
    expect(wrapper.find("#save-search-name-note").text()).toBe("Give the search a name.");
    expect(posted(fetchMock)).toEqual([]);
  });

  it("asks anyone not signed in to sign in, and brings them back to the same search with the form open", async () => {
    const { wrapper, router } = await mountView(BrowseView, {
      path: "/browse?seats=8&species=black-walnut",
      answers: { [SEARCH]: [page] },
    });
    await wrapper.find('[data-test="save-search-open"]').trigger("click");
    const link = wrapper.find('[data-test="save-search-sign-in-link"]');
    const next = new URL(link.attributes("href")!, "http://x").searchParams.get("next")!;
    expect(router.resolve(next).path).toBe("/browse");
    expect(router.resolve(next).query).toEqual({ seats: "8", species: "black-walnut", save: "1" });
  });

  it("opens the form on arrival after signing in, and tidies the URL", async () => {
    const { wrapper, router } = await mountView(BrowseView, {
      path: "/browse?seats=8&save=1",
      session: { account: buyerAccount },
      answers: { [SEARCH]: [page], [`GET ${buyerEndpoints.listFavourites.path}`]: [noFavourites] },
    });
    await flushPromises();
    expect(wrapper.find('[data-test="save-search-form"]').exists()).toBe(true);
    expect(router.currentRoute.value.query).toEqual({ seats: "8" });
  });

  it("is not offered to a sawyer", async () => {
    const { wrapper } = await mountView(BrowseView, {
      path: "/browse?seats=8",
      session: { account: sawyerAccount },
      answers: { [SEARCH]: [page] },
    });
    expect(wrapper.find('[data-test="save-search"]').exists()).toBe(false);
    expect(wrapper.find('[data-test="favourite-toggle"]').exists()).toBe(false);
  });
});
