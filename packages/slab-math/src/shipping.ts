/**
 * Shipping estimate: crate, chargeable weight, mode suggestion and cost from the caller's
 * rate table. The package holds no prices; every rule here is common practice, documented.
 */
import { SlabMathError, requireNonNegativeInteger, requireNumberInRange, requirePositive } from "./errors.ts";
import { LIMITS } from "./limits.ts";
import { NIOSH_LOAD_CONSTANT_KG } from "./weight.ts";

/**
 * Crate rule (common practice): the crate is the slab plus 50 mm on every side
 * (100 mm on each dimension) for blocking and framing, and weighs 10 kg per m² of its outside
 * surface (plywood or OSB sheathing on a timber frame).
 */
export const CRATE_RULE = Object.freeze({ clearancePerSideMm: 50, tareKgPerSquareMetre: 10 });

/** Default dimensional-weight divisor, cm³ per kg (common practice for parcel and air). */
export const DEFAULT_DIMENSIONAL_DIVISOR_CM3_PER_KG = 5000;

/** Default mode thresholds (common practice; carriers differ, pass your own). */
export const DEFAULT_SHIPPING_THRESHOLDS = Object.freeze({
  /** Heaviest chargeable weight sent as a parcel, kg. */
  parcelMaximumKg: 30,
  /** Longest crate sent as a parcel, mm. */
  parcelMaximumLengthMm: 1500,
  /** Heaviest gross weight sent as LTL freight, kg. */
  freightMaximumKg: 1000,
  /** Longest crate sent as LTL freight without an over-length arrangement, mm. */
  freightMaximumLengthMm: 3600,
});

/** One step of a rate table: price for chargeable weights up to `upToKg`. */
export interface RateStep {
  upToKg: number;
  priceMinor: number;
}

/** Rates by mode, supplied by the caller (integer minor units). */
export interface RateTable {
  parcel?: readonly RateStep[];
  freight?: readonly RateStep[];
}

/** Suggested shipping mode. */
export type ShippingMode = "parcel" | "freight" | "local_pickup";

/** Input of {@link shippingEstimate}. */
export interface ShippingEstimateInput {
  /** Slab length, mm. */
  lengthMm: number;
  /** Widest width, mm. */
  widthMm: number;
  thicknessMm: number;
  /** Slab weight, kg (e.g. the high end of slabWeight). */
  slabKg: number;
  rates: RateTable;
  /** Dimensional-weight divisor, cm³/kg (default 5000). */
  dimensionalDivisorCm3PerKg?: number;
  thresholds?: Partial<typeof DEFAULT_SHIPPING_THRESHOLDS>;
}

/** Why the estimate chose as it did. */
export type ShippingReason =
  "too_heavy_for_parcel" | "too_long_for_parcel" | "too_heavy_for_freight" | "too_long_for_freight" | "no_rate_for_weight";

/** Result of {@link shippingEstimate}. */
export interface ShippingEstimate {
  crate: { lengthMm: number; widthMm: number; heightMm: number; tareKg: number };
  /** Slab plus crate, kg. */
  grossKg: number;
  /** Crate volume (cm³) ÷ divisor, kg. */
  dimensionalKg: number;
  /** Larger of gross and dimensional weight, kg. */
  chargeableKg: number;
  mode: ShippingMode;
  /** Cost from the caller's rate table, minor units; null for pickup or when no step covers the weight. */
  costMinor: number | null;
  /** True above the NIOSH load constant (23 kg): more than one person must handle it. */
  heavyLift: boolean;
  reasons: ShippingReason[];
}

/**
 * Estimates crate, chargeable weight, shipping mode and cost for a slab.
 * Mode: parcel when the chargeable weight and crate length are within the parcel thresholds,
 * else freight when gross weight and length are within the freight thresholds, else local pickup.
 * Cost: the first rate step (sorted by `upToKg`) that covers the chargeable weight.
 */
