import { existsSync, mkdirSync, readFileSync, writeFileSync } from "node:fs";
import { dirname } from "node:path";
import express, { type NextFunction, type Request, type Response } from "express";

/**
 * Grainyard's local stand-in for the card-payment provider. The API talks to it through the
 * official SDK (host/port/protocol options), so it answers in the provider's REST shape:
 * form-encoded requests, JSON objects back, errors as `{ error: { type, message, param?, code? } }`.
 *
 * This first increment serves health and the error protocol; checkout sessions, payment intents,
 * refunds, connected accounts, transfers and signed webhooks arrive with the checkout work.
 */
export interface PaymentsFakeOptions {
  /** JSON file that keeps the fake's own state across restarts. */
  stateFile: string;
  /** Secret key the API must present (test mode keys start with sk_test_). */
  secretKey: string;
}

export interface PaymentsFakeState {
  createdAt: string;
  objects: Record<string, unknown>;
}

export function loadState(stateFile: string): PaymentsFakeState {
  if (existsSync(stateFile)) return JSON.parse(readFileSync(stateFile, "utf8")) as PaymentsFakeState;
  const fresh: PaymentsFakeState = { createdAt: new Date().toISOString(), objects: {} };
  mkdirSync(dirname(stateFile), { recursive: true });
  writeFileSync(stateFile, JSON.stringify(fresh, null, 2));
  return fresh;
}

export function providerError(res: Response, status: number, type: string, message: string, extra: { code?: string; param?: string } = {}) {
  res.status(status).json({ error: { type, message, ...extra } });
}

export function createPaymentsFakeApp(options: PaymentsFakeOptions) {
  const state = loadState(options.stateFile);
  const app = express();
  app.disable("x-powered-by");

  app.get("/health", (_req, res) => {
    res.json({ status: "ok", mode: "test", since: state.createdAt });
  });

  // Everything under /v1 needs the platform's secret key, as the provider requires.
  app.use("/v1", (req: Request, res: Response, next: NextFunction) => {
    const header = req.get("authorization") ?? "";
    const key = header.startsWith("Bearer ") ? header.slice(7) : "";
    if (key !== options.secretKey) {
      return providerError(res, 401, "invalid_request_error", "Invalid API key provided.", { code: "api_key_invalid" });
    }
    next();
  });

  app.use((req: Request, res: Response) => {
    providerError(res, 404, "invalid_request_error", `Unrecognized request URL (${req.method}: ${req.path}).`);
  });

  return app;
}
