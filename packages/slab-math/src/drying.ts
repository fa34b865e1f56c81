/**
 * Drying: a projection from a slab's own moisture readings, and the air-drying rule of thumb.
 */
import { SlabMathError, requireNumberInRange, requirePositive } from "./errors.ts";
import { LIMITS } from "./limits.ts";
import { MILLIMETRES_PER_INCH } from "./units.ts";
import { KILN_DRIED_TARGET_BAND } from "./wood-physics.ts";

const MILLISECONDS_PER_DAY = 86_400_000;

/** One moisture-meter reading. */
export interface MoistureReading {
  /** When it was taken: ISO 8601 text or epoch milliseconds. */
  date: string | number;
  /** Moisture content, %. */
  moistureContentPct: number;
}

/** Options of {@link dryingProjection}. */
export interface DryingProjectionOptions {
  /**
   * Moisture content the slab drifts toward where it is drying, % (the asymptote of the fit).
   * Default 8 % (a heated shed or kiln finish); pass the outdoor EMC for air-drying.
   */
  equilibriumMoistureContentPct?: number;
  /** Moisture content to project, % (default: the top of the kiln-dried band, 10 %). */
  targetMoisturePct?: number;
  /** Band in which a slab is ready (default {@link KILN_DRIED_TARGET_BAND}). */
  targetBand?: { minimumPct: number; maximumPct: number };
}

/** Result of {@link dryingProjection}, discriminated by `status`. */
export type DryingProjection =
  | { status: "ready"; lastMoisturePct: number }
  | { status: "below_target_band"; lastMoisturePct: number }
  | { status: "not_enough_readings"; readingsNeeded: number; usableReadings: number }
  | { status: "not_drying"; lastMoisturePct: number }
  | { status: "target_not_reachable"; equilibriumMoistureContentPct: number; targetMoisturePct: number }
  | {
      status: "projected";
      /** Projected date the target is reached, ISO 8601 (never before the last reading). */
      projectedDate: string;
      projectedEpochMs: number;
      /** Days from the last reading to the projected date. */
      daysFromLastReading: number;
      /** Fitted drying rate k, per day. */
      ratePerDay: number;
      /** Fitted moisture content at the first reading, %. */
      fittedInitialMoisturePct: number;
      equilibriumMoistureContentPct: number;
      targetMoisturePct: number;
    };

/** Fewest readings a projection is fitted to. */
export const MINIMUM_READINGS_FOR_PROJECTION = 3;

/**
 * Projects when a drying slab reaches its target moisture content from its own readings.
 * Model (common practice, a first-order "exponential" drying curve):
 *   MC(t) = EMC + (MC₀ − EMC) · e^(−k·t),
 * fitted by least squares on ln(MC − EMC) = ln(MC₀ − EMC) − k·t (readings at or below the EMC
 * carry no information on k and are left out). The target date solves MC(t) = target.
 *
 * Order of decisions: 'ready' when the last reading is inside the target band (however few
 * readings there are), 'below_target_band' when it is below; 'not_enough_readings' with fewer
 * than 3 usable readings; 'not_drying' when the readings do not fall (k ≤ 0 or last ≥ first);
 * 'target_not_reachable' when the target is at or below the EMC; else 'projected'.
 */
