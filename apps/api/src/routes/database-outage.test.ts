import { existsSync, mkdtempSync, readFileSync, rmSync } from "node:fs";
import type { Server } from "node:http";
import type { AddressInfo } from "node:net";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { liveListing } from "../test-support/live-listing.ts";
import {
  expectLedgerBalanced,
  listenForWebhooks,
  startPaymentsFake,
  until,
  type TestPaymentsFake,
} from "../test-support/payments-harness.ts";
import { createTestContext, stackEnvironment, type BrowserClient, type TestContext } from "../test-support/test-context.ts";
import { payOnHostedPage } from "../test-support/hosted-payment.ts";

/*
 * MariaDB killed under a bounded load, on the real stack: a MariaDB of this file's own (started with
 * the stack runner's own code, on the test port base + 35, data in a temporary folder) is killed
 * with SIGKILL by its process id while catalogue reads and a few writes go to the API over
 * loopback, then started again on the same data. While it is down every answer is a 503 with
 * Retry-After or a success the API could give without it (a cached catalogue page); never a 500.
 * Within 5 s of its return the API answers normally; no order is lost or doubled, and a payment
 * made on the provider's page during the outage arrives (the provider retries its webhook) once.
 * Nothing shared is stopped: the test stack's MariaDB serves the other suites throughout.
 */

interface PrivateMariadb {
  stop(): Promise<void>;
}
type StartMariadb = (options: { dir: string; port: number; appPassword: string }) => Promise<PrivateMariadb>;
const devstackMariadb = join(import.meta.dirname, "../../../../packages/devstack/src/mariadb.ts");

const APP_PASSWORD = "outage-test-2026";
let startMariadb: StartMariadb;
let dataDir: string;
let port: number;
let mariadb: PrivateMariadb | undefined;
let payments: TestPaymentsFake;
let ctx: TestContext;
let server: Server;
let base: string;
let sawyer: BrowserClient;
let admin: BrowserClient;

/** "atKill": on its way when MariaDB was killed (answered before or after it died). */
type Phase = "before" | "atKill" | "down" | "returning" | "after";
interface Answer {
  phase: Phase;
  path: string;
  status: number;
  retryAfter: string | null;
}

/** The private server's process id, from its pid file, checked against its command line (ours, not any other). */
function mariadbPid(): number {
  const pid = Number(readFileSync(join(dataDir, "mariadb.pid"), "utf8").trim());
  const commandLine = readFileSync(`/proc/${pid}/cmdline`, "utf8");
  if (!commandLine.includes(join(dataDir, "my.cnf"))) throw new Error(`pid ${pid} is not this test's MariaDB`);
  return pid;
}

const alive = (pid: number) => {
  try {
    process.kill(pid, 0);
    return true;
  } catch {
    return false;
  }
};

async function checkout(buyer: BrowserClient, listingId: string) {
  return buyer.post(`/api/v1/listings/${listingId}/checkout`, { handover: "pickup" });
}

const orderStatus = async (orderId: string) =>
  ((await ctx.dataSource.query("SELECT status FROM buyer_order WHERE id = ?", [orderId])) as { status: string }[])[0]?.status;

beforeAll(async () => {
  ({ startMariadb } = (await import(devstackMariadb)) as { startMariadb: StartMariadb });
  port = Number(stackEnvironment().DATABASE_PORT) + 30;
  dataDir = mkdtempSync(join(tmpdir(), "grainyard-outage-db-"));
  mariadb = await startMariadb({ dir: dataDir, port, appPassword: APP_PASSWORD });
  payments = await startPaymentsFake({
    secretKey: "sk_test_outage",
    webhookSecret: "whsec_outage_test",
    retryBaseMs: 100,
    maxAttempts: 12,
  });
  ctx = await createTestContext({
    environment: { ...payments.environment, DATABASE_PORT: String(port), DATABASE_PASSWORD: APP_PASSWORD, SIGN_IN_LIMIT_PER_IP: "1000" },
  });
  let webhookUrl: string;
  ({ server, webhookUrl } = await listenForWebhooks(ctx.app));
  payments.fake.webhooks.options.url = webhookUrl;
  base = `http://127.0.0.1:${(server.address() as AddressInfo).port}`;
  sawyer = await ctx.signedInClient("sawyer", { yardName: "Outage Hollow Slabs" });
  admin = await ctx.signedInClient("admin");
}, 90_000);

afterAll(async () => {
  await new Promise((r) => server?.close(r));
  await payments?.close();
  await ctx?.close().catch(() => undefined);
  await mariadb?.stop().catch(() => undefined);
  if (dataDir && existsSync(dataDir)) rmSync(dataDir, { recursive: true, force: true });
});

