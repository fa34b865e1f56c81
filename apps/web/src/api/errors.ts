import { errorDetails, type ErrorCode } from "@grainyard/contracts";
import type { z } from "zod";
/**
 * Every failed API call becomes an ApiRequestError with status, code, message and per-field messages,
 * so views can always show a message. Shared UI may import this file (it holds no client).
 */
/** Codes the client itself produces when no API answer could be read. */
export const clientErrorCodes = {
  offline: "offline",
  unavailable: "unavailable",
  unexpectedResponse: "unexpected_response",
} as const;

export const OFFLINE_MESSAGE = "You seem to be offline. Check your connection and try again.";
export const UNAVAILABLE_MESSAGE = "Grainyard can't be reached right now. Please try again in a moment.";
export const UNEXPECTED_MESSAGE = "The server sent an answer we did not understand. Please try again.";

/** A code from the API's error catalogue, or one the client makes when no answer could be read. */
export type ApiErrorCode = ErrorCode | (typeof clientErrorCodes)[keyof typeof clientErrorCodes];

export class ApiRequestError extends Error {
  readonly status: number;
  readonly code: ApiErrorCode | (string & {});
  readonly fields: Record<string, string>;
  /** The whole `error` object of the answer, for codes that carry more (e.g. CSV row errors). */
  readonly detail: unknown;

  constructor(status: number, code: string, message: string, fields: Record<string, string> = {}, detail: unknown = undefined) {
    super(message);
    this.name = "ApiRequestError";
    this.status = status;
    this.code = code;
    this.fields = fields;
    this.detail = detail;
  }

  /** True when no answer came back at all (no network, or the server is down). */
  get isOffline(): boolean {
    return this.code === clientErrorCodes.offline;
  }

  get hasFieldMessages(): boolean {
    return Object.keys(this.fields).length > 0;
  }

  /** Narrows on a code of the catalogue (a typo in `code` is a type error). */
  is<C extends ApiErrorCode>(code: C): this is ApiRequestError & { code: C } {
    return this.code === code;
  }
}

/** Whether `error` is an API error with this code. */
export function hasErrorCode<C extends ApiErrorCode>(error: unknown, code: C): error is ApiRequestError & { code: C } {
  return error instanceof ApiRequestError && error.code === code;
}

/** The detail a code carries (the catalogue's schema for it), or null when the answer lacks it. */
export function errorDetail<C extends keyof typeof errorDetails>(
  error: ApiRequestError,
  code: C,
): z.output<(typeof errorDetails)[C]> | null {
  if (error.code !== code) return null;
  const parsed = errorDetails[code].safeParse(error.detail);
  return parsed.success ? parsed.data : null;
}

/** Turns anything thrown into an ApiRequestError so views can always show a message. */
export function toApiRequestError(error: unknown): ApiRequestError {
  if (error instanceof ApiRequestError) return error;
  const message = error instanceof Error && error.message ? error.message : UNEXPECTED_MESSAGE;
  return new ApiRequestError(0, clientErrorCodes.unexpectedResponse, message);
}
