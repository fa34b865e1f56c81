import { randomUUID } from "node:crypto";
import { join } from "node:path";
import mysql from "mysql2/promise";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { balancerUrl, client, demoAdminSecret, instanceUrls, type Answer, type Client } from "./client.ts";

/**
 * Three API instances behind HAProxy on the test stack's app port, on one database with the
 * Lakemont demo data. Each instance names itself in `x-grainyard-instance`; tests count on which
 * instance answered, and go to one instance directly when the point is "through this one".
 */
const DEMO = {
  admin: { email: "desk@grainyard.test", password: "lakemont-desk-2026" },
  sawyer: { email: "yard@ridgeback-timber.test", password: "ridgeback-bandmill-2026" },
  buyer: { email: "shop@fernhill-furniture.test", password: "fernhill-benches-2026" },
};
const photo = join(import.meta.dirname, "../../apps/web/public/icons/icon-512.png");

let database: mysql.Connection;
let admin: Client;
let sawyer: Client;

beforeAll(async () => {
  database = await mysql.createConnection({
    host: process.env.DATABASE_HOST,
    port: Number(process.env.DATABASE_PORT),
    user: process.env.DATABASE_USER,
    password: process.env.DATABASE_PASSWORD,
    database: process.env.DATABASE_NAME,
  });
  admin = await client().signIn(DEMO.admin.email, DEMO.admin.password, undefined, demoAdminSecret());
  sawyer = await client().signIn(DEMO.sawyer.email, DEMO.sawyer.password);
});
afterAll(async () => database?.end());

const tally = (answers: Answer[], key: (a: Answer) => string | number) =>
  answers.reduce<Record<string, number>>((counts, a) => ((counts[key(a)] = (counts[key(a)] ?? 0) + 1), counts), {});

/** A live listing of one slab, made by the demo sawyer; approved through `approveAt` (HAProxy unless told). */
async function liveListing(title: string, rateMinor: number, approveAt = balancerUrl()): Promise<string> {
  const slab = await sawyer.post("/api/v1/yard/slabs", {
    speciesSlug: "black-cherry",
    lengthMm: 2440,
    thicknessMm: 51,
    widthStationsMm: [560, 540, 520],
    liveEdge: "both",
    surfacing: "flattened",
    dryingMethod: "kiln",
  });
  expect(slab.status, JSON.stringify(slab.body)).toBe(201);
  const slabId = (slab.body.slab as { id: string }).id;
  expect(
    (await sawyer.post(`/api/v1/yard/slabs/${slabId}/readings`, { readOn: "2026-01-10", moistureContentPct: 8, method: "pin_meter" }))
      .status,
  ).toBe(201);
  const made = await sawyer.post("/api/v1/yard/listings", {
    title,
    description: "",
    slabIds: [slabId],
    priceMode: "fixed",
    rateMinor,
    freight: true,
  });
  expect(made.status, JSON.stringify(made.body)).toBe(201);
  const id = (made.body.listing as { id: string }).id;
  const uploaded = await sawyer.photo(`/api/v1/yard/listings/${id}/photos?altText=${encodeURIComponent(`${title}, top face`)}`, photo);
  expect(uploaded.status, JSON.stringify(uploaded.body)).toBe(201);
  expect((await sawyer.post(`/api/v1/yard/listings/${id}/submit`)).status).toBe(200);
  const approved = await admin.post(`/api/v1/admin/listings/${id}/approve`, {}, approveAt);
  expect(approved.status, JSON.stringify(approved.body)).toBe(200);
  return id;
}

/** New buyer accounts, copies of the demo buyer (same password), each with an e-mail address of its own. */
async function copiesOfDemoBuyer(count: number, prefix: string): Promise<string[]> {
  const [row] = (await database.query("SELECT id FROM account WHERE email = ?", [DEMO.buyer.email])) as [{ id: string }[], unknown];
  const emails = Array.from({ length: count }, (_, i) => `${prefix}-${i}-${randomUUID().slice(0, 6)}@lakemont.test`);
  for (const email of emails) {
    await database.query("CREATE TEMPORARY TABLE buyer_copy AS SELECT * FROM account WHERE id = ?", [row[0]!.id]);
    await database.query("UPDATE buyer_copy SET id = ?, email = ?", [randomUUID(), email]);
    await database.query("INSERT INTO account SELECT * FROM buyer_copy");
    await database.query("DROP TEMPORARY TABLE buyer_copy");
  }
  return emails;
}

