import Qty from "js-quantities";
import { describe, expect, it } from "vitest";
import {
  KILN_DRIED_HIGHEST_PLAUSIBLE_PCT,
  LOWEST_PLAUSIBLE_MOISTURE_PCT,
  listedSlabWarnings,
  plausibilityWarnings,
  type PlausibilitySlab,
} from "./plausibility.ts";
import { KILN_DRIED_TARGET_BAND, equilibriumMoistureContent } from "./wood-physics.ts";

/** A plain kiln-dried white oak slab, 2 m × 50 mm × 500 mm, read at 8 %. */
const slab = (overrides: Partial<PlausibilitySlab> = {}): PlausibilitySlab => ({
  speciesSlug: "white-oak",
  lengthMm: 2000,
  thicknessMm: 50,
  widthStationsMm: [500, 520, 510],
  dryingMethod: "kiln",
  lastMoisturePct: 8,
  ...overrides,
});
const codes = (list: PlausibilitySlab[]) => plausibilityWarnings(list).map((w) => w.code);

describe("plausibilityWarnings", () => {
  it("a plain kiln-dried slab read at 8 % gives no warning", () => {
    expect(plausibilityWarnings([slab()])).toEqual([]);
  });

  it("a reading below 4 % is flagged: Wood Handbook Table 4-2 needs about 20 % RH at 21 °C to reach 4.5 % (threshold: common practice)", () => {
    // The physics behind the threshold, from the WH EMC equation: 20 % RH at 21 °C is still above 4 %.
    expect(equilibriumMoistureContent(21, 20)).toBeGreaterThan(LOWEST_PLAUSIBLE_MOISTURE_PCT);
    expect(equilibriumMoistureContent(21, 20)).toBeCloseTo(4.5, 0);
    expect(codes([slab({ lastMoisturePct: 3.5 })])).toEqual(["moisture_too_low"]);
    expect(codes([slab({ lastMoisturePct: 4 })])).toEqual([]);
  });

  it("kiln-dried above 15 % is flagged (kiln target 6–10 %, air-dry 12–15 % per WH ch. 13; threshold: common practice)", () => {
    expect(KILN_DRIED_HIGHEST_PLAUSIBLE_PCT).toBeGreaterThan(KILN_DRIED_TARGET_BAND.maximumPct);
    expect(codes([slab({ lastMoisturePct: 15 })])).toEqual([]);
    expect(codes([slab({ lastMoisturePct: 16 })])).toEqual(["kiln_dried_too_wet"]);
    expect(codes([slab({ dryingMethod: "air_then_kiln", lastMoisturePct: 18 })])).toEqual(["kiln_dried_too_wet"]);
    // Air-dried wood at 18 % is ordinary.
    expect(codes([slab({ dryingMethod: "air", lastMoisturePct: 18 })])).toEqual([]);
  });

  it("kiln-dried above fibre saturation (30 %, WH ch. 4) is called green wood, not merely wet", () => {
    expect(codes([slab({ lastMoisturePct: 45 })])).toEqual(["above_fibre_saturation"]);
  });

  it("kiln-dried with no reading at all is flagged; air-dried without a reading is not", () => {
    expect(codes([slab({ lastMoisturePct: null })])).toEqual(["no_moisture_reading"]);
    expect(codes([slab({ dryingMethod: "air", lastMoisturePct: null })])).toEqual([]);
  });

  it("width stations: a jump of more than 60 % between neighbours (a typing slip) is flagged once; a steady taper is not (common practice)", () => {
    expect(codes([slab({ widthStationsMm: [500, 5100, 520] })])).toEqual(["width_step", "wider_than_long"]);
    expect(codes([slab({ widthStationsMm: [500, 900, 520] })])).toEqual(["width_step"]);
    expect(codes([slab({ widthStationsMm: [400, 450, 520, 600] })])).toEqual([]);
  });

  it("swapped dimensions: thicker than its narrowest width, or wider than long", () => {
    expect(codes([slab({ thicknessMm: 600, widthStationsMm: [500, 520] })])).toEqual(["thicker_than_wide"]);
    expect(codes([slab({ lengthMm: 450, widthStationsMm: [500, 520] })])).toEqual(["wider_than_long"]);
  });

  it("board feet: 2 in × 12 in × 8 ft is 16 bf by the NHLA rule (144 in³ a board foot); 20 bf stated is flagged, 16.3 is not", () => {
    const inch = Qty("1 in").to("mm").scalar;
    const board = slab({ lengthMm: 96 * inch, thicknessMm: 2 * inch, widthStationsMm: [12 * inch, 12 * inch] });
    expect((2 * 12 * 96) / 144).toBe(16);
    expect(codes([{ ...board, statedBoardFeet: 16.3 }])).toEqual([]);
    expect(codes([{ ...board, statedBoardFeet: 20 }])).toEqual(["board_feet_mismatch"]);
  });

  it("weight: white oak SG12 0.68 (WH Table 5-3a) → 0.05 m³ at 12 % ≈ 0.05 × 1000 × 0.68 × 1.12 = 38 kg; 38 passes, 80 and 15 are flagged", () => {
    const oak = slab({ widthStationsMm: [500, 500], lastMoisturePct: 12 });
    expect(codes([{ ...oak, statedWeightKg: 38 }])).toEqual([]);
    expect(codes([{ ...oak, statedWeightKg: 80 }])).toEqual(["weight_outside_species_range"]);
    expect(codes([{ ...oak, statedWeightKg: 15 }])).toEqual(["weight_outside_species_range"]);
  });

  it("names the slab in a set, and keeps slab order", () => {
    const warnings = plausibilityWarnings([slab(), slab({ lastMoisturePct: 2 })]);
    expect(warnings).toHaveLength(1);
    expect(warnings[0]).toMatchObject({ code: "moisture_too_low", slabIndex: 1 });
    expect(warnings[0]!.message).toMatch(/^Slab 2: /);
  });

  it("a single slab's message starts with a capital letter", () => {
    expect(plausibilityWarnings([slab({ lastMoisturePct: 2 })])[0]!.message).toMatch(/^Moisture reading of 2 %/);
  });

  it("an unknown species is reported rather than thrown", () => {
    expect(codes([slab({ speciesSlug: "dragon-wood", statedWeightKg: 10 })])).toEqual(["unknown_species"]);
  });
});

describe("listedSlabWarnings (a saved slab with its stored figures, as the desk and the listing form check it)", () => {
  it("compares the stored figures with the measurements: the 2 × 12 × 96 in board of 16 bf (the board-foot definition: in³ / 144)", () => {
    const inch = 25.4;
    const saved = {
      speciesSlug: "white-oak",
      lengthMm: 96 * inch,
      thicknessMm: 2 * inch,
      widthStationsMm: [12 * inch, 12 * inch],
      dryingMethod: "kiln" as const,
      lastMoisturePct: 8,
      figures: { boardFeet: 16, weightKg: 0 },
    };
    // The weight of 0 is far outside white oak's range; 16 bf matches.
    expect(listedSlabWarnings([saved]).map((w) => w.code)).toEqual(["weight_outside_species_range"]);
    expect(listedSlabWarnings([{ ...saved, figures: { boardFeet: 20, weightKg: 0 } }]).map((w) => w.code)).toEqual([
      "board_feet_mismatch",
      "weight_outside_species_range",
    ]);
  });
});
