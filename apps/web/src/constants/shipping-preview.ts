import type { RateTable } from "@grainyard/slab-math";

/**
 * SHIPPING PREVIEW ONLY. The rate table the slab page hands to slab-math's shippingEstimate to
 * show a buyer roughly what getting a slab home costs, before any carrier is asked. These are
 * Grainyard's own round guidance figures (US dollars, minor units), not a carrier's tariff: the
 * real price is quoted when freight is arranged. Weights are chargeable kilograms (the larger of
 * crate-and-slab weight and dimensional weight), as shippingEstimate works them out.
 */
export const SHIPPING_PREVIEW_CURRENCY = "USD" as const;

export const SHIPPING_PREVIEW_RATES: Readonly<RateTable> = Object.freeze({
  parcel: Object.freeze([
    { upToKg: 5, priceMinor: 2_500 },
    { upToKg: 10, priceMinor: 3_800 },
    { upToKg: 20, priceMinor: 5_900 },
    { upToKg: 30, priceMinor: 8_200 },
  ]),
  freight: Object.freeze([
    { upToKg: 100, priceMinor: 19_000 },
    { upToKg: 250, priceMinor: 27_500 },
    { upToKg: 500, priceMinor: 39_000 },
    { upToKg: 1_000, priceMinor: 58_000 },
  ]),
});

export const SHIPPING_PREVIEW_NOTE =
  "An estimate for guidance, from Grainyard's round preview rates. The carrier's quote is the price that counts.";
