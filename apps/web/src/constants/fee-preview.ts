import type { FeeSettings } from "@grainyard/slab-math";
import { formatBasisPoints, formatMoney } from "@grainyard/slab-math";

export const FEE_PREVIEW_NOTE =
  "A preview with Grainyard's usual fees (today's could not be fetched). The exact figures appear once the listing is saved.";

/** The note under the preview when it uses the fees in force, in words. */
export function feesInForceNote(fees: FeeSettings, currency: string): string {
  return `A preview with today's fees: ${formatBasisPoints(fees.platformFeeBps)} to Grainyard and ${formatBasisPoints(fees.processingFeeBps)} + ${formatMoney(fees.processingFixedMinor, currency)} card processing. The exact figures appear once the listing is saved.`;
}
