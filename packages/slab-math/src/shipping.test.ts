import { describe, expect, it } from "vitest";
import { SlabMathError } from "./errors.ts";
import { shippingEstimate } from "./shipping.ts";

// The crate rule, divisor and thresholds are common practice (documented in shipping.ts); the
// rate table is the caller's. Expected values worked by hand.
const rates = {
  parcel: [
    { upToKg: 10, priceMinor: 2500 },
    { upToKg: 30, priceMinor: 6000 },
  ],
  freight: [
    { upToKg: 300, priceMinor: 45_000 },
    { upToKg: 1000, priceMinor: 90_000 },
  ],
};

describe("shippingEstimate", () => {
  it("a dining-table slab goes by freight", () => {
    // crate 2500 × 1000 × 175 mm; surface 2 × (2.5 × 1 + 2.5 × 0.175 + 1 × 0.175) = 6.225 m² → 62.25 kg tare
    // gross 120 + 62.25 = 182.25 kg; dimensional 250 × 100 × 17.5 cm³ / 5000 = 87.5 kg
    const result = shippingEstimate({ lengthMm: 2400, widthMm: 900, thicknessMm: 75, slabKg: 120, rates });
    expect(result.crate).toEqual({ lengthMm: 2500, widthMm: 1000, heightMm: 175, tareKg: expect.closeTo(62.25, 9) });
    expect(result.grossKg).toBeCloseTo(182.25, 9);
    expect(result.dimensionalKg).toBeCloseTo(87.5, 9);
    expect(result.chargeableKg).toBeCloseTo(182.25, 9);
    expect(result.mode).toBe("freight");
    expect(result.costMinor).toBe(45_000);
    expect(result.heavyLift).toBe(true);
    expect(result.reasons).toEqual(["too_heavy_for_parcel", "too_long_for_parcel"]);
  });

  it("a small light offcut goes as a parcel, charged on dimensional weight", () => {
    // crate 700 × 400 × 130 mm; surface 2 × (0.28 + 0.091 + 0.052) = 0.846 m² → 8.46 kg
    // gross 3 + 8.46 = 11.46 kg; dimensional 70 × 40 × 13 / 5000 = 7.28 kg → chargeable 11.46 kg
    const result = shippingEstimate({ lengthMm: 600, widthMm: 300, thicknessMm: 30, slabKg: 3, rates });
    expect(result.grossKg).toBeCloseTo(11.46, 9);
    expect(result.dimensionalKg).toBeCloseTo(7.28, 9);
    expect(result.mode).toBe("parcel");
    expect(result.costMinor).toBe(6000);
    // with a divisor of 1000 cm³/kg the dimensional weight (36.4 kg) wins and it is too heavy for parcel
    const bulky = shippingEstimate({ lengthMm: 600, widthMm: 300, thicknessMm: 30, slabKg: 3, rates, dimensionalDivisorCm3PerKg: 1000 });
    expect(bulky.chargeableKg).toBeCloseTo(36.4, 9);
    expect(bulky.mode).toBe("freight");
  });

  it("too long for freight: local pickup, no cost", () => {
    const result = shippingEstimate({ lengthMm: 4200, widthMm: 1000, thicknessMm: 80, slabKg: 250, rates });
    expect(result.mode).toBe("local_pickup");
    expect(result.costMinor).toBeNull();
    expect(result.reasons).toContain("too_long_for_freight");
  });

  it("no rate step covers the weight: cost null with a reason", () => {
    const result = shippingEstimate({
      lengthMm: 2400,
      widthMm: 900,
      thicknessMm: 75,
      slabKg: 120,
      rates: { freight: [{ upToKg: 100, priceMinor: 1 }] },
    });
    expect(result.costMinor).toBeNull();
    expect(result.reasons).toContain("no_rate_for_weight");
  });

  it("rejects invalid input", () => {
    expect(() => shippingEstimate({ lengthMm: 2400, widthMm: 900, thicknessMm: 75, slabKg: -1, rates })).toThrow(/slabKg/);
    expect(() =>
      shippingEstimate({
        lengthMm: 2400,
        widthMm: 900,
        thicknessMm: 75,
        slabKg: 100,
        rates: { freight: [{ upToKg: 300, priceMinor: 9.99 }] },
      }),
    ).toThrow(SlabMathError);
  });
});
