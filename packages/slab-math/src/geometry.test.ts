import convert from "convert-units";
import { describe, expect, it } from "vitest";
import { SlabMathError } from "./errors.ts";
import { boardFeet, slabGeometry } from "./geometry.ts";
import { parseInches } from "./units.ts";

describe("boardFeet — NHLA rule: 1 board foot = 144 in³ (1 in × 12 in × 1 ft)", () => {
  it("NHLA definition: 1 in × 12 in × 12 in is exactly 1 bf", () => {
    expect(boardFeet(1, 12, 1)).toBe(1);
  });
  it("NHLA worked example: a 12/4 (3 in) × 12 in × 8 ft board is 24 bf", () => {
    // 3 × 12 × 8 / 12 = 24
    expect(boardFeet(3, 12, 8)).toBeCloseTo(24, 12);
  });
  it("NHLA worked example: 8/4 × 10 in × 6 ft is 10 bf", () => {
    // 2 × 10 × 6 / 12 = 10
    expect(boardFeet(2, 10, 6)).toBeCloseTo(10, 12);
  });
  it("rejects negative and NaN sizes naming the field", () => {
    expect(() => boardFeet(-1, 12, 8)).toThrow(/thicknessIn/);
    expect(() => boardFeet(1, Number.NaN, 8)).toThrow(/widthIn/);
  });
});

