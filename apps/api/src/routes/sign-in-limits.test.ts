import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { createApp } from "../app.ts";
import { createDataSource } from "../db/data-source.ts";
import { createMailer } from "../integrations/mail.ts";
import { createPayments } from "../integrations/payments-stripe.ts";
import { createPhotoStorage } from "../integrations/storage.ts";
import { createLogger } from "../logger.ts";
import { browserClient, createTestContext, mailTo, type BrowserClient, type TestContext } from "../test-support/test-context.ts";

/**
 * Sign-in limits from several addresses: each client's connections leave from its own loopback
 * address (127.0.0.2, 127.0.0.3…), so the API tells them apart by the socket, as it would tell
 * apart two people on the internet (no forwarded-for header, no trust-proxy setting).
 */
const PER_PAIR = 3;
const SLOW_AFTER = 6;
const SLOWDOWN_MS = 300;

let ctx: TestContext;
beforeAll(async () => {
  ctx = await createTestContext({
    environment: {
      SIGN_IN_LIMIT_PER_ACCOUNT: String(PER_PAIR),
      SIGN_IN_LIMIT_PER_IP: "8",
      SIGN_IN_SLOW_AFTER: String(SLOW_AFTER),
      SIGN_IN_SLOWDOWN_MS: String(SLOWDOWN_MS),
    },
  });
});
afterAll(async () => ctx?.close());

let lastHost = 10;
/** A client on a loopback address no other test used. */
const freshAddress = () => `127.0.0.${++lastHost}`;
const from = (address: string) => ctx.client({ from: address });

const signIn = (client: BrowserClient, email: string, password: string) => client.post("/api/v1/session", { email, password });
async function timed<T>(call: () => Promise<T>): Promise<{ result: T; ms: number }> {
  const started = performance.now();
  const result = await call();
  return { result, ms: performance.now() - started };
}
const warnings = async (email: string) => (await mailTo(email)).filter((m) => /wrong passwords were tried/i.test(m.subject));