export function shippingEstimate(input: ShippingEstimateInput): ShippingEstimate {
  const length = requirePositive(input.lengthMm, "lengthMm", LIMITS.maximumLengthMm, "mm");
  const width = requirePositive(input.widthMm, "widthMm", LIMITS.maximumWidthMm, "mm");
  const thickness = requirePositive(input.thicknessMm, "thicknessMm", LIMITS.maximumThicknessMm, "mm");
  const slabKg = requirePositive(input.slabKg, "slabKg", 50_000, "kg");
  const divisor = requirePositive(
    input.dimensionalDivisorCm3PerKg ?? DEFAULT_DIMENSIONAL_DIVISOR_CM3_PER_KG,
    "dimensionalDivisorCm3PerKg",
    1e6,
  );
  const thresholds = { ...DEFAULT_SHIPPING_THRESHOLDS, ...input.thresholds };
  for (const [name, value] of Object.entries(thresholds)) {
    requireNumberInRange(value, `thresholds.${name}`, 0, 1e7);
  }
  if (!input.rates || typeof input.rates !== "object") {
    throw new SlabMathError("missing_input", "rates", "rates is needed: { parcel?: [...], freight?: [...] }");
  }

  const clearance = 2 * CRATE_RULE.clearancePerSideMm;
  const crate = { lengthMm: length + clearance, widthMm: width + clearance, heightMm: thickness + clearance };
  const l = crate.lengthMm / 1000;
  const w = crate.widthMm / 1000;
  const h = crate.heightMm / 1000;
  const surfaceM2 = 2 * (l * w + l * h + w * h);
  const tareKg = surfaceM2 * CRATE_RULE.tareKgPerSquareMetre;
  const grossKg = slabKg + tareKg;
  const volumeCm3 = (crate.lengthMm / 10) * (crate.widthMm / 10) * (crate.heightMm / 10);
  const dimensionalKg = volumeCm3 / divisor;
  const chargeableKg = Math.max(grossKg, dimensionalKg);

  const reasons: ShippingReason[] = [];
  if (chargeableKg > thresholds.parcelMaximumKg) reasons.push("too_heavy_for_parcel");
  if (crate.lengthMm > thresholds.parcelMaximumLengthMm) reasons.push("too_long_for_parcel");
  let mode: ShippingMode = "parcel";
  if (reasons.length > 0) {
    mode = "freight";
    if (grossKg > thresholds.freightMaximumKg) reasons.push("too_heavy_for_freight");
    if (crate.lengthMm > thresholds.freightMaximumLengthMm) reasons.push("too_long_for_freight");
    if (reasons.includes("too_heavy_for_freight") || reasons.includes("too_long_for_freight")) mode = "local_pickup";
  }

  let costMinor: number | null = null;
  if (mode !== "local_pickup") {
    const steps = readSteps(input.rates[mode], `rates.${mode}`);
    const step = steps.find((candidate) => candidate.upToKg >= chargeableKg);
    if (step) costMinor = step.priceMinor;
    else reasons.push("no_rate_for_weight");
  }
  return {
    crate: { ...crate, tareKg },
    grossKg,
    dimensionalKg,
    chargeableKg,
    mode,
    costMinor,
    heavyLift: grossKg > NIOSH_LOAD_CONSTANT_KG,
    reasons,
  };
}

function readSteps(steps: readonly RateStep[] | undefined, field: string): RateStep[] {
  if (steps === undefined) return [];
  if (!Array.isArray(steps)) {
    throw new SlabMathError("missing_input", field, `${field} must be a list of { upToKg, priceMinor }`);
  }
  return steps
    .map((step, index) => ({
      upToKg: requirePositive(step?.upToKg, `${field}[${index}].upToKg`, 1e7, "kg"),
      priceMinor: requireNonNegativeInteger(step?.priceMinor, `${field}[${index}].priceMinor`),
    }))
    .sort((a, b) => a.upToKg - b.upToKg);
}
