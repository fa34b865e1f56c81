import type { FeeSettings } from "@grainyard/slab-math";

/**
 * FEE PREVIEW ONLY. The fee settings the listing form uses to show a sawyer roughly what they
 * will take home while they type. The API computes the real fees with its own settings; its
 * figures are the ones that count and are shown once the listing is saved.
 * 10 % platform fee; 2.9 % + 0.30 card processing.
 */
export const FEE_PREVIEW_SETTINGS: Readonly<FeeSettings> = Object.freeze({
  platformFeeBps: 1000,
  processingFeeBps: 290,
  processingFixedMinor: 30,
});

export const FEE_PREVIEW_NOTE = "A preview with Grainyard's usual fees. The exact figures appear once the listing is saved.";
