import { describe, expect, it } from "vitest";
import { SlabMathError } from "./errors.ts";
import { seasonalMovement } from "./seasonal-movement.ts";

// Climates chosen at points printed in Wood Handbook Table 4-2 (21.1 °C = 70 °F) so the expected
// movement can be worked by hand from the table and Table 13-5 coefficients.
describe("seasonalMovement (EMC by Wood Handbook eq. 4-5, ΔW by ch. 13 with the tangential coefficient)", () => {
  it("black walnut, 900 mm: winter 21.1 °C/30 % RH (Table 4-2: 6.2 %) → summer 21.1 °C/75 % (14.4 %)", () => {
    // by hand: 900 × 0.00274 × (14.4 − 6.2) = 900 × 0.00274 × 8.2 = 20.22 mm; the table's 0.1 %
    // rounding allows ±900 × 0.00274 × 0.1 ≈ ±0.25 mm
    const result = seasonalMovement({
      widthMm: 900,
      speciesSlug: "black-walnut",
      winter: { temperatureC: 21.1, relativeHumidityPct: 30 },
      summer: { temperatureC: 21.1, relativeHumidityPct: 75 },
    });
    expect(Math.abs(result.winterEmcPct - 6.2)).toBeLessThan(0.5);
    expect(Math.abs(result.summerEmcPct - 14.4)).toBeLessThan(0.5);
    expect(Math.abs(result.widthChangeMm - 20.22)).toBeLessThan(0.3);
    expect(result.coefficientUsed).toBe(0.00274);
    expect(result.notes).toContain("tangential_coefficient_used");
    // 14.4 % is above the 6–14 % range of the coefficients
    expect(result.notes).toContain("outside_coefficient_range");
  });

  it("white oak, 1000 mm: winter 21.1 °C/30 % (6.2 %) → summer 21.1 °C/50 % (9.2 %)", () => {
    // by hand: 1000 × 0.00365 × (9.2 − 6.2) = 10.95 mm (±0.37 mm for the table's rounding)
    const result = seasonalMovement({
      widthMm: 1000,
      speciesSlug: "white-oak",
      winter: { temperatureC: 21.1, relativeHumidityPct: 30 },
      summer: { temperatureC: 21.1, relativeHumidityPct: 50 },
    });
    expect(Math.abs(result.widthChangeMm - 10.95)).toBeLessThan(0.4);
    expect(result.notes).toEqual(["tangential_coefficient_used"]);
  });

  it("a drier summer than winter gives a negative change; an explicit coefficient is accepted", () => {
    const result = seasonalMovement({
      widthMm: 600,
      tangentialCoefficient: 0.00353, // sugar maple, Table 13-5
      winter: { temperatureC: 21.1, relativeHumidityPct: 50 },
      summer: { temperatureC: 21.1, relativeHumidityPct: 30 },
    });
    // by hand: 600 × 0.00353 × (6.2 − 9.2) = −6.35 mm
    expect(Math.abs(result.widthChangeMm - -6.35)).toBeLessThan(0.25);
  });

  it("rejects bad input naming the season", () => {
    const base = { widthMm: 900, speciesSlug: "black-walnut", winter: { temperatureC: 20, relativeHumidityPct: 30 } };
    expect(() => seasonalMovement({ ...base, summer: { temperatureC: 20, relativeHumidityPct: 130 } })).toThrow(
      /summer\.relativeHumidityPct/,
    );
    expect(() => seasonalMovement({ ...base, widthMm: 0, summer: { temperatureC: 20, relativeHumidityPct: 50 } })).toThrow(SlabMathError);
  });
});
