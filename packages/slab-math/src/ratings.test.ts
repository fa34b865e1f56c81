import { describe, expect, it } from "vitest";
import { SlabMathError } from "./errors.ts";
import { averageRating, ratingSummary } from "./ratings.ts";

// The mean is the arithmetic mean, sum ÷ count (NIST/SEMATECH e-Handbook of Statistical Methods,
// 1.3.5.1 "Measures of Location"); rounding is Grainyard's half-up rule (money.ts). Worked by hand.

describe("averageRating", () => {
  it("is the sum over the count, to one decimal", () => {
    // 5 + 4 + 5 = 14; 14 / 3 = 4.666… → 4.7
    expect(averageRating(14, 3)).toBe(4.7);
    // 4 + 4 = 8; 8 / 2 = 4
    expect(averageRating(8, 2)).toBe(4);
    expect(averageRating(1, 1)).toBe(1);
  });
  it("rounds a half up", () => {
    // 5 + 4 × 7 = 33 over 8 = 4.125 → 41.25 tenths → 41 → 4.1
    expect(averageRating(33, 8)).toBe(4.1);
    // 9 over 4 = 2.25 → 22.5 tenths → 23 → 2.3 (half-up; banker's rounding would give 2.2)
    expect(averageRating(9, 4)).toBe(2.3);
  });
  it("is null without reviews, and refuses totals no set of 1–5 ratings can make", () => {
    expect(averageRating(0, 0)).toBeNull();
    expect(() => averageRating(16, 3)).toThrow(SlabMathError); // at most 5 each
    expect(() => averageRating(2, 3)).toThrow(SlabMathError); // at least 1 each
    expect(() => averageRating(4.5, 1)).toThrow(SlabMathError);
    expect(() => averageRating(4, -1)).toThrow(SlabMathError);
  });
});

describe("ratingSummary", () => {
  it("gives the mean and the shares of yes in whole per cent", () => {
    // 7 reviews, total 31 → 4.428… → 4.4; 6 of 7 matched = 85.71 % → 86; 7 of 7 hand-overs = 100
    expect(ratingSummary({ count: 7, ratingTotal: 31, matchedListingYes: 6, handoverYes: 7 })).toEqual({
      count: 7,
      average: 4.4,
      matchedListingPct: 86,
      handoverPct: 100,
    });
    // 1 of 8 = 12.5 % → 13 (half-up)
    expect(ratingSummary({ count: 8, ratingTotal: 40, matchedListingYes: 1, handoverYes: 0 }).matchedListingPct).toBe(13);
  });
  it("says nothing for a yard without reviews", () => {
    expect(ratingSummary({ count: 0, ratingTotal: 0, matchedListingYes: 0, handoverYes: 0 })).toEqual({
      count: 0,
      average: null,
      matchedListingPct: null,
      handoverPct: null,
    });
  });
  it("refuses more yes answers than reviews", () => {
    expect(() => ratingSummary({ count: 2, ratingTotal: 8, matchedListingYes: 3, handoverYes: 0 })).toThrow(SlabMathError);
  });
});
