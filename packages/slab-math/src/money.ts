/**
 * Money: integer minor units (cents, pence) only; fees in basis points (1 bps = 0.01 %).
 * One rounding rule everywhere: half-up to the minor unit, applied once per amount.
 */
import { SlabMathError, requireNonNegativeInteger, requireNumberInRange } from "./errors.ts";
import { LIMITS } from "./limits.ts";

/** Basis points in 100 %. */
export const BASIS_POINTS_PER_WHOLE = 10_000;

/**
 * Rounds a non-negative amount of minor units half-up to a whole minor unit.
 * A relative tolerance of a few ulps absorbs binary floating-point error, so that a
 * product such as 1.005 × 100 (= 100.49999…) rounds as the decimal value it stands for.
 */
export function roundHalfUp(amount: number): number {
  return Math.floor(amount + 0.5 + Math.abs(amount) * 4 * Number.EPSILON);
}

/** Half-up of numerator / denominator for non-negative integers, exact (BigInt). */
function divideRoundHalfUp(numerator: bigint, denominator: bigint): bigint {
  return (numerator * 2n + denominator) / (denominator * 2n);
}

/** Fee settings of {@link feeBreakdown}. */
export interface FeeSettings {
  /** Platform fee, basis points of the subtotal (0–10 000). */
  platformFeeBps: number;
  /** Payment processing fee, basis points of the subtotal (0–10 000). */
  processingFeeBps: number;
  /** Fixed processing fee per payment, minor units. */
  processingFixedMinor: number;
}

/**
 * Grainyard's usual fees, until an admin sets others: a 10 % platform fee, and card processing at
 * 2.9 % + 0.30 (a typical card-processing price; common practice). The API starts its settings from
 * these; the listing form previews with them when the fees in force cannot be fetched.
 */
export const USUAL_FEES: Readonly<FeeSettings> = Object.freeze({ platformFeeBps: 1000, processingFeeBps: 290, processingFixedMinor: 30 });

/** Result of {@link feeBreakdown}: three integers that sum to the subtotal exactly. */
export interface FeeBreakdown {
  platformFeeMinor: number;
  processingFeeMinor: number;
  sawyerNetMinor: number;
}

/**
 * Splits a subtotal into platform fee, processing fee and the sawyer's net.
 * platform = round_half_up(subtotal × platformBps / 10 000);
 * processing = round_half_up(subtotal × processingBps / 10 000) + fixed;
 * net = subtotal − platform − processing (the remainder, so the parts always sum exactly).
 * Computed with exact integer arithmetic.
 *
 * @throws SlabMathError on non-integer or negative money, bps outside 0–10 000, or fees above the subtotal.
 */
export function feeBreakdown(subtotalMinor: number, settings: FeeSettings): FeeBreakdown {
  const subtotal = requireNonNegativeInteger(subtotalMinor, "subtotalMinor");
  const platformBps = requireNonNegativeInteger(settings.platformFeeBps, "platformFeeBps", BASIS_POINTS_PER_WHOLE);
  const processingBps = requireNonNegativeInteger(settings.processingFeeBps, "processingFeeBps", BASIS_POINTS_PER_WHOLE);
  const fixed = requireNonNegativeInteger(settings.processingFixedMinor, "processingFixedMinor");
  const whole = BigInt(BASIS_POINTS_PER_WHOLE);
  const platformFee = Number(divideRoundHalfUp(BigInt(subtotal) * BigInt(platformBps), whole));
  const processingFee = Number(divideRoundHalfUp(BigInt(subtotal) * BigInt(processingBps), whole)) + fixed;
  const net = subtotal - platformFee - processingFee;
  if (net < 0) {
    throw new SlabMathError(
      "fees_exceed_subtotal",
      "subtotalMinor",
      `subtotalMinor ${subtotal} is smaller than its fees (${platformFee} platform + ${processingFee} processing)`,
    );
  }
  return { platformFeeMinor: platformFee, processingFeeMinor: processingFee, sawyerNetMinor: net };
}

