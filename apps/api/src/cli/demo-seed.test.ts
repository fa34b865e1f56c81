import { HeadObjectCommand } from "@aws-sdk/client-s3";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { createPhotoStorage } from "../integrations/storage.ts";
import { displayKey } from "../photos/photo-storage.ts";
import { createYardPageService } from "../services/yard-page-service.ts";
import { createTestDatabase } from "../test-support/test-context.ts";
import { describeSeed, seedDemo, type DemoSeedSummary } from "./demo-seed.ts";

/*
 * The living demo on the real stack: painted photos through the photo pipeline into the S3 fake,
 * sales through the checkout against the payments fake, reviews through the review service.
 */

let db: Awaited<ReturnType<typeof createTestDatabase>>;
let first: DemoSeedSummary;
let second: DemoSeedSummary;

const count = async (sql: string, parameters: unknown[] = []) =>
  Number(((await db.dataSource.query(sql, parameters)) as { n: string }[])[0]!.n);

/** Every table the seed writes, with its row count. */
async function tableCounts() {
  const tables = ["account", "yard_log", "slab", "moisture_reading", "listing", "listing_photo", "catalogue_entry", "buyer_order"];
  const more = ["order_review", "ledger_entry", "payout", "payout_account", "content_report", "listing_offer"];
  return Object.fromEntries(await Promise.all([...tables, ...more].map(async (t) => [t, await count(`SELECT COUNT(*) AS n FROM ${t}`)])));
}

beforeAll(async () => {
  db = await createTestDatabase();
  first = await seedDemo(db.dataSource, db.config);
  console.log(`first run: ${describeSeed(first)}`);
}, 600_000);
afterAll(async () => {
  await db?.drop();
});

