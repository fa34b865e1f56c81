import { SlabMathError, shippingEstimate, type ShippingEstimate } from "@grainyard/slab-math";
import { SHIPPING_PREVIEW_RATES } from "../constants/shipping-preview.ts";

export interface ShippingSlab {
  id: string;
  label: string;
  lengthMm: number;
  maxWidthMm: number;
  thicknessMm: number;
  weightHighKg: number;
}

/** slab-math's shippingEstimate for one slab (crated on its own) from the preview rate table. */
export function estimateSlabShipping(slab: ShippingSlab): {
  slab: ShippingSlab;
  estimate: ShippingEstimate | null;
  problem: string | null;
} {
  try {
    const estimate = shippingEstimate({
      lengthMm: slab.lengthMm,
      widthMm: slab.maxWidthMm,
      thicknessMm: slab.thicknessMm,
      slabKg: slab.weightHighKg,
      rates: SHIPPING_PREVIEW_RATES,
    });
    return { slab, estimate, problem: null };
  } catch (error) {
    if (error instanceof SlabMathError) return { slab, estimate: null, problem: "We can't estimate shipping for this slab's size." };
    throw error;
  }
}

/** The whole set's freight estimate: the sum of each slab's, or null when any slab has no price (pickup only, ask for a quote). */
export function freightEstimateMinor(slabs: ShippingSlab[]): number | null {
  let total = 0;
  for (const slab of slabs) {
    const { estimate } = estimateSlabShipping(slab);
    if (!estimate || estimate.mode === "local_pickup" || estimate.costMinor === null) return null;
    total += estimate.costMinor;
  }
  return total;
}
