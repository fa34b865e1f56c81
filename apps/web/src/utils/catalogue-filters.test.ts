import { describe, expect, it } from "vitest";
import type { LocationQuery } from "vue-router";
import { unitFormatter } from "../composables/useUnits.ts";
import {
  activeFilters,
  blankFilters,
  filterKeys,
  filtersFromQuery,
  queryFromFilters,
  searchQuery,
  withFilters,
  type CatalogueFilters,
} from "./catalogue-filters.ts";

/** Every filter set, to a value that is not its default. */
function everyFilter(): CatalogueFilters {
  return {
    species: ["black-walnut", "northern-red-oak"],
    lengthMin: 1800,
    lengthMax: 3200,
    widthMin: 500,
    widthMax: 1100,
    widthBasis: "minimum",
    thicknessMin: 45,
    thicknessMax: 80,
    moistureMax: 9.5,
    ready: true,
    priceMin: 40000,
    priceMax: 250050,
    liveEdge: ["both", "one"],
    features: ["crotch", "spalting"],
    sets: ["single", "bookmatched"],
    near: "demo:lakemont",
    radiusKm: 50,
    freight: true,
    seats: 8,
    fitLength: null,
    fitWidth: 950,
    fitThickness: 45,
    fitEdge: "trim_straight",
    sort: "nearest",
  };
}

describe("catalogue filters ↔ URL query", () => {
  it("writes every filter to the URL and reads the same filters back", () => {
    const filters = everyFilter();
    const query = queryFromFilters(filters);
    expect(query).toEqual({
      species: "black-walnut,northern-red-oak",
      lengthMin: "1800",
      lengthMax: "3200",
      widthMin: "500",
      widthMax: "1100",
      widthBasis: "minimum",
      thicknessMin: "45",
      thicknessMax: "80",
      moistureMax: "9.5",
      ready: "1",
      priceMin: "40000",
      priceMax: "250050",
      liveEdge: "both,one",
      features: "crotch,spalting",
      sets: "single,bookmatched",
      near: "demo:lakemont",
      radiusKm: "50",
      freight: "1",
      seats: "8",
      fitWidth: "950",
      fitThickness: "45",
      fitEdge: "trim_straight",
      sort: "nearest",
    });
    expect(filtersFromQuery(query)).toEqual(filters);
  });

  it("has a key in the URL for every filter", () => {
    // (Diners and a length are never sent together by the fit panel; the writer just writes.)
    const written = Object.keys(queryFromFilters({ ...everyFilter(), fitLength: 2400 }));
    expect(new Set(written)).toEqual(new Set(filterKeys));
  });

  it("round-trips each filter on its own (and nothing else leaks into the URL)", () => {
    const full = { ...everyFilter(), fitLength: 2400 };
    for (const key of filterKeys) {
      const one = { ...blankFilters(), [key]: full[key] } as CatalogueFilters;
      const query = queryFromFilters(one);
      expect(Object.keys(query), key).toEqual([key]);
      expect(filtersFromQuery(query), key).toEqual(one);
    }
  });

  it("leaves defaults out, so an empty search is a bare /browse", () => {
    expect(queryFromFilters(blankFilters())).toEqual({});
    expect(filtersFromQuery({})).toEqual(blankFilters());
  });

  it("reads a pasted URL leniently: unknown values are dropped, lists keep the contract's order", () => {
    const query: LocationQuery = {
      species: "Black Walnut,silver-maple,silver-maple",
      lengthMin: "abc",
      lengthMax: "2400.5",
      moistureMax: "8.5",
      ready: "yes",
      liveEdge: "none,zigzag,both",
      features: "figure,crotch",
      sets: ["bookmatched", "single"],
      sort: "cheapest",
      fitEdge: "chainsaw",
      utm: "x",
    };
    const filters = filtersFromQuery(query);
    expect(filters.species).toEqual(["silver-maple"]);
    expect(filters.lengthMin).toBeNull();
    expect(filters.lengthMax).toBeNull(); // whole millimetres only
    expect(filters.moistureMax).toBe(8.5);
    expect(filters.ready).toBe(false);
    expect(filters.liveEdge).toEqual(["both", "none"]);
    expect(filters.features).toEqual(["crotch", "figure"]);
    expect(filters.sets).toEqual(["bookmatched"]);
    expect(filters.sort).toBe("newest");
    expect(filters.fitEdge).toBe("keep_live_edge");
  });

  it("keeps query keys that are not filters when the filters change", () => {
    const next = withFilters({ ref: "newsletter", species: "black-walnut" }, { ...blankFilters(), ready: true });
    expect(next).toEqual({ ref: "newsletter", ready: "1" });
  });

  it("asks the API for a page with the cursor and limit, and never a distance sort without a town", () => {
    const filters = { ...blankFilters(), sort: "nearest" as const, radiusKm: 25, species: ["white-oak"] };
    expect(searchQuery(filters, "abc", 24)).toEqual({ species: "white-oak", cursor: "abc", limit: "24" });
    expect(searchQuery({ ...filters, near: "demo:lakemont" }, null, 24)).toEqual({
      species: "white-oak",
      near: "demo:lakemont",
      radiusKm: "25",
      sort: "nearest",
      limit: "24",
    });
  });
});

describe("activeFilters", () => {
  const metric = unitFormatter("metric");

  it("names every filter that is set, each with the filters left once it is taken off", () => {
    const filters = everyFilter();
    const active = activeFilters(filters, metric, "Lakemont");
    expect(active.map((filter) => filter.label)).toEqual([
      "Black walnut or Northern red oak",
      "Length 1,800 mm – 3,200 mm",
      "Narrowest width 500 mm – 1,100 mm",
      "Thickness 45 mm – 80 mm",
      "Moisture up to 9.5 %",
      "Ready to work only",
      "Price 400.00 – 2500.50",
      "Both edges live or One live edge",
      "With crotch and spalting",
      "Single slab or Bookmatched pair",
      "Within 50 km of Lakemont",
      "Ships by freight",
      "Table for 8, edges trimmed",
    ]);
    const withoutTown = active.find((filter) => filter.keys.includes("near"))!.without;
    expect(withoutTown.near).toBeNull();
    expect(withoutTown.radiusKm).toBeNull();
    expect(withoutTown.sort).toBe("newest"); // a distance sort needs the town
    expect(withoutTown.species).toEqual(filters.species);
    const withoutSpecies = active[0]!.without;
    expect(queryFromFilters(withoutSpecies).species).toBeUndefined();
    expect(queryFromFilters(withoutSpecies).lengthMin).toBe("1800");
  });

  it("shows sizes in the person's units", () => {
    const imperial = unitFormatter("imperial");
    // 2438.4 mm = 96 in = 8 ft (1 in = 25.4 mm exactly).
    const active = activeFilters({ ...blankFilters(), lengthMin: 2438.4 }, imperial);
    expect(active.map((filter) => filter.label)).toEqual(["Length from 8′ 0″"]);
  });

  it("is empty when nothing is set", () => {
    expect(activeFilters(blankFilters(), metric)).toEqual([]);
  });
});
