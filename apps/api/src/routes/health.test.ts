import { connect, createServer, type AddressInfo, type Socket } from "node:net";
import { hostname } from "node:os";
import { setTimeout as sleep } from "node:timers/promises";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import request from "supertest";
import { createTestContext, stackEnvironment, type TestContext } from "../test-support/test-context.ts";

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
    expect(res.body).toEqual({
      status: "degraded",
      components: { database: "up", storage: "down", mail: "down", payments: "down" },
      message: "Down just now: photo storage, outgoing mail (e-mails wait in the outbox), card payments.",
    });
  });
});

describe("instance name", () => {
  it("names the answering instance on every answer, API, error and page alike", async () => {
    const named = await createTestContext({ environment: { GRAINYARD_INSTANCE: "api-2" } });
    try {
      for (const path of ["/api/health", "/api/v1/no-such-thing", "/robots.txt", "/"]) {
        const res = await request(named.app).get(path);
        expect(res.headers["x-grainyard-instance"], path).toBe("api-2");
      }
    } finally {
      await named.close();
    }
    // Unnamed, it is the machine and the process.
    const res = await request(healthy.app).get("/api/health");
    expect(res.headers["x-grainyard-instance"]).toBe(`${hostname()}-${process.pid}`);
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

/**
 * A TCP relay between the API and the test stack's MariaDB: cutting it is the database going
 * away for this API alone (the shared MariaDB keeps running), and reopening it on the same port is
 * the database coming back.
 */
async function databaseRelay(host: string, port: number) {
  const sockets = new Set<Socket>();
  const server = createServer((client) => {
    const upstream = connect(port, host);
    for (const socket of [client, upstream]) {
      sockets.add(socket);
      socket.on("close", () => sockets.delete(socket));
      socket.on("error", () => socket.destroy());
    }
    client.pipe(upstream).pipe(client);
  });
  await new Promise<void>((resolve) => server.listen(0, "127.0.0.1", resolve));
  const relayPort = (server.address() as AddressInfo).port;
  return {
    port: relayPort,
    /** Refuses new connections and drops the open ones. */
    async cut() {
      const closed = new Promise<void>((resolve) => server.close(() => resolve()));
      for (const socket of sockets) socket.destroy();
      await closed;
    },
    async restore() {
      await new Promise<void>((resolve) => server.listen(relayPort, "127.0.0.1", resolve));
    },
  };
}

describe("/api/health with the database down", () => {
  it("answers 503 naming the database, never 500, for 15 s; other routes answer 503 too; all is well once it is back", async () => {
    const stack = stackEnvironment();
    const relay = await databaseRelay(stack.DATABASE_HOST ?? "127.0.0.1", Number(stack.DATABASE_PORT));
    const ctx = await createTestContext({ environment: { DATABASE_PORT: String(relay.port) } });
    try {
      expect((await request(ctx.app).get("/api/health")).status).toBe(200);
      const signedIn = await ctx.signedInClient("buyer");
      await relay.cut();
      const seen = new Map<number, number>();
      const started = Date.now();
      // 15 s of asking, paced at 4 a second: past the settings refresh (5 s) and the pool's reconnect attempts.
      while (Date.now() - started < 15_000) {
        const health = await request(ctx.app).get("/api/health");
        seen.set(health.status, (seen.get(health.status) ?? 0) + 1);
        expect(health.status).toBe(503);
        expect(health.body.components.database).toBe("down");
        // The load balancer's check of the instance itself stays up: every instance shares the database.
        const serving = await request(ctx.app).get("/api/health/serving");
        expect(serving.status).toBe(200);
        expect(serving.body).toEqual({ instance: ctx.config.instanceName, serving: true });
        // A signed-in page needs the acting user from the database: 503 with a plain message, not 500.
        const page = await signedIn.get("/api/v1/session");
        expect(page.status).toBe(503);
        expect(page.body.error.code).toBe("unavailable");
        expect(page.body.error.message).toMatch(/database/);
        expect(page.headers["retry-after"]).toBe("10");
        expect(JSON.stringify(page.body)).not.toMatch(/ECONN|127\.0\.0\.1|SELECT|mysql|at .*\.ts/i);
        await sleep(250);
      }
      expect([...seen.keys()]).toEqual([503]);
      // Asked again and again through the whole 15 s (fewer times on a busy machine: each round trip is slower).
      expect(seen.get(503)).toBeGreaterThanOrEqual(5);
      await relay.restore();
      await expect.poll(async () => (await request(ctx.app).get("/api/health")).status, { timeout: 15_000 }).toBe(200);
      expect((await signedIn.get("/api/v1/session")).body.account.email).toBe(signedIn.account.email);
    } finally {
      await relay.restore().catch(() => undefined);
      await ctx.close();
    }
  }, 60_000);
});
