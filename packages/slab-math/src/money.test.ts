import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { SlabMathError } from "./errors.ts";
import { feeBreakdown, formatMoney, minorToInput, parseMoneyInput, refundShares, roundHalfUp, slabPrice, taxOn } from "./money.ts";

// Money rules are Grainyard's own specification (integer minor units, basis points, half-up once);
// the expected values below are worked by hand.

describe("roundHalfUp", () => {
  it("halves go up, everything else to the nearest", () => {
    expect(roundHalfUp(2.5)).toBe(3); // banker's rounding would give 2
    expect(roundHalfUp(3.5)).toBe(4);
    expect(roundHalfUp(2.4999)).toBe(2);
    expect(roundHalfUp(0)).toBe(0);
    // 1.005 × 100 is 100.49999999999999 in binary floating point; it stands for 100.5
    expect(roundHalfUp(1.005 * 100)).toBe(101);
  });
});

describe("feeBreakdown", () => {
  it("worked example: $100.00, 10 % platform, 2.9 % + 30¢ processing", () => {
    // platform 10000 × 1000 / 10000 = 1000; processing 10000 × 290 / 10000 = 290, + 30 = 320
    expect(feeBreakdown(10_000, { platformFeeBps: 1000, processingFeeBps: 290, processingFixedMinor: 30 })).toEqual({
      platformFeeMinor: 1000,
      processingFeeMinor: 320,
      sawyerNetMinor: 8680,
    });
  });
  it("half-up applied once per fee", () => {
    // 12345 × 250 / 10000 = 308.625 → 309; 12345 × 290 / 10000 = 358.005 → 358, + 30 = 388
    expect(feeBreakdown(12_345, { platformFeeBps: 250, processingFeeBps: 290, processingFixedMinor: 30 })).toEqual({
      platformFeeMinor: 309,
      processingFeeMinor: 388,
      sawyerNetMinor: 11_648,
    });
    // an exact half: 50 × 1000 / 10000 = 5; 25 × 1000 / 10000 = 2.5 → 3
    expect(feeBreakdown(25, { platformFeeBps: 1000, processingFeeBps: 0, processingFixedMinor: 0 }).platformFeeMinor).toBe(3);
  });
  it("exact for amounts beyond 2^53 / 10000 (integer arithmetic)", () => {
    const subtotal = 9_007_199_254_740_991; // Number.MAX_SAFE_INTEGER
    const result = feeBreakdown(subtotal, { platformFeeBps: 1, processingFeeBps: 0, processingFixedMinor: 0 });
    // 9007199254740991 / 10000 = 900719925474.0991 → 900719925474
    expect(result.platformFeeMinor).toBe(900_719_925_474);
    expect(result.platformFeeMinor + result.processingFeeMinor + result.sawyerNetMinor).toBe(subtotal);
  });
  it("rejects non-integer or negative money and out-of-range basis points", () => {
    const settings = { platformFeeBps: 1000, processingFeeBps: 290, processingFixedMinor: 30 };
    expect(() => feeBreakdown(100.5, settings)).toThrow(/subtotalMinor/);
    expect(() => feeBreakdown(-1, settings)).toThrow(SlabMathError);
    expect(() => feeBreakdown(1000, { ...settings, platformFeeBps: 12.5 })).toThrow(/platformFeeBps/);
    expect(() => feeBreakdown(1000, { ...settings, processingFeeBps: 10_001 })).toThrow(/processingFeeBps/);
    expect(() => feeBreakdown(1000, { ...settings, processingFixedMinor: -30 })).toThrow(/processingFixedMinor/);
    expect(() => feeBreakdown(20, settings)).toThrow(/fees/);
  });

  it("property: the three parts are integers and always sum to the subtotal exactly", () => {
    fc.assert(
      fc.property(
        fc.integer({ min: 0, max: Number.MAX_SAFE_INTEGER }),
        fc.integer({ min: 0, max: 5000 }),
        fc.integer({ min: 0, max: 5000 }),
        fc.integer({ min: 0, max: 1000 }),
        (subtotal, platformFeeBps, processingFeeBps, processingFixedMinor) => {
          let result;
          try {
            result = feeBreakdown(subtotal, { platformFeeBps, processingFeeBps, processingFixedMinor });
          } catch (error) {
            // only allowed failure: fees larger than a tiny subtotal
            expect((error as SlabMathError).code).toBe("fees_exceed_subtotal");
            return;
          }
          expect(Number.isInteger(result.platformFeeMinor)).toBe(true);
          expect(Number.isInteger(result.processingFeeMinor)).toBe(true);
          expect(Number.isInteger(result.sawyerNetMinor)).toBe(true);
          expect(result.sawyerNetMinor).toBeGreaterThanOrEqual(0);
          expect(result.platformFeeMinor + result.processingFeeMinor + result.sawyerNetMinor).toBe(subtotal);
          // each fee is within half a minor unit of its exact value
          expect(Math.abs(result.platformFeeMinor - (subtotal * platformFeeBps) / 10_000)).toBeLessThanOrEqual(0.5 + subtotal * 1e-15);
        },
      ),
      { numRuns: 2000 },
    );
  });

  // Each fee is rounded on its own, so one more cent of subtotal can round both fees up by a cent:
  // the net may then drop by one cent (fast-check found 10 017 → 10 018 at 8.34 %), never more, and
  // the platform fee never drops.
  it("property: a larger subtotal never yields a smaller platform fee, nor a net smaller by more than a cent", () => {
    fc.assert(
      fc.property(
        fc.integer({ min: 10_000, max: 10_000_000 }),
        fc.integer({ min: 1, max: 100_000 }),
        fc.integer({ min: 0, max: 3000 }),
        (subtotal, extra, bps) => {
          const settings = { platformFeeBps: bps, processingFeeBps: 290, processingFixedMinor: 30 };
          const smaller = feeBreakdown(subtotal, settings);
          const larger = feeBreakdown(subtotal + extra, settings);
          expect(larger.platformFeeMinor).toBeGreaterThanOrEqual(smaller.platformFeeMinor);
          expect(larger.sawyerNetMinor).toBeGreaterThanOrEqual(smaller.sawyerNetMinor - 1);
        },
      ),
    );
  });
});

