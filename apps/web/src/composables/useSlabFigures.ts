import { computed, type Ref } from "vue";
import { SlabMathError, slabGeometry, slabWeight, type SlabGeometry, type SlabWeight } from "@grainyard/slab-math";

/** Moisture content assumed for the weight when a slab has no reading yet (kiln-dried, indoor). */
const ASSUMED_MOISTURE_PCT = 12;

export interface SlabFigureInput {
  speciesSlug: string;
  lengthMm: number | null;
  thicknessMm: number | null;
  widthStationsMm: readonly (number | null)[];
  /** Last moisture reading, or null for none (12 % is assumed). */
  moisturePct: number | null;
}

export interface LiveSlabFigures {
  geometry: SlabGeometry | null;
  weight: SlabWeight | null;
  moisturePct: number;
  moistureAssumed: boolean;
  /** What is missing, in plain words (nothing wrong, just not typed yet). */
  waitingFor: string | null;
  /** slab-math refused the numbers: which field, and why. */
  problem: { field: string; message: string } | null;
}

/** A plain sentence for a SlabMathError, keyed on the form field it belongs to. */
function slabMathMessage(error: SlabMathError): { field: string; message: string } {
  const station = /^widthStationsMm\[(\d+)\]$/.exec(error.field);
  if (station) {
    const index = Number(station[1]);
    return {
      field: `widthStationsMm.${index}`,
      message: `Width ${index + 1} is wider than any slab we take (3 m, about 118″). Check the number and the units.`,
    };
  }
  switch (error.field) {
    case "lengthMm":
      return { field: "lengthMm", message: "That is longer than any slab we take (12 m, about 39 ft). Check the number and the units." };
    case "thicknessMm":
      return {
        field: "thicknessMm",
        message: "That is thicker than any slab we take (600 mm, about 23 5/8″). Check the number and the units.",
      };
    case "widthStationsMm":
      return { field: "widthStationsMm", message: "Give at least one width above zero, at two or more points." };
    case "volumeM3":
      return { field: "widthStationsMm", message: "These measurements give no volume to weigh. Check the widths and thickness." };
    case "speciesSlug":
      return { field: "speciesSlug", message: "Choose the species from the list." };
    default:
      return { field: error.field, message: error.message };
  }
}

/** Area, volume, widths and weight from what the sawyer has typed so far, with slab-math. */
function liveSlabFigures(input: SlabFigureInput): LiveSlabFigures {
  const moistureAssumed = input.moisturePct == null;
  const moisturePct = input.moisturePct ?? ASSUMED_MOISTURE_PCT;
  const base = { geometry: null, weight: null, moisturePct, moistureAssumed, waitingFor: null, problem: null };
  const widths = input.widthStationsMm.filter((width): width is number => width != null);
  if (input.lengthMm == null) return { ...base, waitingFor: "Type the length to see the figures." };
  if (input.thicknessMm == null) return { ...base, waitingFor: "Type the thickness to see the figures." };
  if (widths.length < 2 || widths.length !== input.widthStationsMm.length)
    return { ...base, waitingFor: "Type every width (or remove the empty ones) to see the figures." };
  let geometry: SlabGeometry;
  try {
    geometry = slabGeometry({ lengthMm: input.lengthMm, thicknessMm: input.thicknessMm, widthStationsMm: widths });
  } catch (error) {
    if (error instanceof SlabMathError) return { ...base, problem: slabMathMessage(error) };
    throw error;
  }
  if (!input.speciesSlug) return { ...base, geometry, waitingFor: "Choose the species to see the weight." };
  try {
    const weight = slabWeight({ volumeM3: geometry.volumeM3, speciesSlug: input.speciesSlug, moistureContentPct: moisturePct });
    return { ...base, geometry, weight };
  } catch (error) {
    if (error instanceof SlabMathError) return { ...base, geometry, problem: slabMathMessage(error) };
    throw error;
  }
}

export function useSlabFigures(input: Ref<SlabFigureInput>) {
  return computed(() => liveSlabFigures(input.value));
}
