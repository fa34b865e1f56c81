import { afterEach, beforeEach, describe, expect, it } from "vitest";
import { flushPromises } from "@vue/test-utils";
import { catalogueEndpoints, type CatalogueCard, type CatalogueResult } from "@grainyard/contracts";
import { topLengthForSeats } from "@grainyard/slab-math";
import { transport } from "../api/http.ts";
import { mountView, type StubbedAnswer } from "../test/mount-view.ts";
import BrowseView from "./BrowseView.vue";
import { UNITS_STORAGE_KEY } from "../stores/units.ts";
import { oakCard } from "../test/fixtures.ts";

// Metric for these tests (happy-dom says en-US, which would guess imperial).
beforeEach(() => localStorage.setItem(UNITS_STORAGE_KEY, "metric"));

afterEach(() => {
  transport.useFetch(undefined);
  localStorage.removeItem(UNITS_STORAGE_KEY);
  document.body.innerHTML = "";
});

const SEARCH = `GET ${catalogueEndpoints.searchCatalogue.path}`;

const oak: CatalogueCard = {
  ...oakCard,
  photoUrl: "/api/v1/photos/p1/small.webp",
  photoMediumUrl: "/api/v1/photos/p1/medium.webp",
  photoAlt: "Slab 3 of the Fountain Park log, top face",
};

function page(results: CatalogueCard[], extra: Partial<CatalogueResult> = {}): StubbedAnswer {
  return {
    status: 200,
    body: { results, total: results.length, totalIsAtLeast: false, nextCursor: null, near: null, fitTop: null, ...extra },
  };
}

/** The query of each catalogue search the page sent. */
function searches(fetchMock: { mock: { calls: unknown[][] } }): URLSearchParams[] {
  return fetchMock.mock.calls
    .map(([url]) => String(url))
    .filter((url) => url.startsWith(catalogueEndpoints.searchCatalogue.path))
    .map((url) => new URLSearchParams(url.split("?")[1] ?? ""));
}

