import { describe, expect, it } from "vitest";
import { SlabMathError } from "./errors.ts";
import { gluedTableFit, seatsAbout, tableFit, topLengthForSeats } from "./table-fit.ts";

// Allowances and seating are common practice; expected values are worked by hand.
const slab = { lengthMm: 2600, thicknessMm: 60, widthStationsMm: [1000, 950, 900, 940, 1020] };

describe("tableFit", () => {
  it("a 2400 × 850 × 50 top fits: usable 2500 × 900 × 54", () => {
    // length 2600 − 2 × 50 = 2500; thickness 60 − 6 = 54;
    // narrowest width between 50 mm and 2550 mm: the 900 mm station at mid-length
    const result = tableFit(slab, { lengthMm: 2400, widthMm: 850, thicknessMm: 50 });
    expect(result).toEqual({
      fits: true,
      spareLengthMm: 100,
      spareWidthMm: 50,
      spareThicknessMm: 4,
      reasons: [],
      notes: ["live_edge_uses_minimum_width"],
    });
  });

  it("names every reason it does not fit, and says straight edges use the minimum width", () => {
    const result = tableFit(slab, { lengthMm: 2550, widthMm: 950, thicknessMm: 55, edge: "trim_straight" });
    expect(result.fits).toBe(false);
    expect(result.reasons).toEqual(["too_short", "too_narrow", "too_thin"]);
    expect(result.spareLengthMm).toBe(-50);
    expect(result.spareWidthMm).toBe(-50);
    expect(result.spareThicknessMm).toBe(-1);
    expect(result.notes).toEqual(["straight_edges_use_minimum_width"]);
  });

  it("the end trim excludes a narrow end; the width at the trim line is interpolated", () => {
    // stations every 500 mm: [300, 800, 800, 800, 800] over 2000 mm; with 250 mm end trims the
    // usable part starts at 250 mm where the width is 300 + (800 − 300) × 250/500 = 550 mm
    const tapered = { lengthMm: 2000, thicknessMm: 50, widthStationsMm: [300, 800, 800, 800, 800] };
    expect(tableFit(tapered, { lengthMm: 1400, widthMm: 500, thicknessMm: 40 }, { endTrimMm: 250 }).spareWidthMm).toBeCloseTo(50, 9);
    expect(tableFit(tapered, { lengthMm: 1400, widthMm: 500, thicknessMm: 40 }, { endTrimMm: 0 }).reasons).toEqual(["too_narrow"]);
  });

  it("configurable allowances", () => {
    const result = tableFit(slab, { lengthMm: 2400, widthMm: 850, thicknessMm: 50 }, { flatteningAllowanceMm: 12, endTrimMm: 150 });
    expect(result.spareThicknessMm).toBe(-2);
    expect(result.spareLengthMm).toBe(-100);
  });

  it("invalid input names the field", () => {
    expect(() => tableFit({ ...slab, lengthMm: 40_000 }, { lengthMm: 2400, widthMm: 850, thicknessMm: 50 })).toThrow(/slab\.lengthMm/);
    expect(() => tableFit(slab, { lengthMm: 2400, widthMm: -1, thicknessMm: 50 })).toThrow(SlabMathError);
  });
});

describe("gluedTableFit (bookmatched pair)", () => {
  it("sums widths less 5 mm per glued edge; shortest and thinnest slab govern", () => {
    const left = { lengthMm: 2500, thicknessMm: 55, widthStationsMm: [520, 500, 540] };
    const right = { lengthMm: 2450, thicknessMm: 57, widthStationsMm: [530, 505, 545] };
    // width 500 + 505 − 2 × 5 = 995; length min(2400, 2350) = 2350; thickness min(49, 51) = 49
    const result = gluedTableFit([left, right], { lengthMm: 2300, widthMm: 980, thicknessMm: 45 });
    expect(result.fits).toBe(true);
    expect(result.spareWidthMm).toBe(15);
    expect(result.spareLengthMm).toBe(50);
    expect(result.spareThicknessMm).toBe(4);
    expect(result.notes).toContain("glued_widths_summed");
  });
});

describe("seating (common practice: about 600 mm of edge per diner)", () => {
  it("2400 × 1000 top: 4 per long side + 1 per end = 10", () => {
    expect(seatsAbout(2400, 1000)).toBe(10);
  });
  it("1800 × 550: 3 per side, none at the narrow ends", () => {
    expect(seatsAbout(1800, 550)).toBe(6);
  });
  it("topLengthForSeats is the inverse along the long sides", () => {
    // 8 diners on two sides → 4 each → 2400 mm; with one at each end, 6 on the sides → 1800 mm
    expect(topLengthForSeats(8)).toBe(2400);
    expect(topLengthForSeats(8, 2)).toBe(1800);
    for (let seats = 2; seats <= 20; seats++) {
      expect(seatsAbout(topLengthForSeats(seats), 550)).toBeGreaterThanOrEqual(seats);
    }
    expect(() => topLengthForSeats(0)).toThrow(/seats/);
    expect(() => topLengthForSeats(2.5)).toThrow(SlabMathError);
  });
});
