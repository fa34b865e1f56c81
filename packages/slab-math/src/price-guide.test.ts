import { describe, expect, it } from "vitest";
import { FAR_BELOW_USUAL_FRACTION, USUAL_SLAB_PRICE_USD_PER_BOARD_FOOT, priceFarBelowUsual } from "./price-guide.ts";
import { species } from "./species.ts";

// The usual ranges are a rule of thumb (common practice), not a published survey; these tests check
// the arithmetic against hand calculations and that every species of the table has a sane range.
describe("usual slab prices (common practice)", () => {
  it("covers every species in the species table, each low below its high", () => {
    for (const entry of species) {
      const range = USUAL_SLAB_PRICE_USD_PER_BOARD_FOOT[entry.slug];
      expect(range, entry.slug).toBeDefined();
      expect(range![0]).toBeGreaterThan(0);
      expect(range![0]).toBeLessThan(range![1]);
    }
    expect(FAR_BELOW_USUAL_FRACTION).toBe(0.5);
  });
});

describe("priceFarBelowUsual", () => {
  const walnut = { speciesSlug: "black-walnut", boardFeet: 20 };

  it("warns when a walnut slab is priced far below its usual $15–35 per board foot", () => {
    // $140 for 20 bf is $7.00 / bf (hand calculation), under half of $15 ($7.50).
    const warning = priceFarBelowUsual([walnut], 14_000, "USD");
    expect(warning).toMatchObject({ pricePerBoardFootMinor: 700, usualLowMinor: 1500, usualHighMinor: 3500 });
    expect(warning!.message).toContain("$7.00 per board foot, far below the $15.00–$35.00 that kiln-dried black walnut slabs usually ask");
    expect(warning!.message).toContain("rule of thumb");
  });

  it("stays quiet at half the low end and above, and where it cannot tell", () => {
    // $150 for 20 bf is exactly $7.50 / bf: not below half of $15.
    expect(priceFarBelowUsual([walnut], 15_000, "USD")).toBeNull();
    expect(priceFarBelowUsual([walnut], 40_000, "USD")).toBeNull();
    expect(priceFarBelowUsual([walnut], null, "USD")).toBeNull();
    expect(priceFarBelowUsual([walnut], 0, "USD")).toBeNull();
    expect(priceFarBelowUsual([], 100, "USD")).toBeNull();
    expect(priceFarBelowUsual([{ speciesSlug: "black-walnut", boardFeet: 0 }], 100, "USD")).toBeNull();
    expect(priceFarBelowUsual([{ speciesSlug: "unknown-wood", boardFeet: 20 }], 100, "USD")).toBeNull();
    // The table is in US dollars only.
    expect(priceFarBelowUsual([walnut], 100, "EUR")).toBeNull();
  });

  it("weighs a mixed set's usual range by board feet", () => {
    // 10 bf walnut ($15–35) + 30 bf silver maple ($6–14): low (150 + 180) / 40 = $8.25, high (350 + 420) / 40 = $19.25.
    const set = [
      { speciesSlug: "black-walnut", boardFeet: 10 },
      { speciesSlug: "silver-maple", boardFeet: 30 },
    ];
    const warning = priceFarBelowUsual(set, 10_000, "USD");
    expect(warning).toMatchObject({ pricePerBoardFootMinor: 250, usualLowMinor: 825, usualHighMinor: 1925 });
    expect(warning!.message).toContain("slabs of these species");
    // $4.13 / bf ($165 / 40 bf = 4.125, half-up) is not below half of $8.25 (4.125 → compared in cents: 413 ≥ 412.5).
    expect(priceFarBelowUsual(set, 16_500, "USD")).toBeNull();
  });
});
