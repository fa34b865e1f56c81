/**
 * Slab geometry from width stations, and board feet.
 */
import { SlabMathError, requireNumberInRange, requirePositive } from "./errors.ts";
import { LIMITS } from "./limits.ts";
import { CUBIC_INCHES_PER_BOARD_FOOT, MILLIMETRES_PER_INCH } from "./units.ts";

/** Input of {@link slabGeometry}. */
export interface SlabGeometryInput {
  /** Overall length, mm (0 < length ≤ 12 000). */
  lengthMm: number;
  /** Thickness, mm (0 < thickness ≤ 600). */
  thicknessMm: number;
  /**
   * Width measured at evenly spaced stations from one end to the other, mm
   * (at least 2: the first at one end, the last at the other; each 0–3000).
   */
  widthStationsMm: readonly number[];
}

/** Result of {@link slabGeometry}. */
export interface SlabGeometry {
  /** Face area (one side), m², trapezoidal rule over the stations. */
  areaM2: number;
  /** Volume, m³ (area × thickness). */
  volumeM3: number;
  /** Volume in board feet (144 in³ each). */
  boardFeet: number;
  /** Area ÷ length, mm. */
  averageWidthMm: number;
  /** Narrowest station, mm. */
  minWidthMm: number;
  /** Widest station, mm. */
  maxWidthMm: number;
}

const CUBIC_MILLIMETRES_PER_BOARD_FOOT = CUBIC_INCHES_PER_BOARD_FOOT * MILLIMETRES_PER_INCH ** 3;

/**
 * Area, volume and board feet of a live-edge slab from widths taken at evenly spaced
 * stations. Area uses the trapezoidal rule (composite, equal spacing
 * h = length / (n − 1)): A = h · (w₀/2 + w₁ + … + wₙ₋₂ + wₙ₋₁/2), exact for straight
 * tapers between stations. Kept allocation-light (one result object, no arrays):
 * the web app calls it on every keystroke.
 *
 * @throws SlabMathError on negative, NaN/Infinity or implausible sizes, fewer than 2 stations.
 */
export function slabGeometry(input: SlabGeometryInput): SlabGeometry {
  const lengthMm = requirePositive(input.lengthMm, "lengthMm", LIMITS.maximumLengthMm, "mm");
  const thicknessMm = requirePositive(input.thicknessMm, "thicknessMm", LIMITS.maximumThicknessMm, "mm");
  const stations = input.widthStationsMm;
  if (!Array.isArray(stations)) {
    throw new SlabMathError("missing_input", "widthStationsMm", "widthStationsMm must be a list of widths in mm");
  }
  const count = stations.length;
  if (count < 2) {
    throw new SlabMathError(
      "too_few_stations",
      "widthStationsMm",
      `widthStationsMm needs at least 2 widths (one at each end), got ${count}`,
    );
  }
  if (count > LIMITS.maximumStations) {
    throw new SlabMathError(
      "out_of_range",
      "widthStationsMm",
      `widthStationsMm accepts at most ${LIMITS.maximumStations} widths, got ${count}`,
    );
  }
  let interiorSum = 0;
  let minimum = Infinity;
  let maximum = -Infinity;
  for (let index = 0; index < count; index++) {
    const width = stations[index];
    // Fast path for the common case; the slow path builds the precise error.
    if (typeof width !== "number" || !(width >= 0 && width <= LIMITS.maximumWidthMm)) {
      requireNumberInRange(width, `widthStationsMm[${index}]`, 0, LIMITS.maximumWidthMm, "mm");
    }
    const value = width as number;
    if (value < minimum) minimum = value;
    if (value > maximum) maximum = value;
    if (index !== 0 && index !== count - 1) interiorSum += value;
  }
  if (maximum === 0) {
    throw new SlabMathError("out_of_range", "widthStationsMm", "widthStationsMm must have at least one width greater than 0");
  }
  const spacing = lengthMm / (count - 1);
  const areaMm2 = spacing * ((stations[0] as number) / 2 + interiorSum + (stations[count - 1] as number) / 2);
  const volumeMm3 = areaMm2 * thicknessMm;
  return {
    areaM2: areaMm2 / 1e6,
    volumeM3: volumeMm3 / 1e9,
    boardFeet: volumeMm3 / CUBIC_MILLIMETRES_PER_BOARD_FOOT,
    averageWidthMm: areaMm2 / lengthMm,
    minWidthMm: minimum,
    maxWidthMm: maximum,
  };
}

/**
 * Board feet of a board (NHLA rule: 1 board foot = 144 in³, i.e. 1 in × 12 in × 1 ft):
 * bf = thickness (in) × width (in) × length (ft) / 12.
 *
 * @param thicknessIn thickness, inches (a "12/4" board is 3 in)
 * @param widthIn width, inches
 * @param lengthFt length, feet
 */
export function boardFeet(thicknessIn: number, widthIn: number, lengthFt: number): number {
  requireNumberInRange(thicknessIn, "thicknessIn", 0, LIMITS.maximumThicknessMm / MILLIMETRES_PER_INCH, "in");
  requireNumberInRange(widthIn, "widthIn", 0, LIMITS.maximumWidthMm / MILLIMETRES_PER_INCH, "in");
  requireNumberInRange(lengthFt, "lengthFt", 0, LIMITS.maximumLengthMm / 304.8, "ft");
  return (thicknessIn * widthIn * lengthFt * 12) / CUBIC_INCHES_PER_BOARD_FOOT;
}

/**
 * Width at a position along the slab, mm, by straight-line interpolation between the
 * evenly spaced stations (the same model the trapezoidal rule integrates).
 */
export function widthAtPosition(lengthMm: number, widthStationsMm: readonly number[], positionMm: number): number {
  const count = widthStationsMm.length;
  const clamped = Math.min(Math.max(positionMm, 0), lengthMm);
  const spacing = lengthMm / (count - 1);
  const index = Math.min(Math.floor(clamped / spacing), count - 2);
  const fraction = (clamped - index * spacing) / spacing;
  const left = widthStationsMm[index] as number;
  const right = widthStationsMm[index + 1] as number;
  return left + (right - left) * fraction;
}

/** Narrowest width between two positions along the slab, mm (interpolated ends plus the stations between). */
export function minimumWidthBetween(lengthMm: number, widthStationsMm: readonly number[], startMm: number, endMm: number): number {
  const count = widthStationsMm.length;
  const spacing = lengthMm / (count - 1);
  let minimum = Math.min(widthAtPosition(lengthMm, widthStationsMm, startMm), widthAtPosition(lengthMm, widthStationsMm, endMm));
  for (let index = 0; index < count; index++) {
    const position = index * spacing;
    if (position > startMm && position < endMm) {
      minimum = Math.min(minimum, widthStationsMm[index] as number);
    }
  }
  return minimum;
}
