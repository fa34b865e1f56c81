import type { FeeSettings } from "@grainyard/slab-math";

/**
 * Marketplace settings used by listings today. They become admin-editable settings stored in the
 * database with the operator desk; until then these are the defaults.
 * Platform fee 10 %; card processing 2.9 % + 0.30 (a typical card-processing price, common practice).
 */
export const DEFAULT_FEE_SETTINGS: FeeSettings = { platformFeeBps: 1000, processingFeeBps: 290, processingFixedMinor: 30 };
