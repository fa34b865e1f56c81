import { describe, expect, it } from "vitest";
import { SlabMathError } from "./errors.ts";
import { airDryingRuleOfThumbYears, dryingProjection } from "./drying.ts";

const DAY = 86_400_000;
const START = Date.parse("2025-03-01T00:00:00.000Z");

/** Readings on an exact exponential drying curve MC(t) = 8 + 52 · e^(−0.01·t), t in days. */
function exactCurve(days: number[]) {
  return days.map((day) => ({ date: new Date(START + day * DAY).toISOString(), moistureContentPct: 8 + 52 * Math.exp(-0.01 * day) }));
}

describe("dryingProjection (exponential drying curve fitted on ln(MC − EMC), common practice)", () => {
  it("recovers k and projects the date the target is reached (closed form worked by hand)", () => {
    const result = dryingProjection(exactCurve([0, 30, 60, 120]), { equilibriumMoistureContentPct: 8, targetMoisturePct: 10 });
    expect(result.status).toBe("projected");
    if (result.status !== "projected") return;
    expect(result.ratePerDay).toBeCloseTo(0.01, 10);
    expect(result.fittedInitialMoisturePct).toBeCloseTo(60, 8);
    // 10 = 8 + 52·e^(−0.01 t) → t = ln(52 / 2) / 0.01 = ln 26 / 0.01 = 325.81 days after 1 March 2025
    // 1 March + 305 days = 31 December; + 20 more = 20 January 2026, + 0.81 day ≈ 19:26 UTC
    expect((result.projectedEpochMs - START) / DAY).toBeCloseTo(325.81, 2);
    expect(result.projectedDate.slice(0, 10)).toBe("2026-01-20");
    expect(result.daysFromLastReading).toBeCloseTo(205.81, 2);
  });

  it("accepts epoch milliseconds and unsorted readings", () => {
    const readings = exactCurve([60, 0, 120, 30]).map((reading) => ({ ...reading, date: Date.parse(reading.date) }));
    const result = dryingProjection(readings, { equilibriumMoistureContentPct: 8, targetMoisturePct: 10 });
    expect(result.status === "projected" && Math.round(result.ratePerDay * 1000)).toBe(10);
  });

  it("fewer than 3 readings: not_enough_readings", () => {
    expect(dryingProjection(exactCurve([0, 30])).status).toBe("not_enough_readings");
    expect(dryingProjection([]).status).toBe("not_enough_readings");
  });

  it("rising or flat readings: not_drying", () => {
    const rising = [
      { date: "2025-01-01", moistureContentPct: 20 },
      { date: "2025-02-01", moistureContentPct: 22 },
      { date: "2025-03-01", moistureContentPct: 25 },
    ];
    expect(dryingProjection(rising).status).toBe("not_drying");
  });

  it("last reading inside the 6–10 % band: ready (even with a single reading)", () => {
    expect(dryingProjection([{ date: "2025-05-01", moistureContentPct: 8.5 }])).toEqual({ status: "ready", lastMoisturePct: 8.5 });
    expect(dryingProjection([...exactCurve([0, 30]), { date: "2026-06-01", moistureContentPct: 9.9 }]).status).toBe("ready");
  });

  it("over-dried below the band, and a target at or below the EMC", () => {
    expect(dryingProjection([{ date: "2025-05-01", moistureContentPct: 4 }]).status).toBe("below_target_band");
    expect(dryingProjection(exactCurve([0, 30, 60]), { equilibriumMoistureContentPct: 12, targetMoisturePct: 12 }).status).toBe(
      "target_not_reachable",
    );
  });

  it("rejects invalid readings naming the reading", () => {
    expect(() => dryingProjection([{ date: "yesterday", moistureContentPct: 20 }])).toThrow(/readings\[0\]\.date/);
    expect(() => dryingProjection([{ date: "2025-01-01", moistureContentPct: -3 }])).toThrow(SlabMathError);
  });
});

describe("airDryingRuleOfThumbYears (common practice: about one year per inch of thickness)", () => {
  it("2 in (50.8 mm) → 2 years; 3 in (76.2 mm) → 3 years", () => {
    expect(airDryingRuleOfThumbYears(50.8)).toBeCloseTo(2, 12);
    expect(airDryingRuleOfThumbYears(76.2)).toBeCloseTo(3, 12);
    expect(() => airDryingRuleOfThumbYears(0)).toThrow(/thicknessMm/);
  });
});
