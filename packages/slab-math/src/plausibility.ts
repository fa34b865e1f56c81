/**
 * Plausibility warnings for a reviewer: things in a listing's measurements and readings that
 * wood and sawmills do not usually produce. They never block anything; a person decides.
 */
import { slabGeometry } from "./geometry.ts";
import { findSpeciesBySlug } from "./species.ts";
import { slabWeight } from "./weight.ts";
import { FIBRE_SATURATION_POINT_PCT } from "./wood-physics.ts";

/**
 * Lowest believable moisture reading, % MC. Wood only reaches 4 % in air below about 17–20 %
 * relative humidity held for weeks (Wood Handbook Table 4-2: 4.5 % EMC at 20 % RH and 21 °C);
 * a lower reading on a slab is nearly always a meter set for the wrong species or a dead battery.
 * The threshold itself is common practice.
 */
export const LOWEST_PLAUSIBLE_MOISTURE_PCT = 4;

/**
 * Highest moisture content for a slab sold as kiln-dried, % MC. Kiln schedules for furniture
 * stock end at 6–10 % (KILN_DRIED_TARGET_BAND); wood above 15 % is what air drying outdoors gives
 * in most climates (Wood Handbook ch. 13: air-dried lumber 12–15 %). Threshold: common practice.
 */
export const KILN_DRIED_HIGHEST_PLAUSIBLE_PCT = 15;

/**
 * Largest believable step between neighbouring width stations, as a ratio (1.6 = one is 60 %
 * wider than the next). Live edges swell at crotches and root flare, but a jump beyond this is
 * usually a typing slip (an extra or missing digit). Common practice (our choice).
 */
export const WIDTH_STEP_RATIO_LIMIT = 1.6;

/**
 * How far a stored figure may sit from the recomputed one before it is flagged, as a fraction
 * (rounding and a changed reading explain a few per cent). Common practice (our choice).
 */
export const FIGURE_TOLERANCE_FRACTION = 0.05;

export type PlausibilityCode =
  | "moisture_too_low"
  | "kiln_dried_too_wet"
  | "above_fibre_saturation"
  | "no_moisture_reading"
  | "width_step"
  | "thicker_than_wide"
  | "wider_than_long"
  | "board_feet_mismatch"
  | "weight_outside_species_range"
  | "unknown_species";

export interface PlausibilityWarning {
  code: PlausibilityCode;
  /** Which slab of the listing (0-based), or null for the listing as a whole. */
  slabIndex: number | null;
  message: string;
}

export interface PlausibilitySlab {
  speciesSlug: string;
  lengthMm: number;
  thicknessMm: number;
  widthStationsMm: number[];
  dryingMethod: "air" | "kiln" | "air_then_kiln";
  /** Latest moisture reading, % MC, or null when none. */
  lastMoisturePct: number | null;
  /** Figures as stored or stated (optional): compared with what the dimensions and species allow. */
  statedBoardFeet?: number | null;
  statedWeightKg?: number | null;
}

const round1 = (value: number) => Math.round(value * 10) / 10;

/**
 * Warnings for one listing's slabs. Pure: the same input always gives the same list, in slab
 * order, each slab's checks in a fixed order.
 */