describe("slabPrice", () => {
  it("per board foot: 45.77 bf at $14.00 → 45.77 × 1400 = 64078 minor units", () => {
    expect(slabPrice({ mode: "per_board_foot", rateMinor: 1400, boardFeet: 45.77 })).toEqual({
      priceMinor: 64_078,
      mode: "per_board_foot",
      quantity: 45.77,
    });
  });
  it("per cubic metre: 0.108 m³ at €2,500.00 → 0.108 × 250000 = 27000", () => {
    expect(slabPrice({ mode: "per_cubic_metre", rateMinor: 250_000, volumeM3: 0.108 }).priceMinor).toBe(27_000);
  });
  it("half-up once: 2.5 bf × 5 = 12.5 → 13; 0.5 bf × 5 = 2.5 → 3", () => {
    expect(slabPrice({ mode: "per_board_foot", rateMinor: 5, boardFeet: 2.5 }).priceMinor).toBe(13);
    expect(slabPrice({ mode: "per_board_foot", rateMinor: 5, boardFeet: 0.5 }).priceMinor).toBe(3);
  });
  it("fixed price is taken as is", () => {
    expect(slabPrice({ mode: "fixed", rateMinor: 89_900 })).toEqual({ priceMinor: 89_900, mode: "fixed", quantity: 1 });
  });
  it("rejects non-integer or negative rates and missing quantities", () => {
    expect(() => slabPrice({ mode: "fixed", rateMinor: 10.5 })).toThrow(/rateMinor/);
    expect(() => slabPrice({ mode: "fixed", rateMinor: -1 })).toThrow(SlabMathError);
    expect(() => slabPrice({ mode: "per_board_foot", rateMinor: 1400 })).toThrow(/boardFeet/);
    expect(() => slabPrice({ mode: "per_cubic_metre", rateMinor: 1400, volumeM3: Number.NaN })).toThrow(/volumeM3/);
    expect(() => slabPrice({ mode: "per_slab" as never, rateMinor: 1400 })).toThrow(/mode/);
  });
  it("property: more volume never costs less at a per-volume rate", () => {
    fc.assert(
      fc.property(
        fc.integer({ min: 0, max: 10_000_000 }),
        fc.double({ min: 0, max: 10, noNaN: true }),
        fc.double({ min: 0, max: 10, noNaN: true }),
        (rateMinor, first, second) => {
          const [small, large] = first <= second ? [first, second] : [second, first];
          const cheaper = slabPrice({ mode: "per_cubic_metre", rateMinor, volumeM3: small }).priceMinor;
          const dearer = slabPrice({ mode: "per_cubic_metre", rateMinor, volumeM3: large }).priceMinor;
          expect(dearer).toBeGreaterThanOrEqual(cheaper);
          expect(Number.isInteger(cheaper)).toBe(true);
        },
      ),
      { numRuns: 2000 },
    );
  });
  it("property: more board feet never cost less at a per-board-foot rate", () => {
    fc.assert(
      fc.property(
        fc.integer({ min: 0, max: 1_000_000 }),
        fc.double({ min: 0, max: 5000, noNaN: true }),
        fc.double({ min: 0, max: 100, noNaN: true }),
        (rateMinor, boardFeet, extra) => {
          const base = slabPrice({ mode: "per_board_foot", rateMinor, boardFeet }).priceMinor;
          const more = slabPrice({ mode: "per_board_foot", rateMinor, boardFeet: boardFeet + extra }).priceMinor;
          expect(more).toBeGreaterThanOrEqual(base);
        },
      ),
    );
  });
});

