import mysql from "mysql2/promise";
import request from "supertest";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { liveListing } from "../test-support/live-listing.ts";
import { until } from "../test-support/payments-harness.ts";
import { createTestContext, type BrowserClient, type TestContext } from "../test-support/test-context.ts";

/**
 * The catalogue on a MariaDB read replica (npm test's `replica` suite): a primary with a binary log
 * and a replica following it by GTID, started for this suite alone. The replica's SQL thread is
 * paused to hold a change back, which shows what reads where: the catalogue search and a visitor's
 * slab page keep the replica's older rows, a sawyer's own pages read the primary at once, and the
 * catalogue shows the change once the replica has applied it.
 */
function required(name: string): string {
  const value = process.env[name];
  if (!value) throw new Error(`${name} is not set: this suite runs inside \`npm test\`, which starts the primary and the replica.`);
  return value;
}

let ctx: TestContext;
let admin: BrowserClient;
let sawyer: Awaited<ReturnType<TestContext["signedInClient"]>>;
/** Watches, pauses and resumes replication on the replica, and finally shuts it down. */
let control: mysql.Connection;
/** The app's own account, straight to the primary and to the replica. */
let onPrimary: mysql.Connection;
let onReplica: mysql.Connection;

const replicaPort = () => Number(required("DATABASE_REPLICA_PORT"));

beforeAll(async () => {
  ctx = await createTestContext();
  expect(ctx.config.database.replica).toEqual({ host: "127.0.0.1", port: replicaPort() });
  const app = { host: "127.0.0.1", user: ctx.config.database.user, password: ctx.config.database.password };
  control = await mysql.createConnection({
    host: "127.0.0.1",
    port: replicaPort(),
    user: required("REPLICA_CONTROL_USER"),
    password: required("REPLICA_CONTROL_PASSWORD"),
  });
  onPrimary = await mysql.createConnection({ ...app, port: ctx.config.database.port, database: ctx.config.database.database });
  await caughtUp(); // the new database and its migrations reach the replica
  onReplica = await mysql.createConnection({ ...app, port: replicaPort(), database: ctx.config.database.database });
  admin = await ctx.signedInClient("admin");
  sawyer = await ctx.signedInClient("sawyer");
  expect((await sawyer.patch(`/api/v1/yards/${sawyer.account.id}`, { pickupTown: "Lakemont" })).status).toBe(200);
}, 60_000);

afterAll(async () => {
  await onReplica?.end().catch(() => undefined);
  await onPrimary?.end();
  await control?.end().catch(() => undefined);
  await ctx?.close();
});

/** Waits until the replica has applied everything the primary has written so far. */
async function caughtUp(): Promise<void> {
  const [[primary]] = (await onPrimary.query("SELECT @@GLOBAL.gtid_binlog_pos AS position")) as unknown as [{ position: string }[]];
  const [[waited]] = (await control.query("SELECT MASTER_GTID_WAIT(?, 20) AS outcome", [primary!.position])) as unknown as [
    { outcome: number }[],
  ];
  expect(waited!.outcome).toBe(0); // 0: reached; -1: timed out
}

const pauseReplication = () => control.query("STOP SLAVE SQL_THREAD");
const resumeReplication = () => control.query("START SLAVE SQL_THREAD");

const search = async (query = "species=black-walnut&sort=newest") => {
  const res = await request(ctx.app).get(`/api/v1/catalogue?${query}`).expect(200);
  return (res.body.results as { listingId: string; title: string }[]).map((card) => card.title);
};
const statusOnPrimary = async (listingId: string) =>
  ((await onPrimary.query("SELECT status FROM listing WHERE id = ?", [listingId])) as unknown as [{ status: string }[]])[0][0]?.status;
const statusOnReplica = async (listingId: string) =>
  ((await onReplica.query("SELECT status FROM listing WHERE id = ?", [listingId])) as unknown as [{ status: string }[]])[0][0]?.status;