describe("the living demo seed", () => {
  it("fills about ten yards with about eighty live listings across the species, each with a painted photo", async () => {
    expect(first.skipped).toEqual([]);
    const live = await count("SELECT COUNT(*) AS n FROM listing WHERE status = 'live'");
    expect(live).toBeGreaterThanOrEqual(75);
    expect(await count("SELECT COUNT(*) AS n FROM catalogue_entry")).toBe(live);
    expect(await count("SELECT COUNT(DISTINCT sawyer_id) AS n FROM listing WHERE status = 'live'")).toBeGreaterThanOrEqual(10);
    expect(await count("SELECT COUNT(DISTINCT species_slug) AS n FROM catalogue_entry")).toBeGreaterThanOrEqual(12);
    expect(await count("SELECT COUNT(DISTINCT set_kind) AS n FROM listing WHERE status = 'live'")).toBe(3);
    // Every listing a buyer can see (live or sold) has a photo, and its sizes are in storage.
    expect(
      await count(
        "SELECT COUNT(*) AS n FROM listing l WHERE l.status IN ('live', 'sold') AND NOT EXISTS (SELECT 1 FROM listing_photo p WHERE p.listing_id = l.id)",
      ),
    ).toBe(0);
    const photo = (
      (await db.dataSource.query("SELECT id, listing_id AS listingId FROM listing_photo LIMIT 1")) as { id: string; listingId: string }[]
    )[0]!;
    const storage = createPhotoStorage(db.config.storage);
    try {
      const head = await storage.client.send(
        new HeadObjectCommand({ Bucket: storage.bucket, Key: displayKey(photo.listingId, photo.id, "large") }),
      );
      expect(head.ContentType).toBe("image/webp");
    } finally {
      storage.close();
    }
  });

  it("has logs still drying in the yards, and sold orders with reviews whose money balances", async () => {
    // A log none of whose slabs is listed, its last reading above the fibre saturation range's lower end.
    const drying = await count(
      `SELECT COUNT(DISTINCT s.log_id) AS n FROM slab s
        WHERE s.last_moisture_pct > 20 AND NOT EXISTS (SELECT 1 FROM listing_slab ls WHERE ls.slab_id = s.id)`,
    );
    expect(drying).toBeGreaterThanOrEqual(3);
    expect(await count("SELECT COUNT(*) AS n FROM buyer_order WHERE status = 'completed'")).toBeGreaterThanOrEqual(10);
    expect(
      await count("SELECT COUNT(*) AS n FROM buyer_order WHERE status IN ('paid', 'ready_for_pickup', 'shipped', 'handed_over')"),
    ).toBeGreaterThan(0);
    expect(await count("SELECT COUNT(*) AS n FROM order_review")).toBe(first.reviews);
    expect(first.reviews).toBeGreaterThanOrEqual(10);
    // Reviews only of completed orders, one per order.
    expect(
      await count("SELECT COUNT(*) AS n FROM order_review r JOIN buyer_order o ON o.id = r.order_id WHERE o.status <> 'completed'"),
    ).toBe(0);
    expect(await count("SELECT COUNT(*) AS n FROM listing WHERE status = 'sold'")).toBe(
      await count(
        "SELECT COUNT(*) AS n FROM buyer_order WHERE status IN ('paid', 'ready_for_pickup', 'shipped', 'handed_over', 'completed')",
      ),
    );
    const totals = (await db.dataSource.query("SELECT currency, SUM(amount_minor) AS total FROM ledger_entry GROUP BY currency")) as {
      total: string;
    }[];
    expect(totals.length).toBeGreaterThan(0);
    for (const row of totals) expect(Number(row.total)).toBe(0);
    // The orders' days are in the past, spread over weeks.
    const spread = (
      (await db.dataSource.query("SELECT DATEDIFF(MAX(created_at), MIN(created_at)) AS days FROM buyer_order")) as { days: number }[]
    )[0]!;
    expect(Number(spread.days)).toBeGreaterThan(30);
  });

  it("has offers waiting in two yards: one with the sawyer, one countered, on listings that welcome offers", async () => {
    expect(first.offers).toBe(4);
    expect(await count("SELECT COUNT(*) AS n FROM listing_offer WHERE status = 'open'")).toBe(2);
    expect(await count("SELECT COUNT(*) AS n FROM listing_offer WHERE status = 'countered'")).toBe(2);
    expect(await count("SELECT COUNT(*) AS n FROM listing WHERE offers_welcome = 1 AND status = 'live'")).toBeGreaterThanOrEqual(7);
    // Every floor is below its price, and every offer above its listing's floor.
    expect(await count("SELECT COUNT(*) AS n FROM listing WHERE offer_floor_minor >= price_minor")).toBe(0);
    expect(
      await count(
        "SELECT COUNT(*) AS n FROM listing_offer o JOIN listing l ON l.id = o.listing_id WHERE o.amount_minor < l.offer_floor_minor",
      ),
    ).toBe(0);
  });

  it("gives each demo yard a public page with its sales and rating", async () => {
    const pages = createYardPageService({ dataSource: db.dataSource });
    const ridgeback = await pages.page("ridgeback-urban-timber");
    expect(ridgeback.yard.slabsSold).toBeGreaterThan(0);
    expect(ridgeback.yard.rating.count).toBeGreaterThan(0);
    expect(ridgeback.liveSlabs.length).toBeGreaterThan(3);
    expect(ridgeback.dryingLogs.length).toBeGreaterThan(0);
    const slugs = (await db.dataSource.query("SELECT yard_slug FROM account WHERE role = 'sawyer'")) as { yard_slug: string | null }[];
    expect(slugs.filter((row) => row.yard_slug)).toHaveLength(10);
  });

  it("adds nothing the second time", { timeout: 120_000 }, async () => {
    const before = await tableCounts();
    second = await seedDemo(db.dataSource, db.config);
    expect(second).toMatchObject({ accounts: 0, logs: 0, listings: 0, photos: 0, orders: 0, reviews: 0, payouts: 0, skipped: [] });
    expect(await tableCounts()).toEqual(before);
  });
});
