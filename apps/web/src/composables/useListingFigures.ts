import { SlabMathError, feeBreakdown, slabPrice, type FeeBreakdown, type FeeSettings, type PriceMode } from "@grainyard/slab-math";
import type { Slab } from "@grainyard/contracts";
import { USUAL_FEES } from "@grainyard/slab-math";

export interface ListingPreview {
  slabCount: number;
  /** Totals over the chosen slabs (each slab's figures come from slab-math on the API). */
  boardFeet: number;
  volumeM3: number;
  weightLowKg: number;
  weightHighKg: number;
  /** Any one slab of the set is over a safe one-person lift. */
  heavyLift: boolean;
  priceMinor: number | null;
  fees: FeeBreakdown | null;
  /** Why there is no price yet, in plain words. */
  problem: string | null;
}

/**
 * The live figures of a listing while the sawyer types: the set's total board feet and volume,
 * the price from the rate (slab-math slabPrice over the set's total) and the fee preview
 * (slab-math feeBreakdown with the preview settings). The API's figures count once saved.
 */
export function listingPreview(
  slabs: readonly Slab[],
  priceMode: PriceMode | "",
  rateMinor: number | null,
  fees: FeeSettings = USUAL_FEES,
): ListingPreview {
  const totals = slabs.reduce(
    (sum, slab) => ({
      boardFeet: sum.boardFeet + slab.figures.boardFeet,
      volumeM3: sum.volumeM3 + slab.figures.volumeM3,
      weightLowKg: sum.weightLowKg + slab.figures.weightLowKg,
      weightHighKg: sum.weightHighKg + slab.figures.weightHighKg,
      heavyLift: sum.heavyLift || slab.figures.heavyLift,
    }),
    { boardFeet: 0, volumeM3: 0, weightLowKg: 0, weightHighKg: 0, heavyLift: false },
  );
  const base = { slabCount: slabs.length, ...totals, priceMinor: null, fees: null };
  if (slabs.length === 0) return { ...base, problem: "Choose a slab to see the figures." };
  if (!priceMode) return { ...base, problem: "Choose how the price is set." };
  if (rateMinor === null) return { ...base, problem: "Type the rate to see the price." };
  try {
    const { priceMinor } = slabPrice({ mode: priceMode, rateMinor, boardFeet: totals.boardFeet, volumeM3: totals.volumeM3 });
    try {
      return { ...base, priceMinor, fees: feeBreakdown(priceMinor, fees), problem: null };
    } catch (error) {
      if (error instanceof SlabMathError && error.code === "fees_exceed_subtotal") {
        return { ...base, priceMinor, problem: "At this price the fees would be more than the sale. Raise the rate." };
      }
      throw error;
    }
  } catch (error) {
    if (error instanceof SlabMathError) return { ...base, problem: "That rate cannot be priced. Check the number." };
    throw error;
  }
}
