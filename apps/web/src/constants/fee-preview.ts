import type { FeeSettings } from "@grainyard/slab-math";
import { formatBasisPoints, formatMoney } from "@grainyard/slab-math";

/**
 * FEE PREVIEW ONLY, while the fees in force have not arrived (say, no signal in the yard): the
 * listing form shows a sawyer roughly what they will take home with Grainyard's usual fees.
 * The API computes the real fees with its own settings; its figures are the ones that count and
 * are shown once the listing is saved. 10 % platform fee; 2.9 % + 0.30 card processing.
 */
export const FEE_PREVIEW_SETTINGS: Readonly<FeeSettings> = Object.freeze({
  platformFeeBps: 1000,
  processingFeeBps: 290,
  processingFixedMinor: 30,
});

export const FEE_PREVIEW_NOTE =
  "A preview with Grainyard's usual fees (today's could not be fetched). The exact figures appear once the listing is saved.";

/** The note under the preview when it uses the fees in force, in words. */
export function feesInForceNote(fees: FeeSettings, currency: string): string {
  return `A preview with today's fees: ${formatBasisPoints(fees.platformFeeBps)} to Grainyard and ${formatBasisPoints(fees.processingFeeBps)} + ${formatMoney(fees.processingFixedMinor, currency)} card processing. The exact figures appear once the listing is saved.`;
}
