/**
 * Wood–moisture physics after the USDA Forest Products Laboratory's Wood Handbook
 * (FPL-GTR-190, 2010), chapters 4 and 13, and Simpson (1993, FPL-GTR-76).
 */
import { SlabMathError, requireNumberInRange } from "./errors.ts";
import { LIMITS } from "./limits.ts";

/**
 * Fibre saturation point, % MC. Wood Handbook ch. 4 uses about 30 % as the average;
 * below it wood shrinks and swells, above it only free water in the cell cavities changes.
 */
export const FIBRE_SATURATION_POINT_PCT = 30;

/**
 * Target moisture band for kiln-dried slabs going into indoor furniture, % MC
 * (common practice: 6–10 %, matching the indoor EMC of heated and air-conditioned homes).
 */
export const KILN_DRIED_TARGET_BAND = Object.freeze({ minimumPct: 6, maximumPct: 10 });

/**
 * Range of moisture contents over which the Wood Handbook's dimensional change
 * coefficients were fitted (Table 13-5: "within moisture content limits of 6 % to 14 %").
 */
export const DIMENSIONAL_CHANGE_COEFFICIENT_RANGE = Object.freeze({ minimumPct: 6, maximumPct: 14 });

/** Density of water at 4 °C, kg/m³ (the reference of specific gravity). */
const WATER_DENSITY_KG_PER_M3 = 1000;

/**
 * Specific gravity based on the volume at moisture content M (oven-dry mass over volume at M),
 * from the basic (green-volume) specific gravity. Wood Handbook ch. 4:
 *   G_M = G_b / (1 − 0.265 · a · G_b), a = (30 − M) / 30, for M < 30 %;
 * at or above fibre saturation the green volume holds, G_M = G_b.
 */
export function specificGravityAtMoisture(basicSpecificGravity: number, moistureContentPct: number): number {
  const basic = requireNumberInRange(
    basicSpecificGravity,
    "basicSpecificGravity",
    LIMITS.minimumSpecificGravity,
    LIMITS.maximumSpecificGravity,
  );
  const moisture = requireNumberInRange(
    moistureContentPct,
    "moistureContentPct",
    LIMITS.minimumMoisturePct,
    LIMITS.maximumMoisturePct,
    "%",
  );
  if (moisture >= FIBRE_SATURATION_POINT_PCT) return basic;
  const a = (FIBRE_SATURATION_POINT_PCT - moisture) / FIBRE_SATURATION_POINT_PCT;
  return basic / (1 - 0.265 * a * basic);
}

/**
 * Density of wood (mass of wood and water over volume, both at moisture content M), kg/m³,
 * from a specific gravity that is already based on the volume at M:
 *   ρ = 1000 · G_M · (1 + M/100)   (Wood Handbook ch. 4).
 */
export function densityFromSpecificGravity(specificGravityAtMoistureContent: number, moistureContentPct: number): number {
  const gravity = requireNumberInRange(
    specificGravityAtMoistureContent,
    "specificGravityAtMoistureContent",
    LIMITS.minimumSpecificGravity,
    1.6,
  );
  const moisture = requireNumberInRange(
    moistureContentPct,
    "moistureContentPct",
    LIMITS.minimumMoisturePct,
    LIMITS.maximumMoisturePct,
    "%",
  );
  return WATER_DENSITY_KG_PER_M3 * gravity * (1 + moisture / 100);
}

/**
 * Density of wood at a moisture content, kg/m³, from its basic (green) specific gravity:
 * G_M from {@link specificGravityAtMoisture}, then ρ = 1000 · G_M · (1 + M/100).
 * Source: Wood Handbook FPL-GTR-190 ch. 4; Simpson 1993 (FPL-GTR-76).
 *
 * @param basicSpecificGravity oven-dry mass over green volume (0.1–1.3)
 * @param moistureContentPct moisture content, % of oven-dry mass (0–200)
 */
export function densityAtMoisture(basicSpecificGravity: number, moistureContentPct: number): number {
  const gravity = specificGravityAtMoisture(basicSpecificGravity, moistureContentPct);
  return WATER_DENSITY_KG_PER_M3 * gravity * (1 + moistureContentPct / 100);
}

/**
 * Density at a moisture content from basic specific gravity AND the species' own volumetric
 * shrinkage (green → oven-dry), kg/m³. Wood Handbook ch. 4: shrinkage from green to an
 * intermediate moisture content is S_M = S₀ · (1 − M / M_f) with M_f ≈ 30 %; the oven-dry mass is
 * unchanged, so G_M = G_b / (1 − S_M / 100), and ρ = 1000 · G_M · (1 + M/100).
 * Closer than {@link densityAtMoisture} for species whose shrinkage is far from average
 * (basswood shrinks a lot for its density, black locust very little).
 */
