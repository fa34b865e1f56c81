import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { ConfigError, loadConfig } from "../config.ts";
import { createTestContext, type TestContext } from "../test-support/test-context.ts";

const DAY_MS = 86_400_000;

describe("the end-to-end suite's movable clock", () => {
  let plain: TestContext;
  let clocked: TestContext;
  beforeAll(async () => {
    plain = await createTestContext();
    clocked = await createTestContext({ environment: { GRAINYARD_TEST_CLOCK: "1" } });
  });
  afterAll(async () => {
    await plain?.close();
    await clocked?.close();
  });

  it("is not there without the flag, even with NODE_ENV=test", async () => {
    expect(plain.config.environment).toBe("test");
    const client = await plain.client();
    expect((await client.post("/api/_test/clock", { advanceDays: 8 })).status).toBe(404);
    expect((await client.get("/api/_test/clock")).status).toBe(404);
  });

  it("moves every service's now forward with the flag, and back with a reset", async () => {
    const client = await clocked.client();
    const before = Date.now();
    const moved = await client.post("/api/_test/clock", { advanceDays: 8 });
    expect(moved.status).toBe(200);
    expect(moved.body.offsetDays).toBe(8);
    expect(Date.parse(moved.body.now) - before).toBeGreaterThanOrEqual(8 * DAY_MS);
    expect(Date.parse(moved.body.now) - before).toBeLessThan(8 * DAY_MS + 60_000);

    // A service sees it: an admin's audit entry is stamped with the moved clock.
    const admin = await clocked.signedInClient("admin");
    const buyer = await clocked.createAccount("buyer");
    expect((await admin.post(`/api/v1/admin/users/${buyer.id}/suspend`, { reason: "Clock check for the test suite." })).status).toBe(200);
    const audit = await admin.get("/api/v1/admin/audit");
    expect(audit.status).toBe(200);
    const entry = (audit.body.entries as { action: string; createdAt: string }[]).find((e) => e.action.startsWith("account.suspend"));
    expect(entry).toBeDefined();
    expect(Date.parse(entry!.createdAt) - before).toBeGreaterThanOrEqual(8 * DAY_MS);

    const reset = await client.post("/api/_test/clock", { reset: true });
    expect(reset.body.offsetDays).toBe(0);
    expect(Math.abs(Date.parse(reset.body.now) - Date.now())).toBeLessThan(60_000);
  });

  it("answers 422 to a move backwards or a body it does not know", async () => {
    const client = await clocked.client();
    expect((await client.post("/api/_test/clock", { advanceDays: -1 })).status).toBe(422);
    expect((await client.post("/api/_test/clock", { days: 3 })).status).toBe(422);
  });

  it("cannot be switched on outside NODE_ENV=test (start, dev, production)", () => {
    const base = { SESSION_SECRET: "s".repeat(40), GRAINYARD_TEST_CLOCK: "1" };
    expect(() => loadConfig({ ...base, NODE_ENV: "production" })).toThrow(ConfigError);
    expect(() => loadConfig({ ...base, NODE_ENV: "development" })).toThrow(/GRAINYARD_TEST_CLOCK/);
    expect(() => loadConfig({ ...base })).toThrow(/GRAINYARD_TEST_CLOCK/);
    expect(loadConfig({ ...base, NODE_ENV: "test" }).testClock).toBe(true);
    expect(loadConfig({ SESSION_SECRET: "s".repeat(40), NODE_ENV: "test" }).testClock).toBe(false);
  });
});
