import { describe, expect, it } from "vitest";
import type { Slab } from "@grainyard/contracts";
import { listingPreview } from "./useListingFigures.ts";
import { NIOSH_LOAD_CONSTANT_KG } from "@grainyard/slab-math";
import { USUAL_FEES } from "@grainyard/slab-math";

function slab(boardFeet: number, volumeM3: number, weightLowKg: number, weightHighKg: number): Slab {
  return {
    id: `s-${boardFeet}`,
    logId: null,
    sequenceInLog: null,
    speciesSlug: "black-walnut",
    lengthMm: 2440,
    thicknessMm: 57,
    widthStationsMm: [600, 600],
    liveEdge: "both",
    surfacing: "flattened",
    features: [],
    defects: [],
    dryingMethod: "kiln",
    kilnCompletedOn: null,
    heatTreated: false,
    heatTreatmentTemperatureC: null,
    heatTreatmentMinutes: null,
    notes: "",
    figures: {
      areaM2: 1,
      volumeM3,
      boardFeet,
      averageWidthMm: 600,
      minWidthMm: 600,
      maxWidthMm: 600,
      weightKg: (weightLowKg + weightHighKg) / 2,
      weightLowKg,
      weightHighKg,
      weightAtMoisturePct: 8,
      heavyLift: weightHighKg > NIOSH_LOAD_CONSTANT_KG,
      handling: "two_people",
    },
    lastMoisturePct: 8,
    lastReadOn: null,
    dryingState: "ready",
    listingId: null,
    createdAt: "2026-05-01T00:00:00.000Z",
  };
}

describe("listing live figures", () => {
  it("uses Grainyard's preview fees: 10 % platform, 2.9 % + 0.30 processing", () => {
    expect(USUAL_FEES).toEqual({ platformFeeBps: 1000, processingFeeBps: 290, processingFixedMinor: 30 });
  });

  it("prices a set per board foot over its total, then splits fees and the sawyer's net", () => {
    // Worked by hand: 20 bf + 30 bf = 50 bf × $12.50 = $625.00 (62 500 cents).
    // Platform 10 % = 6 250; processing 2.9 % = 1 812.5 → 1 813 (half up) + 30 = 1 843;
    // net = 62 500 − 6 250 − 1 843 = 54 407.
    const preview = listingPreview([slab(20, 0.0472, 20, 25), slab(30, 0.0708, 30, 36)], "per_board_foot", 1250);
    expect(preview.boardFeet).toBe(50);
    expect(preview.priceMinor).toBe(62_500);
    expect(preview.fees).toEqual({ platformFeeMinor: 6_250, processingFeeMinor: 1_843, sawyerNetMinor: 54_407 });
    expect(preview.weightLowKg).toBe(50);
    expect(preview.weightHighKg).toBe(61);
    expect(preview.heavyLift).toBe(true);
    expect(preview.problem).toBeNull();
  });

  it("prices per cubic metre from the total volume, rounding half up once", () => {
    // 0.125 m³ × €1 500.00 = €187.50 = 18 750 cents; 0.0833 m³ × 150 000 = 12 495 cents exactly.
    expect(listingPreview([slab(53, 0.125, 10, 12)], "per_cubic_metre", 150_000).priceMinor).toBe(18_750);
    expect(listingPreview([slab(35, 0.0833, 10, 12)], "per_cubic_metre", 150_000).priceMinor).toBe(12_495);
  });

  it("takes a fixed price as it is", () => {
    const preview = listingPreview([slab(20, 0.0472, 10, 12), slab(21, 0.05, 10, 12)], "fixed", 90_000);
    expect(preview.priceMinor).toBe(90_000);
    // 9 000 platform; 2 610 + 30 processing; 78 360 net.
    expect(preview.fees).toEqual({ platformFeeMinor: 9_000, processingFeeMinor: 2_640, sawyerNetMinor: 78_360 });
  });

  it("says what is missing instead of showing a price", () => {
    expect(listingPreview([], "fixed", 1000).problem).toBe("Choose a slab to see the figures.");
    expect(listingPreview([slab(20, 0.05, 1, 2)], "", 1000).problem).toBe("Choose how the price is set.");
    expect(listingPreview([slab(20, 0.05, 1, 2)], "fixed", null).problem).toBe("Type the rate to see the price.");
  });

  it("says so when the fees would be more than the sale", () => {
    // 0.1 bf × 1.00 = 10 cents: the 30-cent fixed fee alone is more.
    const preview = listingPreview([slab(0.1, 0.0002, 0.1, 0.2)], "per_board_foot", 100);
    expect(preview.priceMinor).toBe(10);
    expect(preview.fees).toBeNull();
    expect(preview.problem).toMatch(/fees would be more than the sale/);
  });
});
