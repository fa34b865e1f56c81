import type { DryingProjectionView, DryingState, SlabFigures } from "@grainyard/contracts";
import {
  KILN_DRIED_TARGET_BAND,
  NIOSH_LOAD_CONSTANT_KG,
  SlabMathError,
  dryingProjection,
  feeBreakdown,
  handlingAdvice,
  slabGeometry,
  slabPrice,
  setWeight,
  slabWeight,
  type FeeSettings,
  type PriceMode,
} from "@grainyard/slab-math";
import { Invalid } from "../errors.ts";

/**
 * Every figure the API stores or shows comes from slab-math through here; the API never keeps a
 * figure sent by a client.
 */

/** Moisture content assumed for the weight when a slab has no reading yet (indoor-dry wood; common practice). */
export const DEFAULT_WEIGHT_MOISTURE_PCT = 12;

/** slab-math refuses absurd input with a typed error; it becomes a 422 naming the field. */
export function withFigureErrors<T>(compute: () => T): T {
  try {
    return compute();
  } catch (error) {
    if (error instanceof SlabMathError) {
      const field = error.field.split(".").at(-1) ?? error.field;
      throw new Invalid(error.message, { [field]: error.message }, "invalid_measurement");
    }
    throw error;
  }
}

export interface SlabFigureInput {
  lengthMm: number;
  thicknessMm: number;
  widthStationsMm: number[];
  speciesSlug: string;
  lastMoisturePct: number | null;
}

export interface StoredSlabFigures {
  areaM2: number;
  volumeM3: number;
  boardFeet: number;
  averageWidthMm: number;
  minWidthMm: number;
  maxWidthMm: number;
  weightKg: number;
  weightLowKg: number;
  weightHighKg: number;
  weightAtMoisturePct: number;
}

export function computeSlabFigures(input: SlabFigureInput): StoredSlabFigures {
  return withFigureErrors(() => {
    // Number(): a slab entity loaded through a relation may carry its DECIMAL measurements as text.
    const geometry = slabGeometry({
      lengthMm: Number(input.lengthMm),
      thicknessMm: Number(input.thicknessMm),
      widthStationsMm: input.widthStationsMm,
    });
    const moisture = input.lastMoisturePct ?? DEFAULT_WEIGHT_MOISTURE_PCT;
    const weight = slabWeight({ volumeM3: geometry.volumeM3, speciesSlug: input.speciesSlug, moistureContentPct: moisture });
    return {
      areaM2: geometry.areaM2,
      volumeM3: geometry.volumeM3,
      boardFeet: geometry.boardFeet,
      averageWidthMm: geometry.averageWidthMm,
      minWidthMm: geometry.minWidthMm,
      maxWidthMm: geometry.maxWidthMm,
      weightKg: weight.kg,
      weightLowKg: weight.lowKg,
      weightHighKg: weight.highKg,
      weightAtMoisturePct: moisture,
    };
  });
}

/** The stored figures plus the lifting advice, judged on the high end of the weight range. */
export function slabFiguresView(stored: StoredSlabFigures): SlabFigures {
  return {
    ...stored,
    heavyLift: stored.weightHighKg > NIOSH_LOAD_CONSTANT_KG,
    handling: handlingAdvice(stored.weightHighKg),
  };
}

export function dryingStateOf(lastMoisturePct: number | null): DryingState {
  if (lastMoisturePct === null) return "no_readings";
  if (lastMoisturePct < KILN_DRIED_TARGET_BAND.minimumPct) return "over_dried";
  if (lastMoisturePct <= KILN_DRIED_TARGET_BAND.maximumPct) return "ready";
  return "drying";
}

export function projectionView(readings: { readOn: string; moistureContentPct: number }[]): DryingProjectionView {
  const projection = dryingProjection(readings.map((r) => ({ date: r.readOn, moistureContentPct: r.moistureContentPct })));
  return {
    status: projection.status,
    projectedDate: projection.status === "projected" ? projection.projectedDate : null,
    daysFromLastReading: projection.status === "projected" ? projection.daysFromLastReading : null,
    targetBand: { minimumPct: KILN_DRIED_TARGET_BAND.minimumPct, maximumPct: KILN_DRIED_TARGET_BAND.maximumPct },
  };
}

export interface ListingFigureInput {
  priceMode: PriceMode;
  rateMinor: number;
  slabs: StoredSlabFigures[];
  fees: FeeSettings;
}

export function computeListingFigures(input: ListingFigureInput) {
  return withFigureErrors(() => {
    const boardFeet = input.slabs.reduce((sum, s) => sum + s.boardFeet, 0);
    const volumeM3 = input.slabs.reduce((sum, s) => sum + s.volumeM3, 0);
    const price = slabPrice({ mode: input.priceMode, rateMinor: input.rateMinor, boardFeet, volumeM3 });
    const fees = feeBreakdown(price.priceMinor, input.fees);
    // The listing's weight is its whole set's (each end of the range summed); the heaviest slab is the catalogue's to name.
    const weight = setWeight(input.slabs.map((s) => ({ kg: s.weightKg, lowKg: s.weightLowKg, highKg: s.weightHighKg })));
    return {
      boardFeet,
      volumeM3,
      weightKg: weight.totalKg,
      weightLowKg: weight.totalLowKg,
      weightHighKg: weight.totalHighKg,
      priceMinor: price.priceMinor,
      platformFeeMinor: fees.platformFeeMinor,
      processingFeeMinor: fees.processingFeeMinor,
      sawyerNetMinor: fees.sawyerNetMinor,
    };
  });
}

/** A catalogue card's weights: the whole set's (central and high end) and its heaviest slab's high end, from one slab-math call. */
export function cardWeights(slabs: readonly { weightKg: number; weightLowKg: number; weightHighKg: number }[]) {
  const weight = setWeight(slabs.map((s) => ({ kg: s.weightKg, lowKg: s.weightLowKg, highKg: s.weightHighKg })));
  return { weightKg: weight.totalKg, totalWeightHighKg: weight.totalHighKg, heaviestSlabHighKg: weight.heaviestSlabHighKg };
}
