/**
 * Typed errors thrown by services. One error middleware turns them into
 * `{ error: { code, message, fields? } }` with the status each carries.
 */
export class AppError extends Error {
  constructor(
    readonly status: number,
    readonly code: string,
    message: string,
    readonly fields?: Record<string, string>,
    /** More detail for the client, merged into the error object (e.g. CSV row errors). */
    readonly details?: Record<string, unknown>,
  ) {
    super(message);
    this.name = new.target.name;
  }
}

export class Invalid extends AppError {
  constructor(message: string, fields?: Record<string, string>, code = "invalid_input") {
    super(422, code, message, fields);
  }
}
export class ServiceUnavailable extends AppError {
  constructor(message: string, code = "unavailable") {
    super(503, code, message);
  }
}
export class Unauthorized extends AppError {
  constructor(message = "Sign in to do that.", code = "not_signed_in") {
    super(401, code, message);
  }
}
export class Forbidden extends AppError {
  constructor(message = "Your account cannot do that.", code = "forbidden") {
    super(403, code, message);
  }
}
export class NotFound extends AppError {
  constructor(message = "We could not find that.", code = "not_found") {
    super(404, code, message);
  }
}
export class Conflict extends AppError {
  constructor(message: string, code = "conflict") {
    super(409, code, message);
  }
}
export class Gone extends AppError {
  constructor(message: string, code = "gone") {
    super(410, code, message);
  }
}
export class TooManyRequests extends AppError {
  constructor(message: string) {
    super(429, "too_many_requests", message);
  }
}