describe("the catalogue on a read replica", () => {
  let listingId: string;

  it("shows a listing approved on the primary only once the replica has applied it; the sawyer sees it live at once", async () => {
    expect(await search()).toEqual([]);
    await pauseReplication();
    // Every one of these writes succeeds, so none went to the replica (it is read-only to the app's account).
    listingId = await liveListing(sawyer, admin, { title: "Replicated walnut top", speciesSlug: "black-walnut", rateMinor: 2400 });
    expect(await statusOnPrimary(listingId)).toBe("live");
    expect(await statusOnReplica(listingId)).toBeUndefined(); // made after the pause: not on the replica at all

    // The sawyer's own listing reads the primary: live now.
    expect((await sawyer.get(`/api/v1/yard/listings/${listingId}`).expect(200)).body.listing.status).toBe("live");
    // The catalogue reads the replica, which has not applied the approval yet: not there, even after a version poll.
    await ctx.app.catalogueVersion.poll();
    expect(await search()).toEqual([]);

    await resumeReplication();
    // What each instance's timer does every half second: read the version row on the replica, clear when it moved.
    await until(async () => {
      await ctx.app.catalogueVersion.poll();
      return (await search()).includes("Replicated walnut top");
    }, 10_000);
  });

  it("keeps a sawyer's withdrawal from visitors until it replicates, then drops the kept answer", async () => {
    await caughtUp();
    await ctx.app.catalogueVersion.poll(); // the approval's version, as read on the replica
    await pauseReplication();
    expect((await sawyer.post(`/api/v1/yard/listings/${listingId}/withdraw`)).status).toBe(200);
    expect(await statusOnPrimary(listingId)).toBe("withdrawn");

    // Their own pages (the listing, and the slab page signed in) read the primary: withdrawn at once.
    expect((await sawyer.get(`/api/v1/yard/listings/${listingId}`).expect(200)).body.listing.status).toBe("withdrawn");
    expect((await sawyer.get(`/api/v1/catalogue/${listingId}`).expect(200)).body.listing.status).toBe("withdrawn");
    // A visitor's slab page and the search read the replica: still live, and the search's answer is kept again
    // (the withdrawal cleared the cache at its commit, before the replica had it).
    expect((await request(ctx.app).get(`/api/v1/catalogue/${listingId}`).expect(200)).body.listing.status).toBe("live");
    await ctx.app.catalogueVersion.poll(); // the version row has not replicated either: nothing to clear
    expect(await search()).toEqual(["Replicated walnut top"]);

    await resumeReplication();
    await caughtUp();
    expect(await statusOnReplica(listingId)).toBe("withdrawn");
    // Replicated now, but what was kept from the replica's older rows is still kept: another sort reads its page
    // afresh (no card), while the count kept for these filters (30 s) still says one...
    const otherSort = async () => (await request(ctx.app).get("/api/v1/catalogue?species=black-walnut&sort=price_high").expect(200)).body;
    expect(await otherSort()).toMatchObject({ total: 1, results: [] });
    // ...until the version row, which replicates after the change it announces, is seen on the replica.
    await ctx.app.catalogueVersion.poll();
    expect(await otherSort()).toMatchObject({ total: 0, results: [] });
    expect(await search()).toEqual([]);
    await request(ctx.app).get(`/api/v1/catalogue/${listingId}`).expect(404);
  });

  it("refuses any write by the app's account on the replica (read_only)", async () => {
    await expect(onReplica.query("UPDATE listing SET title = 'Written on the replica' WHERE id = ?", [listingId])).rejects.toMatchObject({
      errno: 1290, // ER_OPTION_PREVENTS_STATEMENT: the server runs with --read-only
    });
    await expect(onReplica.query("DELETE FROM cache_version")).rejects.toMatchObject({ errno: 1290 });
  });

  it("falls back to the primary with a logged warning when the replica stops", async () => {
    // A second live listing, replicated, so the answers below differ from an empty catalogue.
    await liveListing(sawyer, admin, { title: "Walnut after the replica", speciesSlug: "black-walnut", rateMinor: 2100 });
    await caughtUp();
    await ctx.app.catalogueVersion.poll();
    expect(await search()).toEqual(["Walnut after the replica"]);
    await control.query("SHUTDOWN");
    await onReplica.end().catch(() => undefined);

    const yardSlug = (
      (await onPrimary.query("SELECT yard_slug FROM account WHERE id = ?", [sawyer.account.id])) as unknown as [{ yard_slug: string }[]]
    )[0][0]!.yard_slug;
    // Not cached: another query string, so the search really reads (from the primary now).
    expect(await search("species=black-walnut&sort=price_low")).toEqual(["Walnut after the replica"]);
    const yardPage = await request(ctx.app).get(`/api/v1/yard-pages/${yardSlug}`).expect(200);
    expect((yardPage.body.liveSlabs as { title: string }[]).map((card) => card.title)).toEqual(["Walnut after the replica"]);
    await request(ctx.app).get("/sitemap.xml").expect(200);
    expect(ctx.logLines.some((line) => line.includes("the read replica cannot be reached"))).toBe(true);
  });
});
