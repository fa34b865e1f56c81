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
