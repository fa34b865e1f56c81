import { type z } from "zod";

/** Turns a zod error into the per-field message map used in `error.fields`. */
export function fieldMessages(error: z.ZodError): Record<string, string> {
  const fields: Record<string, string> = {};
  for (const issue of error.issues) {
    const key = issue.path.length ? issue.path.join(".") : "_";
    if (!(key in fields)) fields[key] = issue.message;
  }
  return fields;
}

/** Header that carries the anti-forgery token on every state-changing request. */
export const CSRF_HEADER = "x-csrf-token";

/**
 * Characters a name shown to other people must not hold: control characters (CR, LF, tab, NUL…),
 * line and paragraph separators, and the bidirectional overrides and isolates that make text read
 * differently from how it is stored.
 */
const UNPRINTABLE = /[\p{Cc}\p{Zl}\p{Zp}\u202A-\u202E\u2066-\u2069]/u;
export const isPrintableLine = (text: string): boolean => !UNPRINTABLE.test(text);
export const UNPRINTABLE_MESSAGE = "Use one line of ordinary text: no line breaks or control characters.";

/** Whether text has a letter of any script (a place name, a person's name), not only digits, marks or emoji. */
export const hasLetter = (text: string): boolean => /\p{L}/u.test(text);

/**
 * The latest calendar day (YYYY-MM-DD) that is today somewhere on Earth (UTC+14): a date after it
 * is in the future for everyone.
 */
export function latestToday(now: Date = new Date()): string {
  return new Date(now.getTime() + 14 * 3_600_000).toISOString().slice(0, 10);
}