async function rows<T>(sql: string, values: unknown[] = []): Promise<T[]> {
  const [result] = (await database.query(sql, values)) as [T[], unknown];
  return result;
}

/** Polls `check` every 100 ms until it holds; fails naming `what` after `ms`. */
async function until(check: () => Promise<boolean>, what: string, ms = 20_000): Promise<void> {
  const deadline = Date.now() + ms;
  while (!(await check())) {
    if (Date.now() > deadline) throw new Error(`waited ${ms} ms for ${what}`);
    await new Promise((r) => setTimeout(r, 100));
  }
}

/** How many times a scheduled job has run, on any instance (its lease row counts the takes). */
const jobRuns = async (name: string) =>
  Number((await rows<{ runs: number }>("SELECT runs FROM job_lease WHERE job_name = ?", [name]))[0]?.runs ?? 0);

/** Waits until the job has run `times` more times across the instances (this suite's instances tick every job each second). */
async function afterJobRuns(name: string, times: number): Promise<void> {
  const from = await jobRuns(name);
  await until(async () => (await jobRuns(name)) >= from + times, `the ${name} job to run ${times} more times`);
}

describe("three instances behind HAProxy", () => {
  it("answers round robin, each instance naming itself", async () => {
    const answers = await Promise.all(Array.from({ length: 9 }, () => client().get("/api/health/serving")));
    expect(answers.map((a) => a.status)).toEqual(Array(9).fill(200));
    expect(Object.keys(tally(answers, (a) => a.instance)).sort()).toEqual(["api-1", "api-2", "api-3"]);
    // The header and the answer name the same instance.
    expect(answers.every((a) => a.body.instance === a.instance)).toBe(true);
  });

  it("limits 40 wrong passwords for one account from one address exactly as one instance does: 5 refused, then 35 held back", async () => {
    const attacker = await client({ from: "127.0.0.21" }).start();
    const answers: Answer[] = [];
    for (let i = 0; i < 40; i++) answers.push(await attacker.post("/api/v1/session", { email: DEMO.buyer.email, password: `guess-${i}` }));
    expect(tally(answers, (a) => a.status)).toEqual({ 401: 5, 429: 35 });
    // The tries went to every instance, so the count is shared: per instance it would be 15 refused.
    expect(Object.keys(tally(answers, (a) => a.instance)).sort()).toEqual(["api-1", "api-2", "api-3"]);
    // The owner, from another address, still gets in.
    await client({ from: "127.0.0.22" }).signIn(DEMO.buyer.email, DEMO.buyer.password);
  });

  it("limits 40 wrong sign-ins from one address across accounts exactly as one instance does: 30 refused, then 10 held back", async () => {
    const sprayer = await client({ from: "127.0.0.23" }).start();
    const answers: Answer[] = [];
    for (let i = 0; i < 40; i++)
      answers.push(await sprayer.post("/api/v1/session", { email: `nobody-${i}@lakemont.test`, password: "wrong-password-1" }));
    expect(tally(answers, (a) => a.status)).toEqual({ 401: 30, 429: 10 });
    expect(Object.keys(tally(answers, (a) => a.instance)).sort()).toEqual(["api-1", "api-2", "api-3"]);
  });

  it("a listing approved through one instance is in the catalogue of the other two within one second", async () => {
    const [first, ...others] = instanceUrls();
    const title = `Cherry run ${randomUUID().slice(0, 6)}`;
    const query = `/api/v1/catalogue?species=black-cherry&sort=newest`;
    // Each of the others keeps this answer (5 s) unless told of a change.
    for (const url of others) expect((await client().get(query, url!)).status).toBe(200);
    await liveListing(title, 2100, first);
    const approvedAt = Date.now();
    const seenAfter: number[] = [];
    for (const url of others) {
      for (;;) {
        const answer = await client().get(query, url!);
        if ((answer.body.results as { title: string }[]).some((card) => card.title === title)) break;
        if (Date.now() - approvedAt > 5_000) throw new Error(`${url} never showed the new listing`);
        await new Promise((r) => setTimeout(r, 25));
      }
      seenAfter.push(Date.now() - approvedAt);
    }
    process.stdout.write(`approved through ${first}; seen through the others after ${seenAfter.join(" ms and ")} ms\n`);
    expect(Math.max(...seenAfter)).toBeLessThan(1_000);
  });

  it("a checkout race of 51 buyers over the three instances makes exactly one order", async () => {
    const listingId = await liveListing(`Race top ${randomUUID().slice(0, 6)}`, 90_000);
    // 51 buyers, copies of the demo buyer (same password) with their own addresses.
    const emails = await copiesOfDemoBuyer(51, "racer");
    // Each buyer from an address of its own, as 51 people would be.
    const buyers = await Promise.all(emails.map((email, i) => client({ from: `127.0.1.${i + 1}` }).signIn(email, DEMO.buyer.password)));
    const answers = await Promise.all(buyers.map((buyer) => buyer.post(`/api/v1/listings/${listingId}/checkout`, { handover: "pickup" })));
    expect(tally(answers, (a) => a.status)).toEqual({ 201: 1, 409: 50 });
    expect(Object.keys(tally(answers, (a) => a.instance)).sort()).toEqual(["api-1", "api-2", "api-3"]);
    const [orders] = (await database.query("SELECT COUNT(*) AS n FROM buyer_order WHERE listing_id = ?", [listingId])) as [
      { n: number }[],
      unknown,
    ];
    expect(Number(orders[0]!.n)).toBe(1);
  });
});