describe("BrowseView: the catalogue", () => {
  it("restores the filters from the URL and asks the API for exactly them", async () => {
    const { wrapper, fetchMock } = await mountView(BrowseView, {
      path: "/browse?species=black-walnut&lengthMin=2000&ready=1&sort=price_low",
      answers: { [SEARCH]: [page([oak])] },
    });
    const [query] = searches(fetchMock);
    expect(query?.get("species")).toBe("black-walnut");
    expect(query?.get("lengthMin")).toBe("2000");
    expect(query?.get("ready")).toBe("1");
    expect(query?.get("sort")).toBe("price_low");
    expect(wrapper.find('[data-test="result-count"]').text()).toBe("1 slab");
    expect(wrapper.findAll('[data-test="catalogue-card"]')).toHaveLength(1);
    expect((wrapper.find('[data-test="sort"]').element as HTMLSelectElement).value).toBe("price_low");
  });

  it("shows how many live slabs each species has in the filter, species with slabs first", async () => {
    const { wrapper } = await mountView(BrowseView, {
      path: "/browse",
      answers: {
        [SEARCH]: [page([oak])],
        [`GET ${catalogueEndpoints.speciesCounts.path}`]: [
          {
            status: 200,
            body: {
              species: [
                { slug: "black-walnut", liveSlabs: 3 },
                { slug: "white-oak", liveSlabs: 1 },
              ],
            },
          },
        ],
      },
    });
    expect(wrapper.find('[data-test="species-count-black-walnut"]').text()).toBe("3 live slabs");
    expect(wrapper.find('[data-test="species-count-white-oak"]').text()).toBe("1 live slab");
    // The short list leads with what can be bought now.
    const shown = wrapper.findAll(".species-filter__common").map((name) => name.text());
    expect(shown.slice(0, 2)).toEqual(["Black walnut", "White oak"]);
    expect(wrapper.findAll('[data-test^="species-count-"]')[2]?.text()).toBe("none live");
  });

  it("shows 1000+ when the count stopped at its cap", async () => {
    const { wrapper } = await mountView(BrowseView, {
      path: "/browse",
      answers: { [SEARCH]: [page([oak], { total: 1000, totalIsAtLeast: true, nextCursor: "next" })] },
    });
    expect(wrapper.find('[data-test="result-count"]').text()).toBe("1000+ slabs");
    expect(wrapper.find('[data-test="show-more"]').exists()).toBe(true);
  });

  it("appends the next page with the cursor when 'Show more' is tapped", async () => {
    const second = { ...oak, listingId: "lst_two", title: "Second slab" };
    const { wrapper, fetchMock } = await mountView(BrowseView, {
      path: "/browse",
      answers: { [SEARCH]: [page([oak], { total: 2, nextCursor: "cursor-1" }), page([second], { total: 2 })] },
    });
    await wrapper.find('[data-test="show-more"]').trigger("click");
    await flushPromises();
    expect(searches(fetchMock)[1]?.get("cursor")).toBe("cursor-1");
    expect(wrapper.findAll('[data-test="catalogue-card"]').map((card) => card.find("h3").text())).toEqual([oak.title, "Second slab"]);
    expect(wrapper.find('[data-test="show-more"]').exists()).toBe(false);
  });

  it("turns 'seats 8' in the fit panel into the URL and the API query", async () => {
    const fitted = { ...oak, fit: { spareLengthMm: 450, spareWidthMm: 60, spareThicknessMm: 20 } };
    const { wrapper, router, fetchMock } = await mountView(BrowseView, {
      path: "/browse?species=northern-red-oak",
      answers: {
        [SEARCH]: [page([oak]), page([fitted], { fitTop: { lengthMm: topLengthForSeats(8), widthMm: 900, thicknessMm: 38, seats: 8 } })],
      },
    });
    const panel = wrapper.find('[data-test="fit-panel"]');
    const seatsLabel = panel.findAll("label").find((label) => label.text().trim() === "Seats");
    expect(seatsLabel).toBeDefined();
    await seatsLabel!.find("input").setValue("8");
    await panel.find('[data-test="fit-search"]').trigger("submit");
    await flushPromises();

    expect(router.currentRoute.value.query).toEqual({ species: "northern-red-oak", seats: "8" });
    const last = searches(fetchMock).at(-1)!;
    expect(last.get("seats")).toBe("8");
    expect(last.get("species")).toBe("northern-red-oak");
    expect(last.has("fitLength")).toBe(false);
    // The card shows the margin the API gave, in the person's units (metric in this test).
    expect(wrapper.find('[data-test="fit-spare"]').text()).toContain("450 mm in length");
    expect(wrapper.find('[data-test="fit-top"]').text()).toContain(
      `${topLengthForSeats(8).toLocaleString("en")} × 900 × 38 mm for 8 diners`,
    );
  });

  it("refuses a number of diners outside 2–20 without searching", async () => {
    const { wrapper, fetchMock } = await mountView(BrowseView, { path: "/browse", answers: { [SEARCH]: [page([oak])] } });
    const panel = wrapper.find('[data-test="fit-panel"]');
    await panel.find("#fit-seats").setValue("40");
    await panel.find('[data-test="fit-search"]').trigger("submit");
    await flushPromises();
    expect(searches(fetchMock)).toHaveLength(1);
    expect(panel.text()).toContain("from 2 to 20");
  });

  it("with no results, names each filter that is set and takes one off with a tap", async () => {
    const { wrapper, router, fetchMock } = await mountView(BrowseView, {
      path: "/browse?species=black-cherry&lengthMin=2000&ready=1",
      answers: { [SEARCH]: [page([]), page([oak])] },
    });
    const empty = wrapper.find('[data-test="no-results"]');
    expect(empty.exists()).toBe(true);
    const chips = empty.findAll("button[data-filter]");
    expect(chips.map((chip) => chip.text().replace(/×.*$/s, "").trim())).toEqual([
      "Black cherry",
      "Length from 2,000 mm",
      "Ready to work only",
    ]);

    await chips[1]!.trigger("click");
    await flushPromises();
    expect(router.currentRoute.value.query).toEqual({ species: "black-cherry", ready: "1" });
    expect(searches(fetchMock).at(-1)?.has("lengthMin")).toBe(false);
    expect(wrapper.find('[data-test="no-results"]').exists()).toBe(false);
    expect(wrapper.findAll('[data-test="catalogue-card"]')).toHaveLength(1);
  });

  it("says plainly when nothing is listed at all (no filters to loosen)", async () => {
    const { wrapper } = await mountView(BrowseView, { path: "/browse", answers: { [SEARCH]: [page([])] } });
    const empty = wrapper.find('[data-test="no-results"]');
    expect(empty.findAll("button[data-filter]")).toHaveLength(0);
    expect(empty.text()).toContain("No slabs are listed right now");
  });

  it("shows the API's message for a filter it refuses, next to the filter", async () => {
    const { wrapper } = await mountView(BrowseView, {
      path: "/browse?near=Nowhere",
      answers: {
        [SEARCH]: [
          {
            status: 422,
            body: {
              error: {
                code: "unknown_place",
                message: 'We could not find the town "Nowhere".',
                fields: { near: "Choose a town from the list." },
              },
            },
          },
        ],
      },
    });
    expect(wrapper.find('[data-test="filter-problem"]').text()).toContain('We could not find the town "Nowhere".');
    expect(wrapper.find("#filter-near-note").text()).toBe("Choose a town from the list.");
  });

  it("names a set's weight as the whole set's, with its heaviest slab under it, and judges the lift on that slab", async () => {
    // A slab and an offcut: 60 kg + 5 kg central, highs 66 and 5.5 kg (slab-math's ±10 %).
    const pair: CatalogueCard = {
      ...oak,
      listingId: "lst_pair",
      setKind: "sequential",
      slabCount: 2,
      weightKg: 65,
      totalWeightHighKg: 71.5,
      heaviestSlabHighKg: 66,
    };
    const { wrapper } = await mountView(BrowseView, { path: "/browse", answers: { [SEARCH]: [page([oak, pair])] } });
    const [single, set] = wrapper.findAll('[data-test="catalogue-card"]');
    expect(single!.text()).toContain("up to 138 kg");
    expect(set!.text()).toContain("up to 72 kg in all");
    expect(set!.text()).toContain("heaviest slab up to 66 kg");
    expect(set!.text()).not.toContain("65 kg");
    expect(set!.find(".catalogue-card__lift").text()).toMatch(/machine/i);
  });
});