describe("sign-in limits that cannot be turned against the owner", () => {
  it("sees each client by its own address", async () => {
    const client = await from("127.0.0.2");
    expect((await signIn(client, "nobody-seen@lakemont.test", "wrong-password-x")).status).toBe(401);
    const keys = ((await ctx.dataSource.query("SELECT `key` FROM rate_limit WHERE `key` LIKE 'signin_ip:%'")) as { key: string }[]).map(
      (row) => row.key,
    );
    expect(keys).toEqual(["signin_ip:127.0.0.2"]);
  });

  it("throttles the attacker's address for that account, while the owner signs in from another address", async () => {
    const owner = await ctx.createAccount("sawyer");
    const attacker = await from(freshAddress());
    for (let i = 1; i <= PER_PAIR; i++) expect((await signIn(attacker, owner.email, `guess-${i}-password`)).status).toBe(401);
    const refused = await signIn(attacker, owner.email, "guess-x-password");
    expect(refused.status).toBe(429);
    expect(refused.body.error).toMatchObject({ code: "too_many_requests", message: expect.stringMatching(/try again in .*minutes/i) });
    expect(Number(refused.headers["retry-after"])).toBeGreaterThan(0);
    // Even a right guess from the attacker's address waits out the window.
    expect((await signIn(attacker, owner.email, owner.password)).status).toBe(429);

    // The owner, elsewhere: in at once, again and again.
    const home = await from(freshAddress());
    const res = await signIn(home, owner.email, owner.password);
    expect(res.status).toBe(200);
    expect(res.body.account.email).toBe(owner.email);
    expect((await home.get("/api/v1/yard")).status).toBe(200);
    // And a different account from the attacker's address is not blocked by this one.
    const other = await ctx.createAccount("buyer");
    expect((await signIn(attacker, other.email, other.password)).status).toBe(200);
  });

  it("slows a hammered account down instead of locking it, e-mails its owner once, and lets the owner in from a clean address", async () => {
    const owner = await ctx.createAccount("buyer");
    // The owner signed in from home before: that address is known to the account.
    const home = await from(freshAddress());
    expect((await signIn(home, owner.email, owner.password)).status).toBe(200);

    // Attackers on many addresses, each below its own per-pair limit, push the account past the slow-down point.
    const attackers = await Promise.all(Array.from({ length: SLOW_AFTER }, () => from(freshAddress())));
    for (const attacker of attackers) expect((await signIn(attacker, owner.email, "not-the-password")).status).toBe(401);

    // Every further try for the account now waits before its password is checked: 1×, then 2×, 4×, 8× the slow-down.
    const slowed = await timed(() => signIn(attackers[0]!, owner.email, "still-not-it-1"));
    expect(slowed.result.status).toBe(401);
    expect(slowed.ms).toBeGreaterThanOrEqual(SLOWDOWN_MS);
    const slower = await timed(() => signIn(attackers[1]!, owner.email, "still-not-it-2"));
    expect(slower.result.status).toBe(401);
    expect(slower.ms).toBeGreaterThanOrEqual(2 * SLOWDOWN_MS);

    // The owner is told once, however long the guessing goes on.
    await ctx.settled();
    const [warning, ...more] = await warnings(owner.email);
    expect(more).toHaveLength(0);
    expect(warning!.text).toMatch(/not locked/);
    expect(warning!.text).toContain(`${ctx.config.publicUrl}/forgot-password`);
    expect((await signIn(attackers[2]!, owner.email, "still-not-it-3")).status).toBe(401);
    await ctx.settled();
    expect(await warnings(owner.email)).toHaveLength(1);

    // The owner from a clean address still gets in (after the wait every try for the account has now).
    const cafe = await from(freshAddress());
    const clean = await timed(() => signIn(cafe, owner.email, owner.password));
    expect(clean.result.status).toBe(200);
    expect(clean.ms).toBeGreaterThanOrEqual(SLOWDOWN_MS);
    // From the address they signed in from before, without the wait (the wait is 8× the slow-down by now).
    const known = await timed(() => signIn(home, owner.email, owner.password));
    expect(known.result.status).toBe(200);
    expect(known.ms).toBeLessThan(4 * SLOWDOWN_MS);
  });

  it("limits failed sign-ins per address across accounts", async () => {
    const address = freshAddress();
    const client = await from(address);
    for (let i = 0; i < 8; i++) {
      const email = `nobody-${i}-${address}@lakemont.test`;
      expect((await signIn(client, email, "wrong-password-x")).status).toBe(401);
    }
    expect((await signIn(client, `nobody-9-${address}@lakemont.test`, "wrong-password-x")).status).toBe(429);
    // Another address is not touched.
    const account = await ctx.createAccount("buyer");
    expect((await signIn(await from(freshAddress()), account.email, account.password)).status).toBe(200);
  });

  it("counts in the database, so two API instances share the counts", async () => {
    // A second instance: its own app and connection pool on the same database, as a second process would have.
    const config = ctx.config;
    const dataSource = createDataSource(config.database);
    await dataSource.initialize();
    const mailer = createMailer(config.mail);
    const storage = createPhotoStorage(config.storage);
    const second = createApp({
      config,
      dataSource,
      mailer,
      storage,
      payments: createPayments(config.payments),
      logger: createLogger("silent"),
    });
    try {
      const owner = await ctx.createAccount("buyer");
      const address = freshAddress();
      const onFirst = await from(address);
      const onSecond = await browserClient(second, { from: address });
      expect((await signIn(onFirst, owner.email, "guess-one-password")).status).toBe(401);
      expect((await signIn(onSecond, owner.email, "guess-two-password")).status).toBe(401);
      expect((await signIn(onFirst, owner.email, "guess-three-password")).status).toBe(401);
      // The pair's limit is spent across both instances: either one refuses the next try.
      expect((await signIn(onSecond, owner.email, "guess-four-password")).status).toBe(429);
      expect((await signIn(onFirst, owner.email, owner.password)).status).toBe(429);
      const rows = (await ctx.dataSource.query("SELECT COUNT(*) AS n FROM rate_limit WHERE `key` LIKE 'signin_pair:%'")) as { n: string }[];
      expect(Number(rows[0]!.n)).toBeGreaterThan(0);
    } finally {
      await second.background.settled();
      mailer.close();
      storage.close();
      await dataSource.destroy();
    }
  });
});
