import { catalogueQuerySchema } from "@grainyard/contracts";
import { describe, expect, it } from "vitest";
import {
  cappedCountSql,
  featureBits,
  featuresOf,
  filterSql,
  matchesListingSql,
  nearestIdsSql,
  pageSql,
  rowsByIdSql,
} from "./catalogue-sql.ts";

const placeholders = (sql: string) => (sql.match(/\?/g) ?? []).length;
const parse = (query: string) => catalogueQuerySchema.parse(Object.fromEntries(new URLSearchParams(query)));

describe("catalogue SQL", () => {
  it("has one parameter per placeholder, in order, with every filter, a fit, yards and a page token", () => {
    const input = parse(
      "species=black-walnut,white-oak&lengthMin=1800&lengthMax=3000&widthMin=500&widthMax=900&widthBasis=minimum&thicknessMin=40&thicknessMax=90" +
        "&moistureMax=10&ready=1&priceMin=10000&priceMax=500000&liveEdge=both,one&features=crotch,figure&sets=bookmatched&freight=1",
    );
    const filters = filterSql(input, { lengthMm: 2400, widthMm: 900, thicknessMm: 38 }, ["yard-a", "yard-b"]);
    expect(placeholders(filters.sql)).toBe(filters.parameters.length);
    // The fit comes first, then species, … in the order the conditions are written; the yards last.
    expect(filters.parameters.slice(0, 5)).toEqual([2400, 900, 38, "black-walnut", "white-oak"]);
    expect(filters.parameters.slice(-2)).toEqual(["yard-a", "yard-b"]);
    expect(filters.sql).toContain("min_width_mm >= ?");
    expect(filters.sql).not.toContain("average_width_mm");
    expect(filters.parameters).toContain(featureBits(["crotch", "figure"]));
    for (const sort of ["newest", "price_low", "largest"] as const) {
      const page = pageSql(filters, { sort, direction: "ASC", after: { value: 12, id: "id-1" }, rows: 25 });
      expect(placeholders(page.sql), sort).toBe(page.parameters.length);
      expect(page.parameters.at(-1)).toBe("id-1");
      expect(page.sql).toMatch(/LIMIT 25\) AS page/);
    }
    const count = cappedCountSql(filters, 1000);
    expect(placeholders(count.sql)).toBe(count.parameters.length);
    expect(count.sql).toContain("LIMIT 1001");
    const match = matchesListingSql(filters, "listing-9");
    expect(placeholders(match.sql)).toBe(match.parameters.length);
    expect(match.parameters[0]).toBe("listing-9");
    const nearest = nearestIdsSql(filters, ["yard-c"], { yards: ["yard-a", "yard-b"], afterId: "listing-3" });
    expect(placeholders(nearest.sql)).toBe(nearest.parameters.length);
    expect(nearest.parameters.slice(0, 4)).toEqual(["yard-c", "yard-a", "yard-b", "listing-3"]);
    const rows = rowsByIdSql(["listing-1", "listing-2"]);
    expect(placeholders(rows.sql)).toBe(2);
  });

  it("limits to yards with a position, or to none at all", () => {
    expect(filterSql(parse(""), null, "placed").sql).toBe("latitude IS NOT NULL");
    expect(filterSql(parse(""), null, []).sql).toBe("0 = 1");
    expect(nearestIdsSql(filterSql(parse(""), null), [], null).sql).toContain("0 = 1");
    expect(rowsByIdSql([]).sql).toContain("0 = 1");
  });

  it("reads an empty filter set as every row, and walks a covering sort index for the page", () => {
    const filters = filterSql(parse(""), null);
    expect(filters).toEqual({ sql: "1 = 1", parameters: [] });
    const page = pageSql(filters, { sort: "price_per_board_foot", direction: "ASC", after: null, rows: 25 });
    expect(page.sql).toMatch(
      /^SELECT e\.listing_id, .* FROM \(SELECT listing_id FROM catalogue_entry WHERE 1 = 1 ORDER BY price_per_board_foot_minor ASC, listing_id ASC LIMIT 25\) AS page STRAIGHT_JOIN/,
    );
    expect(page.parameters).toEqual([]);
  });

  it("stores features as bits and reads them back", () => {
    expect(featureBits(["crotch", "spalting"])).toBe(5);
    expect(featuresOf(featureBits(["burl", "figure"]))).toEqual(["burl", "figure"]);
    expect(featuresOf(0)).toEqual([]);
  });
});
