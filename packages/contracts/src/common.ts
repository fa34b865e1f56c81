import { z } from "zod";

/** Every error the API returns has this shape; `fields` maps a field path to its message. */
export const apiErrorSchema = z.object({
  error: z.object({
    code: z.string(),
    message: z.string(),
    fields: z.record(z.string(), z.string()).optional(),
    /** Row-by-row problems of a CSV import (nothing was saved). */
    rows: z.array(z.object({ row: z.number(), field: z.string(), message: z.string() })).optional(),
  }),
});
export type ApiError = z.infer<typeof apiErrorSchema>;

/** Error codes the API uses, each with one HTTP status. */
export const errorCodes = {
  malformed_request: 400,
  not_signed_in: 401,
  forbidden: 403,
  not_found: 404,
  conflict: 409,
  invalid_input: 422,
  too_many_requests: 429,
  internal: 500,
  unavailable: 503,
} as const;
export type ErrorCode = keyof typeof errorCodes;

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
