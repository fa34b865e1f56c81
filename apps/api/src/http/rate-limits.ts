import type { NextFunction, Request, RequestHandler, Response } from "express";
import { rateLimit } from "express-rate-limit";
import type { AppConfig } from "../config.ts";
import { TooManyRequests } from "../errors.ts";

function emailKey(req: Request): string {
  const email = (req.body as { email?: unknown } | undefined)?.email;
  return typeof email === "string" ? email.trim().toLowerCase() : "(none)";
}

/**
 * Limits on sign-in and password reset (express-rate-limit, in-memory per API instance).
 * Sign-in counts only failed attempts: the 6th wrong password for one account in 15 minutes gets 429.
 */
export function createRateLimits(limits: AppConfig["limits"]) {
  const limited = (message: string) => (_req: Request, _res: Response, next: NextFunction) => next(new TooManyRequests(message));
  const signInMessage = "Too many sign-in attempts. Wait 15 minutes and try again, or reset your password.";
  const resetMessage = "Too many reset requests. Wait a while before asking again.";
  const signIn: RequestHandler[] = [
    rateLimit({
      windowMs: limits.windowMs,
      limit: limits.signInPerIp,
      skipSuccessfulRequests: true,
      standardHeaders: "draft-8",
      legacyHeaders: false,
      handler: limited(signInMessage),
    }),
    rateLimit({
      windowMs: limits.windowMs,
      limit: limits.signInPerAccount,
      skipSuccessfulRequests: true,
      standardHeaders: "draft-8",
      legacyHeaders: false,
      keyGenerator: emailKey,
      handler: limited(signInMessage),
    }),
  ];
  const passwordReset: RequestHandler[] = [
    rateLimit({
      windowMs: limits.windowMs,
      limit: limits.resetPerIp,
      standardHeaders: "draft-8",
      legacyHeaders: false,
      handler: limited(resetMessage),
    }),
    rateLimit({
      windowMs: 60 * 60 * 1000,
      limit: limits.resetPerAccount,
      standardHeaders: "draft-8",
      legacyHeaders: false,
      keyGenerator: emailKey,
      handler: limited(resetMessage),
    }),
  ];
  return { sign_in: signIn, password_reset: passwordReset };
}
