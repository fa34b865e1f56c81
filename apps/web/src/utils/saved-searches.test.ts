import { describe, expect, it } from "vitest";
import { unitFormatter } from "../composables/useUnits.ts";
import { blankFilters, filtersFromQuery } from "./catalogue-filters.ts";
import { filtersFromSavedQuery, savedQueryText, savedSearchLink, savedSearchWords, suggestedSearchName } from "./saved-searches.ts";

const metric = unitFormatter("metric");

describe("saved searches in the web app", () => {
  it("stores the catalogue's filters without the sort (paging is not part of a search)", () => {
    const filters = filtersFromQuery({ species: "black-walnut", seats: "8", sort: "price_low", ready: "1" });
    expect(savedQueryText(filters)).toBe("species=black-walnut&ready=1&seats=8");
    expect(savedQueryText(blankFilters())).toBe("");
  });

  it("reads a stored query back into the same filters (a round trip)", () => {
    // Written as the API writes it (URLSearchParams, so the comma is %2C), and read either way.
    const text = "species=black-walnut%2Cwhite-oak&lengthMin=2000&seats=8&fitEdge=trim_straight";
    expect(savedQueryText(filtersFromSavedQuery(text))).toBe(text);
    expect(savedQueryText(filtersFromSavedQuery(`?${text.replace("%2C", ",")}`))).toBe(text);
    expect(filtersFromSavedQuery(text).species).toEqual(["black-walnut", "white-oak"]);
  });

  it("names every filter of a stored search in words, in the person's units", () => {
    expect(savedSearchWords("species=black-walnut&lengthMin=2000&ready=1&seats=8", metric)).toEqual([
      "Black walnut",
      "Length from 2,000 mm",
      "Ready to work only",
      "Table for 8",
    ]);
    expect(savedSearchWords("thicknessMin=50", unitFormatter("imperial"))[0]).toMatch(/^Thickness from 1 15\/16″$/);
    expect(savedSearchWords("", metric)).toEqual([]);
    // A town is stored by its id: its name when known, plain words when not.
    expect(savedSearchWords("near=demo%3Alakemont&radiusKm=40", metric, "Lakemont")).toEqual(["Within 40 km of Lakemont"]);
    expect(savedSearchWords("near=demo%3Alakemont", metric)).toEqual(["Near the chosen town"]);
  });

  it("opens a stored search in the catalogue", () => {
    expect(savedSearchLink("seats=8")).toBe("/browse?seats=8");
    expect(savedSearchLink("")).toBe("/browse");
  });

  it("suggests a name from the filters, short enough for the API (80 characters)", () => {
    expect(suggestedSearchName(filtersFromQuery({ seats: "8" }), metric)).toBe("Table for 8");
    expect(suggestedSearchName(blankFilters(), metric)).toBe("Every new slab");
    const busy = filtersFromQuery({
      species: "black-walnut,white-oak,northern-red-oak",
      lengthMin: "2000",
      lengthMax: "3200",
      widthMin: "800",
      thicknessMin: "50",
      moistureMax: "10",
      ready: "1",
      priceMax: "200000",
      seats: "8",
    });
    const name = suggestedSearchName(busy, metric);
    expect(name.length).toBeLessThanOrEqual(80);
    expect(name.endsWith("…")).toBe(true);
    expect(suggestedSearchName(filtersFromQuery({ near: "lakemont" }), metric, "Lakemont")).toBe("Near Lakemont");
  });
});