describe("refundShares (largest remainder / Hamilton apportionment)", () => {
  it("worked example: sizes 50, 30, 20 sharing 7 units → 4, 2, 1 (quotas 3.5, 2.1, 1.4; the one unit left goes to the 0.5 remainder)", () => {
    // Source: worked example of the largest remainder (Hamilton) method, infinitelexicon.com "largestremainder".
    expect(refundShares({ a: 50, b: 30, c: 20 }, 7)).toEqual({ a: 4, b: 2, c: 1 });
  });
  it("worked example: 500, 300, 110, 20 sharing 4 → 2, 1, 1, 0 (quotas 2.15, 1.29, 0.47, 0.09)", () => {
    // Source: Hare-quota worked example of the largest remainders method (archipel-des-libertes.fr, "largest remainders method").
    expect(refundShares({ a: 500, b: 300, c: 110, d: 20 }, 4)).toEqual({ a: 2, b: 1, c: 1, d: 0 });
  });
  it("a refund of everything gives every part back in full; nothing gives nothing", () => {
    const order = { tax: 864, platformFee: 12_000, processing: 3_510, sawyerNet: 104_490 };
    expect(refundShares(order, 120_864)).toEqual(order);
    expect(refundShares(order, 0)).toEqual({ tax: 0, platformFee: 0, processing: 0, sawyerNet: 0 });
  });
  it("always adds up to the refund exactly, each share within one unit of its exact share (property)", () => {
    fc.assert(
      fc.property(
        fc.array(fc.integer({ min: 0, max: 10_000_000 }), { minLength: 1, maxLength: 6 }),
        fc.double({ min: 0, max: 1, noNaN: true }),
        (sizes, fraction) => {
          const parts = Object.fromEntries(sizes.map((size, i) => [`p${i}`, size]));
          const total = sizes.reduce((a, b) => a + b, 0);
          const refund = Math.floor(total * fraction);
          const shares = refundShares(parts, refund);
          expect(Object.values(shares).reduce((a, b) => a + b, 0)).toBe(refund);
          for (const [key, size] of Object.entries(parts)) {
            const exact = total === 0 ? 0 : (refund * size) / total;
            expect(Math.abs(shares[key]! - exact)).toBeLessThan(1);
          }
        },
      ),
    );
  });
  it("refuses a refund above what was paid, negative or fractional money", () => {
    expect(() => refundShares({ a: 10, b: 5 }, 16)).toThrow(SlabMathError);
    expect(() => refundShares({ a: 10 }, -1)).toThrow(SlabMathError);
    expect(() => refundShares({ a: 10.5 }, 1)).toThrow(SlabMathError);
  });
});

