import { afterAll, beforeAll, describe, expect, it } from "vitest";
import request from "supertest";
import { createTestContext, type TestContext } from "../test-support/test-context.ts";

let healthy: TestContext;
let broken: TestContext;
beforeAll(async () => {
  healthy = await createTestContext();
  // Same database, but storage, mail and payments pointed at a port where nothing listens.
  broken = await createTestContext({ environment: { S3_ENDPOINT: "http://127.0.0.1:9", SMTP_PORT: "9", PAYMENTS_PORT: "9" } });
});
afterAll(async () => {
  await healthy?.close();
  await broken?.close();
});

describe("/api/health", () => {
  it("reports every part of the stack up", async () => {
    const res = await request(healthy.app).get("/api/health");
    expect(res.status).toBe(200);
    expect(res.body).toEqual({ status: "ok", components: { database: "up", storage: "up", mail: "up", payments: "up" } });
  });

  it("reports the parts that are down, with 503", async () => {
    const res = await request(broken.app).get("/api/health");
    expect(res.status).toBe(503);
    expect(res.body).toEqual({ status: "degraded", components: { database: "up", storage: "down", mail: "down", payments: "down" } });
  });
});

describe("security headers", () => {
  it("sends a Content-Security-Policy that allows only our own origin", async () => {
    const res = await request(healthy.app).get("/api/v1/session");
    const policy = res.headers["content-security-policy"] as string;
    expect(policy).toContain("default-src 'self'");
    expect(policy).toContain("script-src 'self'");
    expect(policy).toContain("frame-ancestors 'none'");
    expect(policy).not.toMatch(/https?:\/\//);
    expect(res.headers["x-content-type-options"]).toBe("nosniff");
  });
});
