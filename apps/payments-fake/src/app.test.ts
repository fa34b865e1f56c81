import { mkdtempSync, readFileSync, rmSync } from "node:fs";
import type { Server } from "node:http";
import type { AddressInfo } from "node:net";
import { tmpdir } from "node:os";
import { join } from "node:path";
import Stripe from "stripe";
import request from "supertest";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { createPaymentsFakeApp } from "./app.ts";

const dir = mkdtempSync(join(tmpdir(), "payments-fake-"));
const stateFile = join(dir, "state.json");
const app = createPaymentsFakeApp({ stateFile, secretKey: "sk_test_unit" });
let server: Server;
let port = 0;

beforeAll(async () => {
  server = app.listen(0, "127.0.0.1");
  await new Promise((r) => server.once("listening", r));
  port = (server.address() as AddressInfo).port;
});
afterAll(async () => {
  await new Promise((r) => server.close(r));
  rmSync(dir, { recursive: true, force: true });
});

describe("payments fake skeleton", () => {
  it("answers health and keeps its state in a file", async () => {
    const res = await request(app).get("/health").expect(200);
    expect(res.body.status).toBe("ok");
    expect(JSON.parse(readFileSync(stateFile, "utf8")).createdAt).toBe(res.body.since);
  });

  it("rejects a wrong secret key with the provider's typed authentication error through the real SDK", async () => {
    const sdk = new Stripe("sk_test_wrong", { host: "127.0.0.1", port, protocol: "http", maxNetworkRetries: 0, telemetry: false });
    await expect(sdk.balance.retrieve()).rejects.toMatchObject({ type: "StripeAuthenticationError", statusCode: 401 });
  });

  it("answers an unknown endpoint with the provider's invalid-request error through the real SDK", async () => {
    const sdk = new Stripe("sk_test_unit", { host: "127.0.0.1", port, protocol: "http", maxNetworkRetries: 0, telemetry: false });
    await expect(sdk.balance.retrieve()).rejects.toMatchObject({ type: "StripeInvalidRequestError", statusCode: 404 });
  });
});