describe("slabGeometry", () => {
  it("a rectangle: area, volume, board feet (cross-checked with convert-units m³ → ft³ × 12)", () => {
    const result = slabGeometry({ lengthMm: 2400, thicknessMm: 50, widthStationsMm: [900, 900, 900] });
    // 2.4 m × 0.9 m = 2.16 m²; × 0.05 m = 0.108 m³
    expect(result.areaM2).toBeCloseTo(2.16, 12);
    expect(result.volumeM3).toBeCloseTo(0.108, 12);
    // 1 ft³ = 12 board feet (144 in³ each): reference library conversion, not our constant.
    const boardFeetByLibrary = convert(0.108).from("m3").to("ft3") * 12;
    expect(result.boardFeet).toBeCloseTo(boardFeetByLibrary, 3);
    expect(result.averageWidthMm).toBe(900);
    expect(result.minWidthMm).toBe(900);
    expect(result.maxWidthMm).toBe(900);
  });

  it("a linear taper: trapezoidal area equals the exact area (L × (w₁ + w₂) / 2)", () => {
    const result = slabGeometry({ lengthMm: 3000, thicknessMm: 75, widthStationsMm: [600, 700, 800, 900, 1000] });
    // exact trapezoid: 3.0 m × (0.6 + 1.0) / 2 = 2.4 m²
    expect(result.areaM2).toBeCloseTo(2.4, 12);
    expect(result.volumeM3).toBeCloseTo(2.4 * 0.075, 12);
    expect(result.averageWidthMm).toBeCloseTo(800, 9);
    expect(result.minWidthMm).toBe(600);
    expect(result.maxWidthMm).toBe(1000);
  });

  it("a parabolic (bellied) edge: matches the composite trapezoid error formula exactly", () => {
    // w(x) = a + c·x·(L − x). Exact area I = aL + cL³/6. For a quadratic the composite
    // trapezoidal rule error is exact: I − T = −(L·h²/12)·w'' = L·h²·c/6 (w'' = −2c).
    const lengthMm = 2000;
    const a = 500;
    const c = 0.0002; // 200 mm of belly at mid-length
    const n = 9;
    const h = lengthMm / (n - 1);
    const stations = Array.from({ length: n }, (_, index) => {
      const x = index * h;
      return a + c * x * (lengthMm - x);
    });
    const exactAreaMm2 = a * lengthMm + (c * lengthMm ** 3) / 6;
    const trapezoidAreaMm2 = exactAreaMm2 - (lengthMm * h * h * c) / 6;
    const result = slabGeometry({ lengthMm, thicknessMm: 60, widthStationsMm: stations });
    expect(result.areaM2 * 1e6).toBeCloseTo(trapezoidAreaMm2, 6);
  });

  it("board feet agree with the NHLA formula for the same rectangle", () => {
    // 2 in × 20 in × 10 ft = 33 1/3 bf
    const result = slabGeometry({ lengthMm: 3048, thicknessMm: 50.8, widthStationsMm: [508, 508] });
    expect(result.boardFeet).toBeCloseTo(boardFeet(2, 20, 10), 9);
    expect(result.boardFeet).toBeCloseTo(100 / 3, 9);
  });

  it("a slab entered in inches, 2¼″ × 25″ × 96½″, is the sawyer's hand figure of 37.7 bf when kept as entered", () => {
    // Hand calculation with the NHLA rule (board feet = T × W × L in inches / 144):
    // 2.25 × 25 × 96.5 / 144 = 5428.125 / 144 = 37.6953… → 37.7 bf. 1 in = 25.4 mm exactly (NIST SP 811, B.8).
    const asEntered = {
      lengthMm: parseInches("96 1/2"),
      thicknessMm: parseInches("2 1/4"),
      widthStationsMm: [parseInches("25"), parseInches("25")],
    };
    const result = slabGeometry(asEntered);
    expect(result.boardFeet).toBeCloseTo((2.25 * 25 * 96.5) / 144, 9);
    expect(result.boardFeet.toFixed(1)).toBe("37.7");
    // Rounded to whole millimetres (57 mm, 2451 mm) the same slab came out 37.6 bf: the defect this guards against.
    const rounded = slabGeometry({ lengthMm: 2451, thicknessMm: 57, widthStationsMm: [635, 635] });
    expect(rounded.boardFeet.toFixed(1)).toBe("37.6");
  });

  it("accepts a station of 0 (a pointed end) but not an all-zero slab", () => {
    expect(slabGeometry({ lengthMm: 1000, thicknessMm: 50, widthStationsMm: [0, 400] }).areaM2).toBeCloseTo(0.2, 12);
    expect(() => slabGeometry({ lengthMm: 1000, thicknessMm: 50, widthStationsMm: [0, 0] })).toThrow(SlabMathError);
  });

  describe("invalid input throws SlabMathError with a clear message naming the field", () => {
    const valid = { lengthMm: 2400, thicknessMm: 50, widthStationsMm: [900, 850, 800] };
    const cases: [string, object, string, string][] = [
      ["negative length", { ...valid, lengthMm: -1 }, "lengthMm", "negative"],
      ["NaN thickness", { ...valid, thicknessMm: Number.NaN }, "thicknessMm", "not_a_number"],
      ["infinite length", { ...valid, lengthMm: Number.POSITIVE_INFINITY }, "lengthMm", "not_finite"],
      ["a 40 m slab", { ...valid, lengthMm: 40_000 }, "lengthMm", "out_of_range"],
      ["a 700 mm thick slab", { ...valid, thicknessMm: 700 }, "thicknessMm", "out_of_range"],
      ["zero length", { ...valid, lengthMm: 0 }, "lengthMm", "out_of_range"],
      ["one station", { ...valid, widthStationsMm: [900] }, "widthStationsMm", "too_few_stations"],
      ["no stations", { ...valid, widthStationsMm: [] }, "widthStationsMm", "too_few_stations"],
      ["a negative width", { ...valid, widthStationsMm: [900, -5, 800] }, "widthStationsMm[1]", "negative"],
      ["a 5 m wide station", { ...valid, widthStationsMm: [900, 5000] }, "widthStationsMm[1]", "out_of_range"],
      ["a text width", { ...valid, widthStationsMm: [900, "800"] }, "widthStationsMm[1]", "not_a_number"],
    ];
    for (const [name, input, field, code] of cases) {
      it(name, () => {
        try {
          slabGeometry(input as never);
          expect.unreachable("should have thrown");
        } catch (error) {
          expect(error).toBeInstanceOf(SlabMathError);
          const slabError = error as SlabMathError;
          expect(slabError.field).toBe(field);
          expect(slabError.code).toBe(code);
          expect(slabError.message).toContain(field);
        }
      });
    }
  });
});
