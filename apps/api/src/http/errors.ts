import type { ErrorRequestHandler, RequestHandler } from "express";
import { AppError } from "../errors.ts";
import type { Logger } from "../logger.ts";

/** Unknown API routes answer JSON, never the web app's HTML. */
export const apiNotFound: RequestHandler = (req, res) => {
  res
    .status(404)
    .json({ error: { code: "not_found", message: `There is no ${req.method} ${req.originalUrl.split("?")[0]} in the Grainyard API.` } });
};

/** Errors of the database connection (not of a query): the database is down or out of reach, not a bug. */
const CONNECTION_ERRORS = new Set([
  "ECONNREFUSED",
  "ECONNRESET",
  "ETIMEDOUT",
  "EPIPE",
  "EHOSTUNREACH",
  "ENOTFOUND",
  "PROTOCOL_CONNECTION_LOST",
  "PROTOCOL_SEQUENCE_TIMEOUT",
  "ER_CON_COUNT_ERROR",
  // mysql2's pool cluster (a primary and a read replica): the node is out for a second after repeated connection errors.
  "POOL_NONEONLINE",
  "POOL_NOEXIST",
]);
function isDatabaseDown(error: unknown): boolean {
  const { code, fatal, driverError } = error as { code?: string; fatal?: boolean; driverError?: { code?: string; fatal?: boolean } };
  // mysql2 marks errors that ended the connection as fatal (a query on a connection that was closed under it).
  return (
    CONNECTION_ERRORS.has(code ?? "") || CONNECTION_ERRORS.has(driverError?.code ?? "") || fatal === true || driverError?.fatal === true
  );
}

/**
 * How long a client should wait before trying again when a part is down (the `Retry-After` of every
 * 503): the database usually comes back in seconds, the providers' outages last longer.
 */
const RETRY_AFTER_SECONDS: Record<string, number> = { unavailable: 10, storage_unavailable: 30, payments_unavailable: 30 };

/** Maps every error to `{ error: { code, message, fields? } }`; internals never leave the server (they go to the log). */
export const errorHandler =
  (logger: Logger): ErrorRequestHandler =>
  (error, req, res, _next) => {
    const where = { id: req.id, method: req.method, url: req.originalUrl };
    if (error instanceof AppError) {
      // A part underneath is down: what it said (keys, driver text) is for the log only.
      if (error.status >= 500)
        logger.warn({ err: error.cause ?? error, detail: error.internal, code: error.code, req: where }, "answered 5xx");
      if (error.status === 503) res.setHeader("retry-after", String(RETRY_AFTER_SECONDS[error.code] ?? 30));
      res
        .status(error.status)
        .json({ error: { ...error.details, code: error.code, message: error.message, ...(error.fields ? { fields: error.fields } : {}) } });
      return;
    }
    const bodyError = error as { type?: string; status?: number };
    if (bodyError.type === "entity.parse.failed") {
      res.status(400).json({ error: { code: "malformed_request", message: "The request body is not valid JSON." } });
      return;
    }
    if (bodyError.type === "entity.too.large") {
      const photo = req.path.endsWith("/photos");
      res.status(413).json({
        error: {
          code: photo ? "too_large_file" : "too_large",
          message: photo
            ? "That photo is larger than 25 MB. Take it at a lower resolution or pick another."
            : "The request body is too large.",
        },
      });
      return;
    }
    if (typeof bodyError.status === "number" && bodyError.status >= 400 && bodyError.status < 500) {
      res.status(bodyError.status).json({ error: { code: "malformed_request", message: "The request could not be read." } });
      return;
    }
    if (isDatabaseDown(error)) {
      logger.error({ err: error, req: where }, "database unavailable");
      res.setHeader("retry-after", String(RETRY_AFTER_SECONDS.unavailable));
      res
        .status(503)
        .json({ error: { code: "unavailable", message: "Grainyard's database is not answering just now. Please try again in a moment." } });
      return;
    }
    logger.error({ err: error, req: where }, "unhandled error");
    res.status(500).json({ error: { code: "internal", message: "Something went wrong on our side. Please try again in a moment." } });
  };
