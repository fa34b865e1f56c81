import { describe, expect, it } from "vitest";
import { ConfigError, loadConfig } from "./config.ts";

const base = { SESSION_SECRET: "s".repeat(40) };

describe("configuration", () => {
  it("refuses bcrypt cost below 12 outside tests", () => {
    expect(() => loadConfig({ ...base, NODE_ENV: "production", BCRYPT_COST: "10" })).toThrow(ConfigError);
    expect(() => loadConfig({ ...base, NODE_ENV: "development", BCRYPT_COST: "4" })).toThrow(/BCRYPT_COST/);
    expect(loadConfig({ ...base, NODE_ENV: "test", BCRYPT_COST: "4" }).bcryptCost).toBe(4);
    expect(loadConfig({ ...base, NODE_ENV: "production" }).bcryptCost).toBe(12);
  });

  it("names the instance from GRAINYARD_INSTANCE, refusing names unfit for a header", () => {
    expect(loadConfig({ ...base, GRAINYARD_INSTANCE: "api-3" }).instanceName).toBe("api-3");
    expect(loadConfig(base).instanceName).toMatch(new RegExp(`-${process.pid}$`));
    expect(() => loadConfig({ ...base, GRAINYARD_INSTANCE: "api 3\r\nset-cookie: x" })).toThrow(/GRAINYARD_INSTANCE/);
  });

  it("needs a session secret of at least 32 characters", () => {
    expect(() => loadConfig({ SESSION_SECRET: "short" })).toThrow(/SESSION_SECRET/);
  });

  it("reads the stack endpoints from the environment", () => {
    const config = loadConfig({
      ...base,
      DATABASE_PORT: "5085",
      S3_ENDPOINT: "http://127.0.0.1:5083",
      PAYMENTS_PROTOCOL: "http",
      PAYMENTS_PORT: "5082",
    });
    expect(config.database.port).toBe(5085);
    expect(config.storage.endpoint).toBe("http://127.0.0.1:5083");
    expect(config.payments).toMatchObject({ protocol: "http", port: 5082 });
  });

  it("reads the days after hand-over before an order completes by itself (14 unless told)", () => {
    expect(loadConfig(base).checkout.autoCompleteDays).toBe(14);
    expect(loadConfig({ ...base, AUTO_COMPLETE_DAYS: "7" }).checkout.autoCompleteDays).toBe(7);
    expect(() => loadConfig({ ...base, AUTO_COMPLETE_DAYS: "0" })).toThrow(/AUTO_COMPLETE_DAYS/);
  });

  it("lets only tests run every scheduled job on one short period (JOB_EVERY_SECONDS)", () => {
    expect(loadConfig(base).jobEveryMs).toBeNull();
    expect(loadConfig({ ...base, NODE_ENV: "test", JOB_EVERY_SECONDS: "1" }).jobEveryMs).toBe(1000);
    expect(() => loadConfig({ ...base, NODE_ENV: "production", JOB_EVERY_SECONDS: "1" })).toThrow(/JOB_EVERY_SECONDS/);
    expect(() => loadConfig({ ...base, NODE_ENV: "test", JOB_EVERY_SECONDS: "0" })).toThrow(/JOB_EVERY_SECONDS/);
  });
});
