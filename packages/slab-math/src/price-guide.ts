/**
 * A gentle check on a listing's price: one far below what slabs of its species usually ask is
 * more often a slip (a per-slab figure typed as per board foot, a dropped digit) than a bargain.
 * It never blocks anything; the sawyer decides.
 */
import { formatMoney, roundHalfUp } from "./money.ts";
import { findSpeciesBySlug } from "./species.ts";

/**
 * Usual asking prices of kiln-dried live-edge slabs, US dollars per board foot, low and high.
 * COMMON PRACTICE: a rule of thumb from typical asking prices of small urban-lumber yards in the
 * United States; not a published survey. Figure, width and defects move a slab well outside it
 * either way, so it only backs a warning for a price far below the low end.
 */
export const USUAL_SLAB_PRICE_USD_PER_BOARD_FOOT: Readonly<Record<string, readonly [low: number, high: number]>> = Object.freeze({
  "american-basswood": [4, 8],
  "american-beech": [6, 12],
  "american-elm": [8, 16],
  "american-sycamore": [7, 14],
  "black-cherry": [10, 20],
  "black-locust": [10, 18],
  "black-walnut": [15, 35],
  "eastern-cottonwood": [4, 8],
  "eastern-red-cedar": [6, 12],
  "english-elm": [10, 18],
  "european-ash": [7, 14],
  "european-beech": [6, 12],
  "european-lime": [5, 10],
  "european-oak": [12, 25],
  hackberry: [5, 10],
  "honey-locust": [10, 20],
  "kentucky-coffeetree": [10, 18],
  "london-plane": [8, 15],
  "red-mulberry": [10, 20],
  "northern-catalpa": [8, 15],
  "northern-red-oak": [8, 15],
  "norway-maple": [6, 12],
  "osage-orange": [15, 30],
  "red-maple": [6, 12],
  "shagbark-hickory": [8, 14],
  "silver-maple": [6, 14],
  "sugar-maple": [8, 16],
  sweetgum: [6, 12],
  "white-ash": [6, 12],
  "white-oak": [10, 20],
  "yellow-birch": [7, 14],
  "yellow-poplar": [4, 8],
});

/**
 * A price below this fraction of the usual low end is "far below" (half: a slab priced at half
 * the cheapest usual price is rare enough to be worth a second look). Common practice (our choice).
 */
export const FAR_BELOW_USUAL_FRACTION = 0.5;

export interface PricedSlab {
  speciesSlug: string;
  /** Board feet of the slab (slab-math's figure). */
  boardFeet: number;
}

export interface LowPriceWarning {
  /** The listing's price per board foot, minor units. */
  pricePerBoardFootMinor: number;
  /** The usual range for these slabs, minor units per board foot (weighted by board feet in a set). */
  usualLowMinor: number;
  usualHighMinor: number;
  message: string;
}

/**
 * A warning when a listing's whole price (minor units) works out far below the usual price per
 * board foot of its slabs' species; null when it does not, when a species has no usual range,
 * when there is no price or volume yet, or for a currency the table does not cover (only USD).
 */
export function priceFarBelowUsual(slabs: readonly PricedSlab[], priceMinor: number | null, currency: string): LowPriceWarning | null {
  if (currency !== "USD" || priceMinor === null || priceMinor <= 0 || slabs.length === 0) return null;
  let boardFeet = 0;
  let lowDollars = 0;
  let highDollars = 0;
  for (const slab of slabs) {
    const range = USUAL_SLAB_PRICE_USD_PER_BOARD_FOOT[slab.speciesSlug];
    if (!range || !(slab.boardFeet > 0)) return null;
    boardFeet += slab.boardFeet;
    lowDollars += range[0] * slab.boardFeet;
    highDollars += range[1] * slab.boardFeet;
  }
  const usualLowMinor = roundHalfUp((lowDollars / boardFeet) * 100);
  const usualHighMinor = roundHalfUp((highDollars / boardFeet) * 100);
  const pricePerBoardFootMinor = roundHalfUp(priceMinor / boardFeet);
  if (pricePerBoardFootMinor >= usualLowMinor * FAR_BELOW_USUAL_FRACTION) return null;
  const slugs = [...new Set(slabs.map((slab) => slab.speciesSlug))];
  const what =
    slugs.length === 1 ? `${(findSpeciesBySlug(slugs[0]!)?.commonName ?? "these").toLowerCase()} slabs` : "slabs of these species";
  const money = (minor: number) => formatMoney(minor, currency);
  return {
    pricePerBoardFootMinor,
    usualLowMinor,
    usualHighMinor,
    message:
      `That works out at ${money(pricePerBoardFootMinor)} per board foot, far below the ${money(usualLowMinor)}–${money(usualHighMinor)} ` +
      `that kiln-dried ${what} usually ask (a rule of thumb). If that is the price you mean, carry on; otherwise check the amount and how the price is set.`,
  };
}
