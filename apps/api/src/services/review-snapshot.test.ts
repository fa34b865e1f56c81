import type { Listing } from "@grainyard/contracts";
import { describe, expect, it } from "vitest";
import { changesBetween, snapshotOf } from "./review-snapshot.ts";

const slab = {
  id: "11111111-aaaa-4aaa-8aaa-111111111111",
  speciesSlug: "black-cherry",
  lengthMm: 2000,
  thicknessMm: 45,
  widthStationsMm: [600, 580],
  liveEdge: "both",
  surfacing: "sanded",
  features: [],
  defects: ["check"],
  dryingMethod: "kiln",
  kilnCompletedOn: null,
  lastMoisturePct: 8,
  lastReadOn: "2026-10-01",
  notes: "",
};
const listing = {
  title: "Cherry top",
  description: "Straight grain.",
  setKind: "single",
  priceMode: "fixed",
  rateMinor: 90_000,
  currency: "USD",
  pickup: true,
  freight: false,
  photos: [{ id: "aaaaaaaa-0000-4000-8000-000000000001" }],
  slabs: [slab],
} as unknown as Listing;

describe("review snapshot and changes", () => {
  it("no change gives no rows", () => {
    expect(changesBetween(snapshotOf(listing), snapshotOf(listing))).toEqual([]);
  });

  it("names each changed field with its old and new text, in listing order", () => {
    const after = {
      ...listing,
      rateMinor: 85_000,
      freight: true,
      slabs: [{ ...slab, lastMoisturePct: 7, widthStationsMm: [600, 590] }],
    } as unknown as Listing;
    expect(changesBetween(snapshotOf(listing), snapshotOf(after))).toEqual([
      { field: "price", label: "Price", before: "fixed: $900.00 USD", after: "fixed: $850.00 USD" },
      { field: "freight", label: "Freight", before: "no", after: "yes" },
      { field: "slabs.0.widths", label: "Slab widths", before: "600, 580 mm", after: "600, 590 mm" },
      { field: "slabs.0.moisture", label: "Slab moisture", before: "8 % on 2026-10-01", after: "7 % on 2026-10-01" },
    ]);
  });

  it("a photo added or a slab removed from a set shows up", () => {
    const set = {
      ...listing,
      setKind: "sequential",
      slabs: [slab, { ...slab, id: "22222222-bbbb-4bbb-8bbb-222222222222" }],
    } as unknown as Listing;
    const smaller = {
      ...set,
      slabs: [slab],
      photos: [...listing.photos, { id: "bbbbbbbb-0000-4000-8000-000000000002" }],
    } as unknown as Listing;
    const changes = changesBetween(snapshotOf(set), snapshotOf(smaller));
    expect(changes.map((c) => c.field)).toContain("photos");
    expect(changes.find((c) => c.field === "photoCount")).toEqual({
      field: "photoCount",
      label: "Number of photos",
      before: "1",
      after: "2",
    });
    expect(changes.filter((c) => c.field.startsWith("slabs.1.")).every((c) => c.after === "—")).toBe(true);
  });
});
