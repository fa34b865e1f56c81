/**
 * Micro-benchmarks: evaluations per second (vitest bench prints hz). Figures only; no timed
 * assertions anywhere in the tests. Target on a 2-core machine: slabGeometry > 1 million/s.
 */
import { bench, describe } from "vitest";
import { feeBreakdown, slabGeometry, slabPrice, slabWeight } from "./index.ts";

const stations = [812, 845, 870, 902, 915, 930, 921, 898, 877, 860, 842];
let sink = 0;

describe("slabGeometry", () => {
  bench("slabGeometry, 11 stations", () => {
    sink += slabGeometry({ lengthMm: 2740, thicknessMm: 63.5, widthStationsMm: stations }).volumeM3;
  });
});

describe("weight and price pipeline", () => {
  bench("slabGeometry → slabWeight → slabPrice → feeBreakdown", () => {
    const geometry = slabGeometry({ lengthMm: 2740, thicknessMm: 63.5, widthStationsMm: stations });
    const weight = slabWeight({ volumeM3: geometry.volumeM3, speciesSlug: "black-walnut", moistureContentPct: 8 });
    const price = slabPrice({ mode: "per_board_foot", rateMinor: 1800, boardFeet: geometry.boardFeet });
    const fees = feeBreakdown(price.priceMinor, { platformFeeBps: 1000, processingFeeBps: 290, processingFixedMinor: 30 });
    sink += weight.kg + fees.sawyerNetMinor;
  });
});

export { sink };