describe("formatMoney", () => {
  // Reference: ICU through Intl.NumberFormat formatting the exact decimal string (ECMA-402
  // "Intl.NumberFormat v3" takes a decimal string without converting it to a binary float).
  const reference = (minor: number, currency: string) => {
    const sign = minor < 0 ? "−" : "";
    const abs = Math.abs(minor);
    const decimal = `${Math.floor(abs / 100)}.${String(abs % 100).padStart(2, "0")}`;
    const text = new Intl.NumberFormat("en", { style: "currency", currency, currencyDisplay: "narrowSymbol" }).format(
      decimal as unknown as number,
    );
    return sign + text;
  };
  it("matches ICU's exact decimal formatting, cent for cent", () => {
    for (const [minor, currency] of [
      [0, "USD"],
      [1, "USD"],
      [1234, "USD"],
      [123_456_789, "CAD"],
      [-500, "USD"],
      [199_999, "EUR"],
    ] as const) {
      expect(formatMoney(minor, currency)).toBe(reference(minor, currency));
    }
    expect(formatMoney(1234, "USD")).toBe("$12.34");
    expect(formatMoney(123_456_789, "CAD")).toBe("$1,234,567.89");
    expect(formatMoney(-500, "USD")).toBe("−$5.00");
  });
  it("is exact where dividing by 100 as a float is not", () => {
    // 9 007 199 254 740 991 / 100 as a binary float formats as …409.90: the last cent is lost.
    expect(formatMoney(Number.MAX_SAFE_INTEGER, "USD")).toBe("$90,071,992,547,409.91");
    fc.assert(
      fc.property(fc.integer({ min: -1e12, max: 1e12 }), (minor) => {
        expect(formatMoney(minor, "USD")).toBe(reference(minor, "USD"));
      }),
      { numRuns: 300 },
    );
  });
  it("refuses a fraction of a cent", () => {
    expect(() => formatMoney(12.5, "USD")).toThrow(SlabMathError);
  });
});

describe("parseMoneyInput and minorToInput", () => {
  it("reads what people type into whole cents, from the text itself", () => {
    expect(parseMoneyInput("12.5")).toEqual({ ok: true, minor: 1250 });
    expect(parseMoneyInput("$1 200")).toEqual({ ok: true, minor: 120_000 });
    expect(parseMoneyInput("0,07")).toEqual({ ok: true, minor: 7 });
    expect(parseMoneyInput("CAD 19.99")).toEqual({ ok: true, minor: 1999 });
    expect(parseMoneyInput("twelve")).toEqual({ ok: false, message: "Type the price like 12.50." });
    expect(parseMoneyInput(" ")).toEqual({ ok: false, message: "Give the price." });
  });
  it("round-trips: an amount put back into the input reads as itself", () => {
    fc.assert(
      fc.property(fc.integer({ min: 0, max: 999_999_999 }), (minor) => {
        expect(parseMoneyInput(minorToInput(minor))).toEqual({ ok: true, minor });
      }),
    );
  });
});

describe("taxOn", () => {
  it("rounds half-up to the cent once, like a state's tax rounding rule", () => {
    // Common practice (the bracket rule US state tax tables publish): compute to the third decimal
    // and round up when it is 5 or more. $19.99 at 7.5 % = $1.49925 → $1.50; $100 at 8.25 % = $8.25.
    expect(taxOn(1999, 750)).toBe(150);
    expect(taxOn(10_000, 825)).toBe(825);
    // $10.10 at 6.25 % = $0.63125 → $0.63 (below the half cent stays down).
    expect(taxOn(1010, 625)).toBe(63);
    // $0.20 at 2.5 % = $0.005 exactly: the half goes up.
    expect(taxOn(20, 250)).toBe(1);
    expect(taxOn(0, 825)).toBe(0);
  });
  it("agrees with exact half-up for any amount and rate", () => {
    // Against an independent half-up in BigInt arithmetic, for random amounts and rates.
    fc.assert(
      fc.property(fc.integer({ min: 0, max: 1e12 }), fc.integer({ min: 0, max: 10_000 }), (amount, bps) => {
        const exact = (BigInt(amount) * BigInt(bps) * 2n + 10_000n) / 20_000n;
        expect(taxOn(amount, bps)).toBe(Number(exact));
      }),
    );
  });
  it("refuses a rate above 100 % or a fraction of a cent", () => {
    expect(() => taxOn(100, 10_001)).toThrow(SlabMathError);
    expect(() => taxOn(10.5, 825)).toThrow(SlabMathError);
  });
});
