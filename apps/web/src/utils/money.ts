/**
 * Money at the edges: amounts travel as integer minor units (cents); people type and read them
 * in currency units. Parsing works on the text itself, so no float ever becomes money.
 */

const formatters = new Map<string, Intl.NumberFormat>();

/** 1234 USD → "$12.34" (every currency Grainyard takes has two decimals). */
export function formatMoney(minor: number, currency: string): string {
  let format = formatters.get(currency);
  if (!format) {
    format = new Intl.NumberFormat("en", { style: "currency", currency, currencyDisplay: "narrowSymbol" });
    formatters.set(currency, format);
  }
  const sign = minor < 0 ? "−" : "";
  const whole = Math.floor(Math.abs(minor) / 100);
  const cents = Math.abs(minor) % 100;
  // Format the whole part, then put the exact cents in (no float division of money).
  const text = format.format(whole);
  return sign + text.replace(/\.00$/, `.${String(cents).padStart(2, "0")}`);
}

/** Basis points as a percentage: 290 → "2.9 %", 1000 → "10 %". */
export function formatBasisPoints(basisPoints: number): string {
  return `${(basisPoints / 100).toLocaleString("en", { maximumFractionDigits: 2 })} %`;
}

export type ParsedMoney = { ok: true; minor: number } | { ok: false; message: string };

/** "12.50", "12,5", "1 200", "$12" → integer minor units; anything else says what to type. */
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

/** 1250 → "12.50", for putting a stored rate back into the input. */
export function minorToInput(minor: number): string {
  return `${Math.floor(minor / 100)}.${String(minor % 100).padStart(2, "0")}`;
}
