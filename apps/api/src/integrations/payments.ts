import Stripe from "stripe";
import type { AppConfig } from "../config.ts";

export interface Payments {
  sdk: Stripe;
  /** True when the payment provider (the local fake in development) answers. */
  isUp(): Promise<boolean>;
}

/** The card-payment provider through its official SDK, pointed at the endpoint from config. */
export function createPayments(config: AppConfig["payments"]): Payments {
  const sdk = new Stripe(config.secretKey, {
    host: config.host,
    port: config.port,
    protocol: config.protocol,
    maxNetworkRetries: 0,
    telemetry: false,
    timeout: 10_000,
  });
  const base = `${config.protocol}://${config.host}:${config.port}`;
  return {
    sdk,
    async isUp() {
      try {
        const response = await fetch(`${base}/health`, { signal: AbortSignal.timeout(3_000) });
        return response.ok;
      } catch {
        return false;
      }
    },
  };
}
