/**
 * Counts in words, for the web and the e-mails alike: the plural rules of the language
 * (Intl.PluralRules) pick the form, so 0 and 2 take the plural, 1 the singular, and a fraction
 * such as 1.5 the plural, as English has it. One place, so no screen says "1 slabs" or "0 slab".
 */
const rules = new Intl.PluralRules("en-US");
const numbers = new Intl.NumberFormat("en-US", { maximumFractionDigits: 2 });

/** The form for this count: pluralWord(1, "slab", "slabs") is "slab"; any other count, "slabs". */
export function pluralWord(count: number, one: string, other: string): string {
  return rules.select(count) === "one" ? one : other;
}

/** The count and its word: "1 slab", "0 slabs", "1,200 slabs". */
export function countOf(count: number, one: string, other: string): string {
  return `${numbers.format(count)} ${pluralWord(count, one, other)}`;
}
