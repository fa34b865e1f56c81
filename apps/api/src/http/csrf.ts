import type { RequestHandler } from "express";
import { CSRF_HEADER } from "@grainyard/contracts";
import { Forbidden } from "../errors.ts";
import { sameToken } from "../services/tokens.ts";
import { sessionOf } from "./context.ts";

const SAFE_METHODS = new Set(["GET", "HEAD", "OPTIONS"]);

/**
 * Anti-forgery for every state-changing request: the browser must send back, in a header, the
 * token it read from GET /api/v1/session (a page on another site can neither read it nor set the
 * header). Requests the browser marks as cross-site are refused outright.
 */
export const requireCsrfToken: RequestHandler = (req, _res, next) => {
  if (SAFE_METHODS.has(req.method)) return next();
  if (req.get("sec-fetch-site") === "cross-site")
    return next(new Forbidden("Requests from other sites are not accepted.", "csrf_rejected"));
  const expected = sessionOf(req).csrf;
  const sent = req.get(CSRF_HEADER);
  if (!expected || !sent || !sameToken(expected, sent)) {
    return next(new Forbidden("Your page is out of date. Reload it and try again.", "csrf_rejected"));
  }
  next();
};