describe("MariaDB killed under load", () => {
  it("answers only 503 with Retry-After or cached successes while it is down, recovers within 5 s of its return, loses and doubles no order", async () => {
    const listings: string[] = [];
    for (const [index, species] of ["black-walnut", "white-oak", "black-cherry", "sugar-maple", "american-elm"].entries())
      listings.push(
        await liveListing(sawyer, admin, { title: `Outage slab ${index + 1}`, speciesSlug: species, rateMinor: 50_000 + index * 1_000 }),
      );
    const [paidA, paidB, payDuringOutage, writeDuringOutage, writeAtKill] = listings as [string, string, string, string, string];

    // Two orders paid before the outage, one waiting for its payment.
    const buyers = await Promise.all([1, 2, 3, 4, 5].map(() => ctx.signedInClient("buyer")));
    const paidOrders: string[] = [];
    for (const [buyer, listingId] of [
      [buyers[0]!, paidA],
      [buyers[1]!, paidB],
    ] as const) {
      const started = await checkout(buyer, listingId);
      expect(started.status).toBe(201);
      expect((await payOnHostedPage(started.body.checkoutUrl)).status).toBe(303);
      await until(async () => (await orderStatus(started.body.order.id)) === "paid");
      paidOrders.push(started.body.order.id);
    }
    const waiting = await checkout(buyers[2]!, payDuringOutage);
    expect(waiting.status).toBe(201);
    const waitingOrder = waiting.body.order.id as string;

    // The load: three clients reading the catalogue (repeated pages the cache may answer, and pages it
    // cannot: a price floor of its own each time), a slab page and the health check; bounded in count.
    const answers: Answer[] = [];
    let phase: Phase = "before";
    let running = true;
    let sequence = 0;
    const MAX_REQUESTS = 6_000;
    const readPaths = () => {
      sequence += 1;
      return [
        "/api/v1/catalogue",
        "/api/v1/catalogue?species=black-walnut",
        `/api/v1/catalogue/${paidA}`,
        `/api/v1/catalogue?priceMin=${100 + sequence}`,
        "/api/health",
      ][sequence % 5]!;
    };
    const worker = async () => {
      while (running && answers.length < MAX_REQUESTS) {
        const path = readPaths();
        const at = phase;
        // 0: no answer within 10 s (counted, and fails the test below).
        let status = 0;
        let retryAfter: string | null = null;
        try {
          const res = await fetch(`${base}${path}`, { signal: AbortSignal.timeout(10_000) });
          await res.arrayBuffer();
          status = res.status;
          retryAfter = res.headers.get("retry-after");
        } catch {
          // no answer: status stays 0
        }
        answers.push({ phase: at === "before" && phase !== "before" ? "atKill" : at, path, status, retryAfter });
        // Paced: a steady load, not a flood, on a machine other suites share.
        await new Promise((r) => setTimeout(r, 15));
      }
    };
    const load = Promise.all([worker(), worker(), worker()]);
    const count = (p: Phase) => answers.filter((a) => a.phase === p).length;
    await until(async () => count("before") >= 60, 30_000);

    // Kill it (SIGKILL, by pid) while a checkout is on its way.
    const pid = mariadbPid();
    const raceCheckout = checkout(buyers[4]!, writeAtKill);
    process.kill(pid, "SIGKILL");
    phase = "down";
    const killedAt = Date.now();
    await until(async () => !alive(pid), 10_000);
    const raced = await raceCheckout;
    expect([201, 503]).toContain(raced.status);

    // Writes while it is down: a new checkout, a sawyer's new slab, and a payment on the provider's page.
    const writes = [
      await checkout(buyers[3]!, writeDuringOutage),
      await sawyer.post("/api/v1/yard/slabs", {
        speciesSlug: "white-oak",
        lengthMm: 2000,
        thicknessMm: 50,
        widthStationsMm: [500],
        liveEdge: "both",
        surfacing: "flattened",
        dryingMethod: "kiln",
      }),
    ];
    for (const write of writes) {
      expect(write.status).toBe(503);
      expect(write.headers["retry-after"]).toBeTruthy();
      expect(write.body.error.message).toMatch(/database/i);
    }
    expect((await payOnHostedPage(waiting.body.checkoutUrl)).status).toBe(303);
    const webhookAnswersBefore = payments.fake.webhooks.attempts.length;
    await until(async () => payments.fake.webhooks.attempts.length > webhookAnswersBefore, 10_000);
    await until(async () => count("down") >= 150 && answers.some((a) => a.phase === "down" && a.status === 503), 60_000);
    const downFor = Date.now() - killedAt;

    // Back on the same data (InnoDB recovers what was committed).
    phase = "returning";
    mariadb = await startMariadb({ dir: dataDir, port, appPassword: APP_PASSWORD });
    const returnedAt = Date.now();
    const signedIn = buyers[0]!;
    let probe = 0;
    await until(async () => {
      probe += 1;
      const [health, orders, search] = await Promise.all([
        fetch(`${base}/api/health`),
        signedIn.get("/api/v1/orders"),
        fetch(`${base}/api/v1/catalogue?priceMin=${900_000 + probe}`),
      ]);
      return health.status === 200 && orders.status === 200 && search.status === 200;
    }, 30_000);
    const recoveryMs = Date.now() - returnedAt;
    phase = "after";
    await until(async () => count("after") >= 60, 30_000);
    running = false;
    await load;

    // The payment made during the outage arrives once the provider's retry finds the database back.
    await until(async () => (await orderStatus(waitingOrder)) === "paid", 60_000);
    // The writes refused during the outage succeed when tried again; the raced one is there once at most.
    const retried = await checkout(buyers[3]!, writeDuringOutage);
    expect(retried.status).toBe(201);
    // The raced checkout: answered, its order is there; refused, trying again either buys (nothing had
    // committed) or finds the hold it had committed before the kill (409; the reservation sweep releases it).
    let racedRetry: number | null = null;
    if (raced.status === 503) {
      racedRetry = (await checkout(buyers[4]!, writeAtKill)).status;
      expect([201, 409]).toContain(racedRetry);
    } else expect(await orderStatus(raced.body.order.id)).toBe("awaiting_payment");

    // No order lost or doubled: one per listing, the paid ones still paid, one sale each in the ledger.
    const perListing = (await ctx.dataSource.query("SELECT listing_id, COUNT(*) AS n FROM buyer_order GROUP BY listing_id")) as {
      listing_id: string;
      n: number | string;
    }[];
    expect(Object.fromEntries(perListing.map((row) => [row.listing_id, Number(row.n)]))).toEqual(
      Object.fromEntries(listings.map((id) => [id, 1])),
    );
    for (const orderId of paidOrders) expect(await orderStatus(orderId)).toBe("paid");
    const ledgerRows = async (orderId: string) =>
      Number(
        ((await ctx.dataSource.query("SELECT COUNT(*) AS n FROM ledger_entry WHERE order_id = ?", [orderId])) as { n: string }[])[0]!.n,
      );
    expect(await ledgerRows(paidOrders[0]!)).toBeGreaterThan(0);
    expect(await ledgerRows(waitingOrder)).toBe(await ledgerRows(paidOrders[0]!));
    await expectLedgerBalanced(ctx.dataSource);

    // What was answered: never a 500, never no answer; while down, 503 with Retry-After or a success without the database.
    const down = answers.filter((a) => a.phase === "down");
    const outage = answers.filter((a) => a.phase === "atKill" || a.phase === "down" || a.phase === "returning");
    const statuses = (list: Answer[]) => [...new Set(list.map((a) => a.status))].sort();
    expect(answers.filter((a) => a.status >= 500 && a.status !== 503)).toEqual([]);
    expect(answers.filter((a) => a.status === 0)).toEqual([]);
    expect(statuses(outage).every((s) => s === 503 || s === 200)).toBe(true);
    expect(outage.filter((a) => a.status === 503 && a.path !== "/api/health" && !a.retryAfter)).toEqual([]);
    // The pages the cache cannot answer were refused, not answered from nowhere.
    expect(down.filter((a) => a.path.startsWith("/api/v1/catalogue?priceMin=") && a.status === 200)).toEqual([]);
    expect(down.filter((a) => a.path === "/api/health").every((a) => a.status === 503)).toBe(true);
    expect(answers.filter((a) => (a.phase === "before" || a.phase === "after") && a.status !== 200)).toEqual([]);
    const webhookStatuses = [...new Set(payments.fake.webhooks.attempts.map((a) => a.status))];
    expect(webhookStatuses.filter((s) => s !== 200 && s !== 503)).toEqual([]);
    expect(recoveryMs).toBeLessThan(5_000);

    process.stdout.write(
      [
        `database outage: ${answers.length} requests (${count("before")} before, ${down.length} while down for ${(downFor / 1000).toFixed(1)} s, ` +
          `${count("atKill")} on their way at the kill, ${count("returning")} while it came back, ${count("after")} after)`,
        `  while down: ${down.filter((a) => a.status === 503).length} answered 503 (with Retry-After, except the ` +
          `${down.filter((a) => a.path === "/api/health").length} health checks, which name the database as down), ` +
          `${down.filter((a) => a.status === 200).length} successes from the catalogue cache, 0 answered 500`,
        `  writes while down: ${writes.length} refused 503; the checkout raced with the kill: ${raced.status}${racedRetry ? ` (tried again: ${racedRetry})` : ""}; ` +
          `the provider's webhook tries: ${payments.fake.webhooks.attempts.filter((a) => a.status === 503).length} answered 503, ` +
          `${payments.fake.webhooks.attempts.filter((a) => a.status === 200).length} answered 200`,
        `  answering normally ${recoveryMs} ms after MariaDB was back; orders: ${perListing.length} listings with exactly one order each`,
        "",
      ].join("\n"),
    );
  }, 180_000);
});