export function densityAtMoistureFromShrinkage(
  basicSpecificGravity: number,
  volumetricShrinkagePct: number,
  moistureContentPct: number,
): number {
  const basic = requireNumberInRange(
    basicSpecificGravity,
    "basicSpecificGravity",
    LIMITS.minimumSpecificGravity,
    LIMITS.maximumSpecificGravity,
  );
  const shrinkage = requireNumberInRange(volumetricShrinkagePct, "volumetricShrinkagePct", 0, 40, "%");
  const moisture = requireNumberInRange(
    moistureContentPct,
    "moistureContentPct",
    LIMITS.minimumMoisturePct,
    LIMITS.maximumMoisturePct,
    "%",
  );
  const shrinkageToMoisture = moisture >= FIBRE_SATURATION_POINT_PCT ? 0 : shrinkage * (1 - moisture / FIBRE_SATURATION_POINT_PCT);
  return WATER_DENSITY_KG_PER_M3 * (basic / (1 - shrinkageToMoisture / 100)) * (1 + moisture / 100);
}

/**
 * Equilibrium moisture content of wood, % MC, for air at a temperature and relative humidity.
 * Wood Handbook ch. 4 eq. 4-5 (also ch. 13): Simpson's (1973) fit of the Hailwood–Horrobin
 * two-hydrate sorption model, temperature T in °F:
 *   M = (1800/W)·[ Kh/(1−Kh) + (K₁Kh + 2K₁K₂K²h²)/(1 + K₁Kh + K₁K₂K²h²) ]
 *   W = 330 + 0.452T + 0.00415T², K = 0.791 + 0.000463T − 0.000000844T²,
 *   K₁ = 6.34 + 0.000775T − 0.0000935T², K₂ = 1.09 + 0.0284T − 0.0000904T².
 * The handbook's Table 4-2 (−1.1 to 132 °C, 5–95 % RH) was computed from it.
 *
 * @param temperatureC air temperature, °C (−30 to 130)
 * @param relativeHumidityPct relative humidity, % (0–100)
 */
export function equilibriumMoistureContent(temperatureC: number, relativeHumidityPct: number): number {
  const celsius = requireNumberInRange(temperatureC, "temperatureC", LIMITS.minimumTemperatureC, LIMITS.maximumTemperatureC, "°C");
  const humidity = requireNumberInRange(relativeHumidityPct, "relativeHumidityPct", 0, 100, "%") / 100;
  const t = celsius * 1.8 + 32;
  const w = 330 + 0.452 * t + 0.00415 * t * t;
  const k = 0.791 + 0.000463 * t - 0.000000844 * t * t;
  const k1 = 6.34 + 0.000775 * t - 0.0000935 * t * t;
  const k2 = 1.09 + 0.0284 * t - 0.0000904 * t * t;
  const kh = k * humidity;
  const firstHydrate = kh / (1 - kh);
  const secondHydrate = (k1 * kh + 2 * k1 * k2 * kh * kh) / (1 + k1 * kh + k1 * k2 * kh * kh);
  return (1800 / w) * (firstHydrate + secondHydrate);
}

/**
 * Signed change of a dimension across the grain when moisture content changes, mm.
 * Wood Handbook ch. 13: ΔD = D_I · C · (M_F − M_I), C the species' radial or tangential
 * dimensional change coefficient (Table 13-5, fitted between 6 % and 14 % MC).
 * Both moisture contents are clamped to [0, fibre saturation point]: above ~30 % MC there is
 * no further change. Negative result = shrinkage.
 *
 * @param dimensionMm dimension at the initial moisture content, mm
 * @param fromMoisturePct initial moisture content, %
 * @param toMoisturePct final moisture content, %
 * @param coefficient dimensional change coefficient, fraction per % MC (e.g. 0.00274)
 */
export function dimensionalChange(dimensionMm: number, fromMoisturePct: number, toMoisturePct: number, coefficient: number): number {
  const dimension = requireNumberInRange(dimensionMm, "dimensionMm", 0, LIMITS.maximumLengthMm, "mm");
  const from = requireNumberInRange(fromMoisturePct, "fromMoisturePct", 0, LIMITS.maximumMoisturePct, "%");
  const to = requireNumberInRange(toMoisturePct, "toMoisturePct", 0, LIMITS.maximumMoisturePct, "%");
  const perPercent = requireNumberInRange(coefficient, "coefficient", 0, 0.02);
  if (perPercent === 0) {
    throw new SlabMathError("out_of_range", "coefficient", "coefficient must be greater than 0 (e.g. 0.00274 per % MC)");
  }
  const clampedFrom = Math.min(from, FIBRE_SATURATION_POINT_PCT);
  const clampedTo = Math.min(to, FIBRE_SATURATION_POINT_PCT);
  return dimension * perPercent * (clampedTo - clampedFrom);
}