describe("scheduled work on three instances", () => {
  it("three instances ticking the completion sweep each second complete each due order once: one completion and one e-mail to each party", async () => {
    const [email] = await copiesOfDemoBuyer(1, "sweep");
    const buyer = await client({ from: "127.0.2.1" }).signIn(email!, DEMO.buyer.password);
    const orderIds: string[] = [];
    for (let i = 0; i < 3; i++) {
      const listingId = await liveListing(`Sweep top ${i} ${randomUUID().slice(0, 6)}`, 40_000);
      const made = await buyer.post(`/api/v1/listings/${listingId}/checkout`, {
        handover: "freight",
        deliveryAddress: "Workshop 4, 12 Quarry Lane, Lakemont",
      });
      expect(made.status, JSON.stringify(made.body)).toBe(201);
      const orderId = (made.body.order as { id: string }).id;
      // The test card on the payments fake's hosted page; its webhook reaches the API through HAProxy.
      const page = new URL(made.body.checkoutUrl as string);
      const paid = await buyer.send(
        page.origin,
        "POST",
        page.pathname,
        Buffer.from("card=4242424242424242"),
        "application/x-www-form-urlencoded",
      );
      expect(paid.status).toBe(303);
      await until(async () => (await buyer.get(`/api/v1/orders/${orderId}`)).body.order?.status === "paid", `order ${orderId} to be paid`);
      const shipped = await sawyer.post(`/api/v1/orders/${orderId}/shipment`, {
        carrier: "Lakemont Freight Co-op",
        trackingReference: `LFC-${i}`,
      });
      expect(shipped.status, JSON.stringify(shipped.body)).toBe(200);
      expect((await sawyer.post(`/api/v1/orders/${orderId}/handed-over`, {})).status).toBe(200);
      orderIds.push(orderId);
    }
    // Handed over longer ago than the automatic completion waits: every instance's sweep now finds them due.
    await database.query("UPDATE buyer_order SET handed_over_at = NOW(3) - INTERVAL 30 DAY WHERE id IN (?)", [orderIds]);
    const holders = new Set<string>();
    await until(async () => {
      for (const { holder } of await rows<{ holder: string }>("SELECT holder FROM job_lease WHERE job_name = 'order-completion'"))
        holders.add(holder);
      const done = await rows<{ n: number }>("SELECT COUNT(*) AS n FROM buyer_order WHERE id IN (?) AND status = 'completed'", [orderIds]);
      return Number(done[0]!.n) === orderIds.length;
    }, "the sweeps to complete the three orders");
    // Later sweeps, on whichever instance holds the lease, find nothing more to do.
    await afterJobRuns("order-completion", 3);
    process.stdout.write(`order-completion lease held by ${[...holders].join(", ")} while the orders completed\n`);
    const completed = await rows<{ id: string; completed_by: string }>("SELECT id, completed_by FROM buyer_order WHERE id IN (?)", [
      orderIds,
    ]);
    expect(completed.map((order) => order.completed_by)).toEqual(["automatic", "automatic", "automatic"]);
    for (const orderId of orderIds) {
      const mails = await rows<{ recipient: string }>(
        "SELECT recipient FROM outbox_email WHERE kind = 'order_completed' AND text_body LIKE ? ORDER BY recipient",
        [`%/orders/${orderId}%`],
      );
      expect(mails.map((mail) => mail.recipient).sort()).toEqual([email!, DEMO.sawyer.email].sort());
    }
  }, 120_000);

  it("the alerts job sends each saved search's e-mail once, while an approval on another instance sends due alerts too", async () => {
    const [email] = await copiesOfDemoBuyer(1, "alerts");
    const buyer = await client({ from: "127.0.2.2" }).signIn(email!, DEMO.buyer.password);
    const tag = randomUUID().slice(0, 6);
    const names = Array.from({ length: 5 }, (_, i) => `Long cherry ${tag} ${i}`);
    const searchIds: string[] = [];
    for (const name of names) {
      const saved = await buyer.post("/api/v1/saved-searches", { name, query: "species=black-cherry&lengthMin=2400", alerts: true });
      expect(saved.status, JSON.stringify(saved.body)).toBe(201);
      searchIds.push((saved.body.savedSearch as { id: string }).id);
    }
    // As if each had sent an alert an hour ago: a new match waits for its day.
    await database.query("UPDATE saved_search SET last_alert_at = NOW(3) - INTERVAL 1 HOUR WHERE id IN (?)", [searchIds]);
    const firstTitle = `Alert cherry A ${tag}`;
    const first = await liveListing(firstTitle, 2000);
    const pendingOf = async (listingId: string) =>
      Number(
        (
          await rows<{ n: number }>("SELECT COUNT(*) AS n FROM saved_search_match WHERE listing_id = ? AND saved_search_id IN (?)", [
            listingId,
            searchIds,
          ])
        )[0]!.n,
      );
    await until(async () => (await pendingOf(first)) === 5, "the five matches of the first listing");
    const alertMails = () =>
      rows<{ text_body: string }>("SELECT text_body FROM outbox_email WHERE kind = 'saved_search_alert' AND recipient = ?", [email]);
    await afterJobRuns("saved-search-alerts", 2);
    expect(await alertMails()).toEqual([]);
    // The day is up for all five: the job (each second, on whichever instance holds its lease) and the
    // next approval's own sending, through the first instance, race for them.
    await database.query("UPDATE saved_search SET last_alert_at = NOW(3) - INTERVAL 2 DAY WHERE id IN (?)", [searchIds]);
    await liveListing(`Alert cherry B ${tag}`, 2000, instanceUrls()[0]);
    await until(async () => (await alertMails()).length >= 5, "five alert e-mails");
    await afterJobRuns("saved-search-alerts", 3);
    const mails = await alertMails();
    expect(mails).toHaveLength(5);
    // One per saved search, each naming the first listing.
    expect(names.map((name) => mails.filter((mail) => mail.text_body.includes(name)).length)).toEqual([1, 1, 1, 1, 1]);
    expect(mails.every((mail) => mail.text_body.includes(firstTitle))).toBe(true);
  }, 120_000);
});

