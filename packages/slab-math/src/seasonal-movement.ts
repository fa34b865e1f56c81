/**
 * Seasonal movement of a slab's width between two indoor climates.
 */
import { SlabMathError, requireNumberInRange, requirePositive } from "./errors.ts";
import { LIMITS } from "./limits.ts";
import { speciesBySlug } from "./species.ts";
import { DIMENSIONAL_CHANGE_COEFFICIENT_RANGE, dimensionalChange, equilibriumMoistureContent } from "./wood-physics.ts";

/** An indoor climate. */
export interface IndoorClimate {
  /** Air temperature, °C. */
  temperatureC: number;
  /** Relative humidity, %. */
  relativeHumidityPct: number;
}

/** Input of {@link seasonalMovement}: a species slug or a tangential coefficient. */
export type SeasonalMovementInput = {
  /** Width across the grain at the winter moisture content, mm. */
  widthMm: number;
  summer: IndoorClimate;
  winter: IndoorClimate;
} & ({ speciesSlug: string; tangentialCoefficient?: undefined } | { tangentialCoefficient: number; speciesSlug?: undefined });

/** Note codes of {@link SeasonalMovement}. */
export type SeasonalMovementNote =
  /** The tangential coefficient was used: a through-and-through slab is mostly flat-sawn. */
  | "tangential_coefficient_used"
  /** An EMC lies outside 6–14 %, where the handbook coefficients were fitted: an estimate. */
  | "outside_coefficient_range";

/** Result of {@link seasonalMovement}. */
export interface SeasonalMovement {
  summerEmcPct: number;
  winterEmcPct: number;
  /** Signed change of width from winter to summer, mm (positive: wider in summer). */
  widthChangeMm: number;
  /** Coefficient used, fraction per % MC. */
  coefficientUsed: number;
  notes: SeasonalMovementNote[];
}

/**
 * How much a slab's width moves between a winter and a summer indoor climate: EMC of each
 * climate by {@link equilibriumMoistureContent}, then ΔW = W · C_T · (EMC_summer − EMC_winter)
 * by {@link dimensionalChange} with the species' TANGENTIAL coefficient (Wood Handbook ch. 13):
 * a slab sawn through and through is mostly flat-sawn across its width, so tangential is
 * the honest (larger) figure.
 */
export function seasonalMovement(input: SeasonalMovementInput): SeasonalMovement {
  const width = requirePositive(input.widthMm, "widthMm", LIMITS.maximumWidthMm, "mm");
  let coefficient: number;
  if (input.speciesSlug !== undefined) {
    coefficient = speciesBySlug(input.speciesSlug).tangentialCoefficient;
  } else if (input.tangentialCoefficient !== undefined) {
    coefficient = requireNumberInRange(input.tangentialCoefficient, "tangentialCoefficient", 0, 0.02);
  } else {
    throw new SlabMathError("missing_input", "speciesSlug", "give either speciesSlug or tangentialCoefficient");
  }
  if (!input.summer || !input.winter) {
    throw new SlabMathError("missing_input", input.summer ? "winter" : "summer", "give both a summer and a winter climate");
  }
  const summerEmcPct = climateEmc(input.summer, "summer");
  const winterEmcPct = climateEmc(input.winter, "winter");
  const notes: SeasonalMovementNote[] = ["tangential_coefficient_used"];
  const { minimumPct, maximumPct } = DIMENSIONAL_CHANGE_COEFFICIENT_RANGE;
  if (Math.min(summerEmcPct, winterEmcPct) < minimumPct || Math.max(summerEmcPct, winterEmcPct) > maximumPct) {
    notes.push("outside_coefficient_range");
  }
  return {
    summerEmcPct,
    winterEmcPct,
    widthChangeMm: dimensionalChange(width, winterEmcPct, summerEmcPct, coefficient),
    coefficientUsed: coefficient,
    notes,
  };
}

function climateEmc(climate: IndoorClimate, field: string): number {
  try {
    return equilibriumMoistureContent(climate.temperatureC, climate.relativeHumidityPct);
  } catch (error) {
    if (error instanceof SlabMathError) {
      throw new SlabMathError(error.code, `${field}.${error.field}`, `${field}.${error.message}`);
    }
    throw error;
  }
}
