import { SlabMathError } from "./errors.ts";
import { roundHalfUp } from "./money.ts";

/** The lowest and highest overall rating a buyer may give a completed order. */
export const RATING_SCALE = { lowest: 1, highest: 5 } as const;

/** What a yard's visible reviews add up to (sums kept by the API, so no list of reviews is needed). */
export interface RatingTotals {
  /** How many reviews. */
  count: number;
  /** The sum of their overall ratings (each 1–5). */
  ratingTotal: number;
  /** How many said the slab matched its listing. */
  matchedListingYes: number;
  /** How many said the hand-over went well. */
  handoverYes: number;
}

export interface RatingSummary {
  count: number;
  /** The arithmetic mean of the overall ratings to one decimal, half-up; null without reviews. */
  average: number | null;
  /** Share of reviews saying the slab matched its listing, whole per cent half-up; null without reviews. */
  matchedListingPct: number | null;
  /** Share of reviews saying the hand-over went well, whole per cent half-up; null without reviews. */
  handoverPct: number | null;
}

function wholeCount(value: number, field: string, max?: number): void {
  if (!Number.isFinite(value)) throw new SlabMathError("not_finite", field, `${field} must be a finite number`);
  if (!Number.isInteger(value)) throw new SlabMathError("not_integer", field, `${field} must be a whole number`);
  if (value < 0) throw new SlabMathError("negative", field, `${field} cannot be negative`);
  if (max !== undefined && value > max) throw new SlabMathError("out_of_range", field, `${field} cannot exceed ${max}`);
}

/** The mean rating to one decimal, half-up (e.g. 14 over 3 reviews → 4.7); null for no reviews. */
export function averageRating(ratingTotal: number, count: number): number | null {
  wholeCount(count, "count");
  wholeCount(ratingTotal, "ratingTotal", count * RATING_SCALE.highest);
  if (count === 0) return null;
  if (ratingTotal < count * RATING_SCALE.lowest)
    throw new SlabMathError("out_of_range", "ratingTotal", `ratingTotal must be at least ${RATING_SCALE.lowest} per review`);
  // Tenths as a whole number first, so the half-up rule works on exact integers.
  return roundHalfUp((ratingTotal * 10) / count) / 10;
}

/**
 * A yard's rating from its reviews: the arithmetic mean of the overall ratings (sum ÷ count) to
 * one decimal, and the shares of "yes" to the two questions in whole per cent, all half-up.
 */
export function ratingSummary(totals: RatingTotals): RatingSummary {
  const { count } = totals;
  wholeCount(totals.matchedListingYes, "matchedListingYes", count);
  wholeCount(totals.handoverYes, "handoverYes", count);
  const average = averageRating(totals.ratingTotal, count);
  if (count === 0) return { count: 0, average: null, matchedListingPct: null, handoverPct: null };
  return {
    count,
    average,
    matchedListingPct: roundHalfUp((totals.matchedListingYes * 100) / count),
    handoverPct: roundHalfUp((totals.handoverYes * 100) / count),
  };
}
