import request from "supertest";
import type { DataSource } from "typeorm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { createApp } from "../app.ts";
import { createDataSource } from "../db/data-source.ts";
import { createMailer } from "../integrations/mail.ts";
import { createPayments } from "../integrations/payments-stripe.ts";
import { createPhotoStorage } from "../integrations/storage.ts";
import { createLogger } from "../logger.ts";
import { liveListing } from "../test-support/live-listing.ts";
import { createTestContext, type BrowserClient, type TestContext } from "../test-support/test-context.ts";
import { INVALIDATION_POLL_MS } from "./shared-invalidation.ts";

/**
 * Two API instances on one database, each with its own connection pool and caches: changes made
 * through the first reach the second's catalogue answers and yard positions within one second,
 * while a kept answer would otherwise last 5 s and the positions 30 s.
 */
let ctx: TestContext;
let second: ReturnType<typeof createApp>;
let secondDataSource: DataSource;
let admin: BrowserClient;
let sawyer: Awaited<ReturnType<TestContext["signedInClient"]>>;
const closers: (() => void)[] = [];

beforeAll(async () => {
  ctx = await createTestContext();
  secondDataSource = createDataSource(ctx.config.database);
  await secondDataSource.initialize();
  const mailer = createMailer(ctx.config.mail);
  const storage = createPhotoStorage(ctx.config.storage);
  closers.push(
    () => mailer.close(),
    () => storage.close(),
  );
  second = createApp({
    config: ctx.config,
    dataSource: secondDataSource,
    mailer,
    storage,
    payments: createPayments(ctx.config.payments),
    logger: createLogger("silent"),
  });
  ctx.app.catalogueVersion.start();
  second.catalogueVersion.start();
  admin = await ctx.signedInClient("admin");
  sawyer = await ctx.signedInClient("sawyer");
  expect((await sawyer.patch(`/api/v1/yards/${sawyer.account.id}`, { pickupTown: "Lakemont" })).status).toBe(200);
}, 60_000);

afterAll(async () => {
  await ctx.app.catalogueVersion.stop();
  await second?.catalogueVersion.stop();
  await secondDataSource?.destroy();
  for (const close of closers) close();
  await ctx?.close();
});

const titlesThrough = async (app: typeof second, query: string) => {
  const res = await request(app).get(`/api/v1/catalogue?${query}`).expect(200);
  return (res.body.results as { title: string }[]).map((r) => r.title);
};

/** Asks the second instance until `seen` holds; returns how long after `since` that was (ms), or fails after 5 s. */
async function millisecondsUntil(since: number, seen: () => Promise<boolean>): Promise<number> {
  while (Date.now() - since < 5_000) {
    if (await seen()) return Date.now() - since;
    await new Promise((r) => setTimeout(r, 20));
  }
  throw new Error("the change never reached the second instance within 5 s");
}

describe("shared invalidation across instances", () => {
  it("a listing approved through one instance is in the other's kept catalogue answer within one second", async () => {
    const query = "species=black-cherry&sort=newest";
    // The second instance keeps this (empty) answer for 5 s unless it hears of a change.
    expect(await titlesThrough(second, query)).toEqual([]);
    expect(await titlesThrough(second, query)).toEqual([]);
    await liveListing(sawyer, admin, { title: "Cherry bench top", speciesSlug: "black-cherry", rateMinor: 1800 });
    const approvedAt = Date.now();
    const elapsed = await millisecondsUntil(approvedAt, async () => (await titlesThrough(second, query)).includes("Cherry bench top"));
    process.stdout.write(
      `listing approved through instance 1 seen through instance 2 after ${elapsed} ms (poll every ${INVALIDATION_POLL_MS} ms)` + "\n",
    );
    expect(elapsed).toBeLessThan(1_000);
  });

  it("a yard that moves through one instance is placed anew by the other's nearest search within one second", async () => {
    await liveListing(sawyer, admin, { title: "Walnut slab", speciesSlug: "black-walnut", rateMinor: 2500 });
    // Both queries are read once so the second instance holds the yards' positions (kept 30 s).
    expect(await titlesThrough(second, "species=black-walnut&near=Lakemont&radiusKm=5")).toEqual(["Walnut slab"]);
    // Cedar Hollow is about 20 km from Lakemont.
    expect((await sawyer.patch(`/api/v1/yards/${sawyer.account.id}`, { pickupTown: "Cedar Hollow" })).status).toBe(200);
    const movedAt = Date.now();
    // A query string the second instance never answered: only the yards' positions can keep the old place.
    let round = 0;
    const elapsed = await millisecondsUntil(
      movedAt,
      async () => (await titlesThrough(second, `species=black-walnut&near=Lakemont&radiusKm=${6 + (round++ % 40) / 10}`)).length === 0,
    );
    process.stdout.write(`yard moved through instance 1, placed anew by instance 2 after ${elapsed} ms` + "\n");
    expect(elapsed).toBeLessThan(1_000);
  });

  it("without a poll, the second instance keeps its answer: the shared version is what carries the change", async () => {
    await second.catalogueVersion.stop();
    const query = "species=white-oak";
    expect(await titlesThrough(second, query)).toEqual([]);
    await liveListing(sawyer, admin, { title: "Oak shelf", speciesSlug: "white-oak", rateMinor: 1200 });
    // The first instance dropped its own copy at once.
    expect(await titlesThrough(ctx.app, query)).toEqual(["Oak shelf"]);
    expect(await titlesThrough(second, query)).toEqual([]);
    // One poll reads the moved version and clears the kept answer.
    await second.catalogueVersion.poll();
    expect(await titlesThrough(second, query)).toEqual(["Oak shelf"]);
  });
});