/** How a slab is priced. */
export type PriceMode = "per_board_foot" | "per_cubic_metre" | "fixed";

/** Input of {@link slabPrice}. */
export interface SlabPriceInput {
  mode: PriceMode;
  /** Rate in minor units: per board foot, per m³, or the fixed price. */
  rateMinor: number;
  /** Board feet (needed for per_board_foot). */
  boardFeet?: number;
  /** Volume in m³ (needed for per_cubic_metre). */
  volumeM3?: number;
}

/** Result of {@link slabPrice}. */
export interface SlabPrice {
  /** Price, integer minor units. */
  priceMinor: number;
  mode: PriceMode;
  /** Quantity the rate was applied to (board feet, m³, or 1 for fixed). */
  quantity: number;
}

/**
 * Price of a slab in integer minor units: rate × quantity, rounded half-up to the minor unit
 * once (fixed prices are taken as they are).
 *
 * @throws SlabMathError on non-integer or negative rates, missing or invalid quantities.
 */
export function slabPrice(input: SlabPriceInput): SlabPrice {
  const rate = requireNonNegativeInteger(input.rateMinor, "rateMinor");
  let quantity: number;
  switch (input.mode) {
    case "fixed":
      return { priceMinor: rate, mode: "fixed", quantity: 1 };
    case "per_board_foot":
      if (input.boardFeet === undefined) {
        throw new SlabMathError("missing_input", "boardFeet", "boardFeet is needed to price per board foot");
      }
      quantity = requireNumberInRange(input.boardFeet, "boardFeet", 0, LIMITS.maximumVolumeM3 / 0.002359737216, "bf");
      break;
    case "per_cubic_metre":
      if (input.volumeM3 === undefined) {
        throw new SlabMathError("missing_input", "volumeM3", "volumeM3 is needed to price per cubic metre");
      }
      quantity = requireNumberInRange(input.volumeM3, "volumeM3", 0, LIMITS.maximumVolumeM3, "m³");
      break;
    default:
      throw new SlabMathError(
        "invalid_format",
        "mode",
        `mode must be per_board_foot, per_cubic_metre or fixed, got ${String((input as { mode: unknown }).mode)}`,
      );
  }
  const priceMinor = roundHalfUp(rate * quantity);
  if (!Number.isSafeInteger(priceMinor)) {
    throw new SlabMathError("out_of_range", "rateMinor", "rateMinor × quantity is too large to price");
  }
  return { priceMinor, mode: input.mode, quantity };
}

/**
 * A partial refund split across the parts of what the buyer paid, in proportion to each part,
 * so the ledger can take back a share of each and still sum to zero. Whole minor units by the
 * largest remainder method (Hamilton's apportionment): every part first gets the floor of its
 * exact share, then the units left over go one each to the parts with the largest remainders
 * (ties to the earlier part). The shares always add up to the refund exactly, and a refund of
 * everything gives back every part in full.
 */
export function refundShares<K extends string>(parts: Record<K, number>, refundMinor: number): Record<K, number> {
  const keys = Object.keys(parts) as K[];
  for (const key of keys) {
    if (!Number.isSafeInteger(parts[key]) || parts[key] < 0)
      throw new SlabMathError("not_integer", key, `${key} must be a whole, non-negative number of minor units`);
  }
  const total = keys.reduce((sum, key) => sum + parts[key], 0);
  if (!Number.isSafeInteger(refundMinor) || refundMinor < 0)
    throw new SlabMathError("not_integer", "refundMinor", "The refund must be a whole, non-negative number of minor units");
  if (refundMinor > total) throw new SlabMathError("out_of_range", "refundMinor", "The refund cannot be more than was paid");
  const shares = {} as Record<K, number>;
  if (total === 0) {
    for (const key of keys) shares[key] = 0;
    return shares;
  }
  const big = BigInt(refundMinor);
  const bigTotal = BigInt(total);
  const remainders: { key: K; remainder: bigint; index: number }[] = [];
  let given = 0;
  keys.forEach((key, index) => {
    const exact = big * BigInt(parts[key]);
    shares[key] = Number(exact / bigTotal);
    given += shares[key];
    remainders.push({ key, remainder: exact % bigTotal, index });
  });
  remainders.sort((a, b) => (a.remainder === b.remainder ? a.index - b.index : a.remainder > b.remainder ? -1 : 1));
  for (let i = 0; i < refundMinor - given; i++) shares[remainders[i]!.key] += 1;
  return shares;
}