export function plausibilityWarnings(
  slabs: readonly PlausibilitySlab[],
  options: { moistureAssumedPct?: number } = {},
): PlausibilityWarning[] {
  const warnings: PlausibilityWarning[] = [];
  const assumed = options.moistureAssumedPct ?? 12;
  slabs.forEach((slab, slabIndex) => {
    const add = (code: PlausibilityCode, message: string) =>
      warnings.push({ code, slabIndex, message: message.charAt(0).toUpperCase() + message.slice(1) });
    const label = slabs.length > 1 ? `Slab ${slabIndex + 1}: ` : "";
    const kilnDried = slab.dryingMethod !== "air";
    const mc = slab.lastMoisturePct;

    if (mc === null) {
      if (kilnDried) add("no_moisture_reading", `${label}sold as kiln-dried but has no moisture reading.`);
    } else {
      if (mc < LOWEST_PLAUSIBLE_MOISTURE_PCT)
        add(
          "moisture_too_low",
          `${label}moisture reading of ${round1(mc)} % is below ${LOWEST_PLAUSIBLE_MOISTURE_PCT} %, drier than wood gets in ordinary air; check the meter.`,
        );
      if (kilnDried && mc > FIBRE_SATURATION_POINT_PCT) {
        add(
          "above_fibre_saturation",
          `${label}kiln-dried, yet the reading of ${round1(mc)} % is above fibre saturation (${FIBRE_SATURATION_POINT_PCT} %): that is green wood.`,
        );
      } else if (kilnDried && mc > KILN_DRIED_HIGHEST_PLAUSIBLE_PCT) {
        add(
          "kiln_dried_too_wet",
          `${label}kiln-dried, yet the reading is ${round1(mc)} %, above ${KILN_DRIED_HIGHEST_PLAUSIBLE_PCT} % (air-dry, not kiln-dry).`,
        );
      }
    }

    const stations = slab.widthStationsMm;
    for (let i = 1; i < stations.length; i++) {
      const a = stations[i - 1]!;
      const b = stations[i]!;
      if (a > 0 && b > 0 && Math.max(a, b) / Math.min(a, b) > WIDTH_STEP_RATIO_LIMIT) {
        add("width_step", `${label}width jumps from ${a} mm to ${b} mm between stations ${i} and ${i + 1}; check for a typing slip.`);
        break;
      }
    }
    const narrowest = Math.min(...stations);
    const widest = Math.max(...stations);
    if (stations.length > 0 && slab.thicknessMm > narrowest)
      add(
        "thicker_than_wide",
        `${label}${slab.thicknessMm} mm thick but only ${narrowest} mm wide at its narrowest: thickness and width may be swapped.`,
      );
    if (stations.length > 0 && widest > slab.lengthMm)
      add("wider_than_long", `${label}${widest} mm wide but ${slab.lengthMm} mm long: length and width may be swapped.`);

    let volumeM3: number | null = null;
    try {
      const geometry = slabGeometry({ lengthMm: slab.lengthMm, thicknessMm: slab.thicknessMm, widthStationsMm: stations });
      volumeM3 = geometry.volumeM3;
      const stated = slab.statedBoardFeet;
      if (
        stated != null &&
        geometry.boardFeet > 0 &&
        Math.abs(stated - geometry.boardFeet) / geometry.boardFeet > FIGURE_TOLERANCE_FRACTION
      ) {
        add("board_feet_mismatch", `${label}${round1(stated)} bf stated, but the dimensions give ${round1(geometry.boardFeet)} bf.`);
      }
    } catch {
      // Dimensions slab-math refuses are reported by the yard forms, not here.
    }

    if (!findSpeciesBySlug(slab.speciesSlug)) {
      add("unknown_species", `${label}species "${slab.speciesSlug}" is not in the species table.`);
    } else if (volumeM3 !== null && volumeM3 > 0 && slab.statedWeightKg != null) {
      const range = slabWeight({ volumeM3, speciesSlug: slab.speciesSlug, moistureContentPct: mc ?? assumed });
      const low = range.lowKg * (1 - FIGURE_TOLERANCE_FRACTION);
      const high = range.highKg * (1 + FIGURE_TOLERANCE_FRACTION);
      if (slab.statedWeightKg < low || slab.statedWeightKg > high) {
        add(
          "weight_outside_species_range",
          `${label}${round1(slab.statedWeightKg)} kg stated, but this species at these dimensions weighs ${round1(range.lowKg)}–${round1(range.highKg)} kg.`,
        );
      }
    }
  });
  return warnings;
}

/** A slab as the API shows it: its measurements and the figures worked out for it when it was saved. */
export interface ListedSlab {
  speciesSlug: string;
  lengthMm: number;
  thicknessMm: number;
  widthStationsMm: number[];
  dryingMethod: PlausibilitySlab["dryingMethod"];
  lastMoisturePct: number | null;
  figures: { boardFeet: number; weightKg: number };
}

/**
 * The same checks for saved slabs, their stored figures compared with what the measurements give:
 * the review desk shows these, and the sawyer sees them on the listing form before sending it.
 */
export function listedSlabWarnings(slabs: readonly ListedSlab[], options: { moistureAssumedPct?: number } = {}): PlausibilityWarning[] {
  return plausibilityWarnings(
    slabs.map((slab) => ({
      speciesSlug: slab.speciesSlug,
      lengthMm: slab.lengthMm,
      thicknessMm: slab.thicknessMm,
      widthStationsMm: slab.widthStationsMm,
      dryingMethod: slab.dryingMethod,
      lastMoisturePct: slab.lastMoisturePct,
      statedBoardFeet: slab.figures.boardFeet,
      statedWeightKg: slab.figures.weightKg,
    })),
    options,
  );
}