export function dryingProjection(readings: readonly MoistureReading[], options: DryingProjectionOptions = {}): DryingProjection {
  if (!Array.isArray(readings)) {
    throw new SlabMathError("missing_input", "readings", "readings must be a list of { date, moistureContentPct }");
  }
  const band = options.targetBand ?? KILN_DRIED_TARGET_BAND;
  requireNumberInRange(band.minimumPct, "targetBand.minimumPct", 0, LIMITS.maximumMoisturePct, "%");
  requireNumberInRange(band.maximumPct, "targetBand.maximumPct", band.minimumPct, LIMITS.maximumMoisturePct, "%");
  const equilibrium = requireNumberInRange(options.equilibriumMoistureContentPct ?? 8, "equilibriumMoistureContentPct", 0, 30, "%");
  const target = requireNumberInRange(options.targetMoisturePct ?? band.maximumPct, "targetMoisturePct", 0, LIMITS.maximumMoisturePct, "%");

  const points = readings.map((reading, index) => ({
    time: readingTime(reading?.date, `readings[${index}].date`),
    moisture: requireNumberInRange(
      reading?.moistureContentPct,
      `readings[${index}].moistureContentPct`,
      LIMITS.minimumMoisturePct,
      LIMITS.maximumMoisturePct,
      "%",
    ),
  }));
  points.sort((a, b) => a.time - b.time);

  const last = points[points.length - 1];
  if (last) {
    if (last.moisture >= band.minimumPct && last.moisture <= band.maximumPct) {
      return { status: "ready", lastMoisturePct: last.moisture };
    }
    if (last.moisture < band.minimumPct) {
      return { status: "below_target_band", lastMoisturePct: last.moisture };
    }
  }
  const usable = points.filter((point) => point.moisture > equilibrium);
  if (usable.length < MINIMUM_READINGS_FOR_PROJECTION || !last) {
    return { status: "not_enough_readings", readingsNeeded: MINIMUM_READINGS_FOR_PROJECTION, usableReadings: usable.length };
  }
  const first = usable[0]!;
  // Least squares of y = ln(MC − EMC) on t (days since the first usable reading).
  let sumT = 0;
  let sumY = 0;
  let sumTT = 0;
  let sumTY = 0;
  for (const point of usable) {
    const t = (point.time - first.time) / MILLISECONDS_PER_DAY;
    const y = Math.log(point.moisture - equilibrium);
    sumT += t;
    sumY += y;
    sumTT += t * t;
    sumTY += t * y;
  }
  const count = usable.length;
  const spread = count * sumTT - sumT * sumT;
  if (spread <= 0) {
    // All readings on the same day: no slope can be fitted.
    return { status: "not_enough_readings", readingsNeeded: MINIMUM_READINGS_FOR_PROJECTION, usableReadings: 1 };
  }
  const slope = (count * sumTY - sumT * sumY) / spread;
  const intercept = (sumY - slope * sumT) / count;
  const rate = -slope;
  if (!(rate > 0) || last.moisture >= points[0]!.moisture) {
    return { status: "not_drying", lastMoisturePct: last.moisture };
  }
  if (target <= equilibrium) {
    return { status: "target_not_reachable", equilibriumMoistureContentPct: equilibrium, targetMoisturePct: target };
  }
  const daysFromFirst = (intercept - Math.log(target - equilibrium)) / rate;
  const projectedEpochMs = Math.max(first.time + daysFromFirst * MILLISECONDS_PER_DAY, last.time);
  return {
    status: "projected",
    projectedDate: new Date(projectedEpochMs).toISOString(),
    projectedEpochMs,
    daysFromLastReading: (projectedEpochMs - last.time) / MILLISECONDS_PER_DAY,
    ratePerDay: rate,
    fittedInitialMoisturePct: equilibrium + Math.exp(intercept),
    equilibriumMoistureContentPct: equilibrium,
    targetMoisturePct: target,
  };
}

function readingTime(date: unknown, field: string): number {
  const time = typeof date === "number" ? date : typeof date === "string" ? Date.parse(date) : Number.NaN;
  if (!Number.isFinite(time) || new Date(time).toString() === "Invalid Date") {
    throw new SlabMathError("invalid_date", field, `${field} must be an ISO date or epoch milliseconds, got ${String(date)}`);
  }
  return time;
}

/**
 * Air-drying time by the rule of thumb of about one year per inch of thickness (common
 * practice), down to near the outdoor EMC; a kiln finishes the rest.
 */
export function airDryingRuleOfThumbYears(thicknessMm: number): number {
  return requirePositive(thicknessMm, "thicknessMm", LIMITS.maximumThicknessMm, "mm") / MILLIMETRES_PER_INCH;
}
