import { errorCatalogue, type ErrorCode, type ErrorCodeWithStatus } from "@grainyard/contracts";

/**
 * Typed errors thrown by services. Each takes only codes of the error catalogue in
 * packages/contracts whose status matches its own (a typo or a wrong status is a type error), and
 * one error middleware turns them into `{ error: { code, message, fields? } }` with that status.
 */
export class AppError extends Error {
  readonly status: number;
  /** What went wrong underneath (keys, driver text), for the log only: never part of an answer. */
  internal?: string;
  constructor(
    readonly code: ErrorCode,
    message: string,
    readonly fields?: Record<string, string>,
    /** More detail for the client, merged into the error object (e.g. CSV row errors). */
    readonly details?: Record<string, unknown>,
  ) {
    super(message);
    this.name = new.target.name;
    this.status = errorCatalogue[code].status;
  }
}

export class Invalid extends AppError {
  declare readonly code: ErrorCodeWithStatus<422>;
  constructor(message: string, fields?: Record<string, string>, code: ErrorCodeWithStatus<422> = "invalid_input") {
    super(code, message, fields);
  }
}
export class ServiceUnavailable extends AppError {
  constructor(message: string, code: ErrorCodeWithStatus<503> = "unavailable") {
    super(code, message);
  }
}
export class Unauthorized extends AppError {
  constructor(message = "Sign in to do that.", code: ErrorCodeWithStatus<401> = "not_signed_in") {
    super(code, message);
  }
}
export class Forbidden extends AppError {
  constructor(message = "Your account cannot do that.", code: ErrorCodeWithStatus<403> = "forbidden") {
    super(code, message);
  }
}
export class NotFound extends AppError {
  constructor(message = "We could not find that.") {
    super("not_found", message);
  }
}
export class Conflict extends AppError {
  constructor(message: string, code: ErrorCodeWithStatus<409>) {
    super(code, message);
  }
}
export class Gone extends AppError {
  constructor(message: string, code: ErrorCodeWithStatus<410>) {
    super(code, message);
  }
}
export class TooManyRequests extends AppError {
  constructor(message: string) {
    super("too_many_requests", message);
  }
}
