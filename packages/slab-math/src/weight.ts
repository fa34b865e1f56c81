/**
 * Slab weight from volume, species and moisture content, with handling advice.
 */
import { SlabMathError, requireNumberInRange, requirePositive } from "./errors.ts";
import { LIMITS } from "./limits.ts";
import { speciesBySlug } from "./species.ts";
import { densityAtMoisture, densityAtMoistureFromShrinkage } from "./wood-physics.ts";

/**
 * Load constant of the revised NIOSH lifting equation (Waters et al. 1993): 23 kg (51 lb),
 * the most a person should lift under ideal conditions.
 */
export const NIOSH_LOAD_CONSTANT_KG = 23;

/**
 * Spread of density within a species, as a fraction (common practice: about ±10 %;
 * the Wood Handbook notes specific gravity varies within a species).
 */
export const DENSITY_VARIATION_FRACTION = 0.1;

/** Handling advice code for a slab of a given weight. */
export type HandlingAdvice = "one_person" | "two_people" | "mechanical_aid";

/** Input of {@link slabWeight}: a species slug or a basic specific gravity. */
export type SlabWeightInput = {
  /** Volume, m³. */
  volumeM3: number;
  /** Moisture content, % (0–200). */
  moistureContentPct: number;
  /** Density spread as a fraction (default 0.10 = ±10 %). */
  variationFraction?: number;
} & ({ speciesSlug: string; basicSpecificGravity?: undefined } | { basicSpecificGravity: number; speciesSlug?: undefined });

/** Result of {@link slabWeight}. */
export interface SlabWeight {
  /** Central estimate, kg. */
  kg: number;
  /** Low end of the range (density − variation), kg. */
  lowKg: number;
  /** High end of the range (density + variation), kg. */
  highKg: number;
  /** Density used, kg/m³. */
  densityKgPerM3: number;
  /** True when the high end exceeds the NIOSH load constant (23 kg): not a safe one-person lift. */
  heavyLift: boolean;
  /**
   * one_person: high end ≤ 23 kg; two_people: ≤ 46 kg (two lifters, each within the NIOSH
   * constant; common practice); mechanical_aid: above (slab cart, forklift, gantry).
   */
  handling: HandlingAdvice;
}

/**
 * Weight of a slab at a moisture content, with a low–high range for the natural spread of
 * density within a species. Density (Wood Handbook ch. 4): for a catalogue species from its basic
 * specific gravity and volumetric shrinkage ({@link densityAtMoistureFromShrinkage}); for a bare
 * basic specific gravity from the general equation ({@link densityAtMoisture}).
 * The heavy-lift flag and the handling advice are judged on the high end (the safe side).
 */
export function slabWeight(input: SlabWeightInput): SlabWeight {
  const volume = requirePositive(input.volumeM3, "volumeM3", LIMITS.maximumVolumeM3, "m³");
  const variation =
    input.variationFraction === undefined
      ? DENSITY_VARIATION_FRACTION
      : requireNumberInRange(input.variationFraction, "variationFraction", 0, 0.5);
  let density: number;
  if (input.speciesSlug !== undefined) {
    const entry = speciesBySlug(input.speciesSlug);
    density = densityAtMoistureFromShrinkage(entry.basicSpecificGravity, entry.shrinkageVolumetricPct, input.moistureContentPct);
  } else if (input.basicSpecificGravity !== undefined) {
    density = densityAtMoisture(input.basicSpecificGravity, input.moistureContentPct);
  } else {
    throw new SlabMathError("missing_input", "speciesSlug", "give either speciesSlug or basicSpecificGravity");
  }
  const kg = volume * density;
  const highKg = kg * (1 + variation);
  return {
    kg,
    lowKg: kg * (1 - variation),
    highKg,
    densityKgPerM3: density,
    heavyLift: highKg > NIOSH_LOAD_CONSTANT_KG,
    handling: handlingAdvice(highKg),
  };
}

/** Handling advice for a weight in kg (see {@link SlabWeight.handling}). */
export function handlingAdvice(kilograms: number): HandlingAdvice {
  requireNumberInRange(kilograms, "kilograms", 0, 1e7, "kg");
  if (kilograms <= NIOSH_LOAD_CONSTANT_KG) return "one_person";
  if (kilograms <= 2 * NIOSH_LOAD_CONSTANT_KG) return "two_people";
  return "mechanical_aid";
}

/** One slab's weight range, as {@link slabWeight} gives it (or as stored). */
export interface SlabWeightRange {
  kg: number;
  lowKg: number;
  highKg: number;
}

/** Result of {@link setWeight}: the set as a whole, and its heaviest single slab (what one lift must handle). */
export interface SetWeight {
  /** The whole set, central estimate, kg (the sum of its slabs). */
  totalKg: number;
  /** The whole set, low end, kg. */
  totalLowKg: number;
  /** The whole set, high end, kg: never below the heaviest slab's high end. */
  totalHighKg: number;
  /** The heaviest single slab, central estimate, kg. */
  heaviestSlabKg: number;
  /** The heaviest single slab, high end, kg: what the lifting advice is judged on. */
  heaviestSlabHighKg: number;
  /** Handling advice for the heaviest slab (slabs are lifted one at a time). */
  handling: HandlingAdvice;
  heavyLift: boolean;
}

/**
 * Weight of a set of slabs (a bookmatched pair, a sequential run), named so the set's total and
 * its heaviest single slab are never confused: mass is additive, so each end of the set's range
 * is the sum of the same end of its slabs' ranges (low with low, high with high), and the total's
 * high end is at least the heaviest slab's. The lifting advice is the heaviest slab's.
 */
export function setWeight(slabs: readonly SlabWeightRange[]): SetWeight {
  if (slabs.length === 0) throw new SlabMathError("missing_input", "slabs", "a set has at least one slab");
  let totalKg = 0;
  let totalLowKg = 0;
  let totalHighKg = 0;
  let heaviest = slabs[0]!;
  slabs.forEach((slab, index) => {
    requireNumberInRange(slab.lowKg, `slabs.${index}.lowKg`, 0, slab.kg, "kg");
    requireNumberInRange(slab.highKg, `slabs.${index}.highKg`, slab.kg, 1e7, "kg");
    totalKg += slab.kg;
    totalLowKg += slab.lowKg;
    totalHighKg += slab.highKg;
    if (slab.highKg > heaviest.highKg) heaviest = slab;
  });
  return {
    totalKg,
    totalLowKg,
    totalHighKg,
    heaviestSlabKg: heaviest.kg,
    heaviestSlabHighKg: heaviest.highKg,
    handling: handlingAdvice(heaviest.highKg),
    heavyLift: heaviest.highKg > NIOSH_LOAD_CONSTANT_KG,
  };
}
