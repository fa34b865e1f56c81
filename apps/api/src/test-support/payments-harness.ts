import { mkdtempSync, rmSync } from "node:fs";
import { createServer, type Server } from "node:http";
import type { AddressInfo } from "node:net";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { createPaymentsFakeApp, type PaymentsFakeApp } from "@grainyard/payments-fake";
import type { DataSource } from "typeorm";
import { expect } from "vitest";

/*
 * Shared by the suites that need a payments fake of their own (through the official SDK):
 * starting it, pointing an app at it, waiting for webhooks, and the ledger check after each test.
 */

/** Waits until `check` holds (webhooks and e-mails arrive a moment later); fails after `ms`. */
export async function until(check: () => Promise<boolean>, ms = 10_000): Promise<void> {
  const deadline = Date.now() + ms;
  while (!(await check())) {
    if (Date.now() > deadline) throw new Error("timed out");
    await new Promise((r) => setTimeout(r, 25));
  }
}

/** Double entry: every currency's ledger entries sum to zero. */
export async function expectLedgerBalanced(dataSource: DataSource): Promise<void> {
  const rows = (await dataSource.query("SELECT currency, SUM(amount_minor) AS total FROM ledger_entry GROUP BY currency")) as {
    total: string;
  }[];
  for (const row of rows) expect(Number(row.total)).toBe(0);
}

export interface TestPaymentsFake {
  fake: PaymentsFakeApp;
  server: Server;
  port: number;
  /** http://127.0.0.1:<port> */
  base: string;
  /** The API's PAYMENTS_* settings for this fake. */
  environment: Record<string, string>;
  close(): Promise<void>;
}

/** A payments fake on a free loopback port, with its state in a temporary folder. */
export async function startPaymentsFake(options: {
  secretKey: string;
  webhookSecret: string;
  retryBaseMs?: number;
  maxAttempts?: number;
}): Promise<TestPaymentsFake> {
  const dir = mkdtempSync(join(tmpdir(), "payments-fake-"));
  const fake = createPaymentsFakeApp({
    stateFile: join(dir, "state.json"),
    secretKey: options.secretKey,
    webhook: { secret: options.webhookSecret, retryBaseMs: options.retryBaseMs ?? 25, maxAttempts: options.maxAttempts ?? 6 },
  });
  const server = fake.listen(0, "127.0.0.1");
  await new Promise((r) => server.once("listening", r));
  const port = (server.address() as AddressInfo).port;
  const handle: TestPaymentsFake = {
    fake,
    server,
    port,
    base: `http://127.0.0.1:${port}`,
    environment: {
      PAYMENTS_HOST: "127.0.0.1",
      PAYMENTS_PORT: String(port),
      PAYMENTS_PROTOCOL: "http",
      PAYMENTS_SECRET_KEY: options.secretKey,
      PAYMENTS_WEBHOOK_SECRET: options.webhookSecret,
    },
    async close() {
      fake.webhooks.stop();
      await new Promise((r) => handle.server.close(r));
      rmSync(dir, { recursive: true, force: true });
    },
  };
  return handle;
}

/** Serves an app on a free loopback port; answers the server and the webhook address on it. */
export async function listenForWebhooks(app: Parameters<typeof createServer>[1]): Promise<{ server: Server; webhookUrl: string }> {
  const server = createServer(app).listen(0, "127.0.0.1");
  await new Promise((r) => server.once("listening", r));
  return { server, webhookUrl: `http://127.0.0.1:${(server.address() as AddressInfo).port}/api/v1/payments/webhook` };
}
