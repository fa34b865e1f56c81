/**
 * @grainyard/slab-math — slab measurement, wood physics and money for Grainyard.
 * Pure TypeScript, no I/O. See README.md for every export, its units and its source.
 */
export { SlabMathError, type SlabMathErrorCode } from "./errors.ts";
export { LIMITS } from "./limits.ts";
export { slabGeometry, boardFeet, widthAtPosition, minimumWidthBetween, type SlabGeometry, type SlabGeometryInput } from "./geometry.ts";
export {
  FIBRE_SATURATION_POINT_PCT,
  KILN_DRIED_TARGET_BAND,
  DIMENSIONAL_CHANGE_COEFFICIENT_RANGE,
  specificGravityAtMoisture,
  densityFromSpecificGravity,
  densityAtMoisture,
  densityAtMoistureFromShrinkage,
  equilibriumMoistureContent,
  dimensionalChange,
} from "./wood-physics.ts";
export { species, speciesBySlug, findSpeciesBySlug, type Species, type SpeciesSources, type SpeciesValueName } from "./species.ts";
export {
  NIOSH_LOAD_CONSTANT_KG,
  DENSITY_VARIATION_FRACTION,
  slabWeight,
  setWeight,
  handlingAdvice,
  type HandlingAdvice,
  type SlabWeight,
  type SlabWeightInput,
} from "./weight.ts";
export {
  BASIS_POINTS_PER_WHOLE,
  roundHalfUp,
  feeBreakdown,
  slabPrice,
  refundShares,
  taxOn,
  USUAL_FEES,
  formatMoney,
  formatBasisPoints,
  parseMoneyInput,
  minorToInput,
  type ParsedMoney,
  type FeeSettings,
  type FeeBreakdown,
  type PriceMode,
  type SlabPriceInput,
  type SlabPrice,
} from "./money.ts";
export {
  MILLIMETRES_PER_INCH,
  MILLIMETRES_PER_FOOT,
  KILOGRAMS_PER_POUND,
  CUBIC_INCHES_PER_BOARD_FOOT,
  CUBIC_METRES_PER_BOARD_FOOT,
  millimetresToInches,
  inchesToMillimetres,
  kilogramsToPounds,
  poundsToKilograms,
  cubicMetresToBoardFeet,
  boardFeetToCubicMetres,
  celsiusToFahrenheit,
  fahrenheitToCelsius,
  inchesToFraction,
  formatInches,
  millimetresToFeetAndInches,
  formatFeetAndInches,
  formatMetresAsFeetAndInches,
  feetAndInchesToMillimetres,
  parseInches,
  type InchFraction,
} from "./units.ts";
export {
  seasonalMovement,
  type IndoorClimate,
  type SeasonalMovement,
  type SeasonalMovementInput,
  type SeasonalMovementNote,
} from "./seasonal-movement.ts";
export {
  MINIMUM_READINGS_FOR_PROJECTION,
  dryingProjection,
  airDryingRuleOfThumbYears,
  type MoistureReading,
  type DryingProjection,
  type DryingProjectionOptions,
} from "./drying.ts";
export {
  DEFAULT_FLATTENING_ALLOWANCE_MM,
  DEFAULT_END_TRIM_MM,
  DEFAULT_JOINTING_ALLOWANCE_MM,
  EDGE_PER_DINER_MM,
  tableFit,
  gluedTableFit,
  seatsAbout,
  topLengthForSeats,
  type SlabDimensions,
  type TableTop,
  type FitAllowances,
  type TableFit,
  type TableFitReason,
  type TableFitNote,
} from "./table-fit.ts";
export {
  CRATE_RULE,
  DEFAULT_DIMENSIONAL_DIVISOR_CM3_PER_KG,
  DEFAULT_SHIPPING_THRESHOLDS,
  shippingEstimate,
  type RateStep,
  type RateTable,
  type ShippingMode,
  type ShippingEstimate,
  type ShippingEstimateInput,
  type ShippingReason,
} from "./shipping.ts";
export {
  LOWEST_PLAUSIBLE_MOISTURE_PCT,
  KILN_DRIED_HIGHEST_PLAUSIBLE_PCT,
  WIDTH_STEP_RATIO_LIMIT,
  FIGURE_TOLERANCE_FRACTION,
  plausibilityWarnings,
  listedSlabWarnings,
  type ListedSlab,
  type PlausibilityCode,
  type PlausibilitySlab,
  type PlausibilityWarning,
} from "./plausibility.ts";
export { EARTH_MEAN_RADIUS_KM, greatCircleKm, type Position } from "./geodesy.ts";
export { RATING_SCALE, averageRating, ratingSummary, type RatingSummary, type RatingTotals } from "./ratings.ts";
export { median } from "./statistics.ts";
export {
  USUAL_SLAB_PRICE_USD_PER_BOARD_FOOT,
  FAR_BELOW_USUAL_FRACTION,
  priceFarBelowUsual,
  type PricedSlab,
  type LowPriceWarning,
} from "./price-guide.ts";