/** Whether a process is still there (signal 0 checks without touching it). */
const alive = (pid: number) => {
  try {
    process.kill(pid, 0);
    return true;
  } catch {
    return false;
  }
};

describe("an instance killed and another stopped under load", () => {
  it("during 20 s of loopback load, SIGKILL on api-1 and SIGTERM on api-2 fail no GET and lose or double no write", async () => {
    // The runner passes the instances' process ids (it started them; this suite stops two of them).
    const pids = (process.env.INSTANCE_PIDS ?? "").split(",").map(Number);
    expect(pids).toHaveLength(3);
    const slab = await sawyer.post("/api/v1/yard/slabs", {
      speciesSlug: "white-oak",
      lengthMm: 2000,
      thicknessMm: 51,
      widthStationsMm: [500, 480],
      liveEdge: "one",
      surfacing: "rough_sawn",
      dryingMethod: "air",
    });
    expect(slab.status).toBe(201);
    const slabId = (slab.body.slab as { id: string }).id;
    const counts = { gets: 0, getFailures: [] as string[], writesAccepted: 0, writesFailed: [] as string[], instances: new Set<string>() };
    const started = Date.now();
    const until = started + 20_000;
    let round = 0;
    let written = 0;
    /** Each reading on a day of its own (from 1 January 2023). */
    const nextDay = () => new Date(Date.UTC(2023, 0, 1) + written++ * 86_400_000).toISOString().slice(0, 10);
    async function worker(index: number) {
      const reader = client();
      while (Date.now() < until) {
        round += 1;
        if (index === 0 || round % 4 === 0) {
          // A write: one moisture reading; each sent once (HAProxy never resends a POST an instance may have seen).
          const answer = await sawyer
            .post(`/api/v1/yard/slabs/${slabId}/readings`, { readOn: nextDay(), moistureContentPct: 9, method: "pin_meter" })
            .catch((error: Error) => ({ status: 0, instance: "", body: { text: error.message } }) as Answer);
          if (answer.status === 201) counts.writesAccepted += 1;
          else counts.writesFailed.push(`${answer.status} ${JSON.stringify(answer.body).slice(0, 120)}`);
        } else {
          const answer = await reader
            .get("/api/v1/catalogue?sort=price_low")
            .catch((error: Error) => ({ status: 0, instance: "", body: { text: error.message } }) as Answer);
          counts.gets += 1;
          counts.instances.add(answer.instance);
          if (answer.status !== 200) counts.getFailures.push(`${answer.status} at ${Date.now() - started} ms`);
        }
      }
    }
    const load = Promise.all(Array.from({ length: 8 }, (_, index) => worker(index)));
    await new Promise((r) => setTimeout(r, 5_000));
    process.kill(pids[0]!, "SIGKILL");
    await new Promise((r) => setTimeout(r, 5_000));
    process.kill(pids[1]!, "SIGTERM");
    await load;
    expect(alive(pids[0]!)).toBe(false);
    const [rows] = (await database.query("SELECT COUNT(*) AS n FROM moisture_reading WHERE slab_id = ?", [slabId])) as [
      { n: number }[],
      unknown,
    ];
    const stored = Number(rows[0]!.n);
    process.stdout.write(
      `failure test: ${counts.gets} GETs, ${counts.getFailures.length} failed${counts.getFailures.length ? ` (${counts.getFailures.join("; ")})` : ""}; ` +
        `${counts.writesAccepted} readings accepted, ${counts.writesFailed.length} refused${counts.writesFailed.length ? ` (${counts.writesFailed.join("; ")})` : ""}, ${stored} stored\n`,
    );
    expect(counts.getFailures).toEqual([]);
    // Every accepted reading is stored once; a refused one (its instance died with it) at most once.
    expect(stored).toBeGreaterThanOrEqual(counts.writesAccepted);
    expect(stored).toBeLessThanOrEqual(counts.writesAccepted + counts.writesFailed.length);
    // The one instance left answered the rest.
    expect((await client().get("/api/health")).instance).toBe("api-3");
  }, 60_000);
});