/**
 * Sales tax on an amount at a rate in basis points (825 = 8.25 %), half-up to the minor unit once,
 * with exact integer arithmetic.
 *
 * @throws SlabMathError on non-integer or negative money, or a rate outside 0–10 000 bps.
 */
export function taxOn(amountMinor: number, rateBps: number): number {
  const amount = requireNonNegativeInteger(amountMinor, "amountMinor");
  const rate = requireNonNegativeInteger(rateBps, "rateBps", BASIS_POINTS_PER_WHOLE);
  return Number(divideRoundHalfUp(BigInt(amount) * BigInt(rate), BigInt(BASIS_POINTS_PER_WHOLE)));
}

// ---- Money as text ----

const currencyFormats = new Map<string, Intl.NumberFormat>();

/**
 * An amount of minor units as people read it: 1234 USD → "$12.34", −500 → "−$5.00". Exact: the
 * whole units are formatted by Intl (grouping, symbol) and the cents put in as digits, so no float
 * division ever touches money. Every currency Grainyard takes has two decimals.
 */
export function formatMoney(minor: number, currency: string): string {
  const amount = requireNumberInRange(minor, "minor", -Number.MAX_SAFE_INTEGER, Number.MAX_SAFE_INTEGER);
  if (!Number.isInteger(amount)) throw new SlabMathError("not_integer", "minor", "Money is a whole number of minor units.");
  let format = currencyFormats.get(currency);
  if (!format) {
    format = new Intl.NumberFormat("en", { style: "currency", currency, currencyDisplay: "narrowSymbol" });
    currencyFormats.set(currency, format);
  }
  const sign = amount < 0 ? "−" : "";
  const whole = Math.floor(Math.abs(amount) / 100);
  const cents = Math.abs(amount) % 100;
  return sign + format.format(whole).replace(/\.00$/, `.${String(cents).padStart(2, "0")}`);
}

/** Basis points as a percentage: 290 → "2.9 %", 1000 → "10 %". */
export function formatBasisPoints(basisPoints: number): string {
  return `${(basisPoints / 100).toLocaleString("en", { maximumFractionDigits: 2 })} %`;
}

export type ParsedMoney = { ok: true; minor: number } | { ok: false; message: string };

/** "12.50", "12,5", "1 200", "$12" → integer minor units, read from the text itself (no float); anything else says what to type. */
export function parseMoneyInput(text: string): ParsedMoney {
  const cleaned = text
    .trim()
    .replace(/^[$€£]|\s/g, "")
    .replace(/^(CAD|USD|EUR|GBP)/i, "");
  if (cleaned === "") return { ok: false, message: "Give the price." };
  const match = /^(\d{1,9})(?:[.,](\d{1,2}))?$/.exec(cleaned);
  if (!match) return { ok: false, message: "Type the price like 12.50." };
  const whole = Number(match[1]);
  const cents = match[2] ? Number(match[2].padEnd(2, "0")) : 0;
  return { ok: true, minor: whole * 100 + cents };
}

/** 1250 → "12.50", for putting a stored amount back into an input. */
export function minorToInput(minor: number): string {
  return `${Math.floor(minor / 100)}.${String(minor % 100).padStart(2, "0")}`;
}
