import { copyFileSync, cpSync, existsSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import type { Server } from "node:http";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { randomBytes } from "node:crypto";
import { CreateBucketCommand, DeleteBucketCommand, DeleteObjectCommand, GetObjectCommand } from "@aws-sdk/client-s3";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { createPhotoStorage, type PhotoStorage } from "../integrations/storage.ts";
import { liveListing } from "../test-support/live-listing.ts";
import {
  expectLedgerBalanced,
  listenForWebhooks,
  startPaymentsFake,
  until,
  type TestPaymentsFake,
} from "../test-support/payments-harness.ts";
import { createTestContext, type BrowserClient, type TestContext } from "../test-support/test-context.ts";
import { createBackup, listKeys } from "./backup.ts";
import { BackupRefused, CHECKSUMS_FILE, DATABASE_FILE, MANIFEST_FILE, OBJECTS_DIR, sha256Bytes, verifyBackup } from "./backup-folder.ts";
import { restoreBackup } from "./restore.ts";
import { payOnHostedPage } from "../test-support/hosted-payment.ts";

/*
 * The backup round trip on the real stack: orders made through the real checkout (official SDK
 * against a payments fake of this file's own), photos through the real upload pipeline into a
 * bucket of this file's own on the S3 fake, a throwaway MariaDB database. Backed up with
 * mariadb-dump and the S3 API, changed, restored with the mariadb client and the S3 API, compared.
 */
let payments: TestPaymentsFake;
let apiServer: Server;
let ctx: TestContext;
let storage: PhotoStorage;
let sawyer: BrowserClient & { account: { id: string } };
let admin: BrowserClient;
let backupsRoot: string;
const bucket = `grainyard-backup-${randomBytes(4).toString("hex")}`;

async function paidOrder(listingId: string) {
  const buyer = await ctx.signedInClient("buyer");
  const res = await buyer.post(`/api/v1/listings/${listingId}/checkout`, { handover: "pickup" });
  expect(res.status).toBe(201);
  const paid = await payOnHostedPage(res.body.checkoutUrl);
  expect(paid.status).toBe(303);
  const orderId = res.body.order.id as string;
  await until(async () => (await ctx.dataSource.query("SELECT status FROM buyer_order WHERE id = ?", [orderId]))[0]?.status === "paid");
  return { buyer, orderId };
}

/** What the round trip must bring back exactly: whole rows of the money tables, ledger sums, photo objects' bytes. */
async function state() {
  const rows = (sql: string) => ctx.dataSource.query(sql) as Promise<Record<string, unknown>[]>;
  const objects: Record<string, { sha256: string; contentType: string | undefined }> = {};
  for (const key of await listKeys(storage.client, bucket)) {
    const answer = await storage.client.send(new GetObjectCommand({ Bucket: bucket, Key: key }));
    objects[key] = { sha256: sha256Bytes(Buffer.from(await answer.Body!.transformToByteArray())), contentType: answer.ContentType };
  }
  return {
    orders: await rows("SELECT * FROM buyer_order ORDER BY id"),
    refunds: await rows("SELECT * FROM order_refund ORDER BY id"),
    ledger: await rows("SELECT * FROM ledger_entry ORDER BY id"),
    ledgerSums: await rows(
      "SELECT account, currency, CAST(SUM(amount_minor) AS SIGNED) AS total, COUNT(*) AS entries FROM ledger_entry GROUP BY account, currency ORDER BY account, currency",
    ),
    listings: await rows("SELECT id, status, updated_at FROM listing ORDER BY id"),
    photos: await rows("SELECT * FROM listing_photo ORDER BY id"),
    migrations: await rows("SELECT * FROM schema_migration ORDER BY id"),
    objects,
  };
}

beforeAll(async () => {
  payments = await startPaymentsFake({ secretKey: "sk_test_backup", webhookSecret: "whsec_backup_test" });
  ctx = await createTestContext({ environment: { ...payments.environment, S3_BUCKET: bucket, SIGN_IN_LIMIT_PER_IP: "1000" } });
  storage = createPhotoStorage(ctx.config.storage);
  await storage.client.send(new CreateBucketCommand({ Bucket: bucket }));
  let webhookUrl: string;
  ({ server: apiServer, webhookUrl } = await listenForWebhooks(ctx.app));
  payments.fake.webhooks.options.url = webhookUrl;
  sawyer = await ctx.signedInClient("sawyer", { yardName: "Backwater Slab Co" });
  admin = await ctx.signedInClient("admin");
  backupsRoot = mkdtempSync(join(tmpdir(), "grainyard-backups-"));
}, 60_000);

afterAll(async () => {
  await new Promise((r) => apiServer?.close(r));
  await payments?.close();
  if (storage) {
    for (const key of await listKeys(storage.client, bucket))
      await storage.client.send(new DeleteObjectCommand({ Bucket: bucket, Key: key }));
    await storage.client.send(new DeleteBucketCommand({ Bucket: bucket }));
    storage.close();
  }
  await ctx?.close();
  if (backupsRoot) rmSync(backupsRoot, { recursive: true, force: true });
});

describe("backup and restore", () => {
  it("brings orders, the ledger and every photo object back exactly as they were at backup time", async () => {
    const walnut = await liveListing(sawyer, admin, { title: "Walnut crotch slab", speciesSlug: "black-walnut", rateMinor: 120_000 });
    const maple = await liveListing(sawyer, admin, { title: "Spalted maple slab", speciesSlug: "sugar-maple", rateMinor: 80_000 });
    const cherry = await liveListing(sawyer, admin, { title: "Cherry bench slab", speciesSlug: "black-cherry", rateMinor: 65_000 });
    const spare = await liveListing(sawyer, admin, { title: "Elm offcut", speciesSlug: "american-elm", rateMinor: 20_000 });
    const first = await paidOrder(walnut);
    await paidOrder(maple);
    await expectLedgerBalanced(ctx.dataSource);

    const before = await state();
    expect(before.orders).toHaveLength(2);
    expect(before.ledger.length).toBeGreaterThan(0);
    expect(Object.keys(before.objects).length).toBeGreaterThanOrEqual(8); // four listings' originals and sizes

    const lines: string[] = [];
    const { folder, manifest } = await createBackup({
      database: ctx.config.database,
      storage,
      root: backupsRoot,
      progress: (l) => lines.push(l),
    });
    expect(folder).toMatch(/\d{4}-\d{2}-\d{2}T\d{2}-\d{2}-\d{2}Z$/);
    expect(manifest.objects.count).toBe(Object.keys(before.objects).length);
    expect(manifest.database.tableRows.buyer_order).toBe(2);
    expect(manifest.database.tableRows.ledger_entry).toBe(before.ledger.length);
    expect(manifest.schemaMigration?.name).toBe(before.migrations.at(-1)!.name);
    expect(manifest.database.tool).toMatch(/mariadb-dump/);
    expect(readFileSync(join(folder, DATABASE_FILE), "utf8")).toMatch(/CREATE TABLE `buyer_order`/);
    expect(lines.join("\n")).toMatch(/--single-transaction/);

    // Changes after the backup: a new order, a cancellation refunded through the provider, a photo
    // deleted, a new listing with its photo.
    await paidOrder(cherry);
    const cancelled = await first.buyer.post(`/api/v1/orders/${first.orderId}/cancellation`, { reason: "The table plans changed." });
    expect(cancelled.status).toBe(200);
    await until(
      async () => (await ctx.dataSource.query("SELECT status FROM buyer_order WHERE id = ?", [first.orderId]))[0]?.status === "refunded",
    );
    const sparePhotos = (await ctx.dataSource.query("SELECT id FROM listing_photo WHERE listing_id = ?", [spare])) as { id: string }[];
    await sawyer.post(`/api/v1/yard/listings/${spare}/withdraw`);
    await sawyer.delete(`/api/v1/yard/listings/${spare}/photos/${sparePhotos[0]!.id}`);
    await liveListing(sawyer, admin, { title: "Ash live-edge shelf", speciesSlug: "white-ash", rateMinor: 30_000 });
    const changed = await state();
    expect(changed.orders).toHaveLength(3);
    expect(changed.refunds).toHaveLength(1);
    expect(changed.ledgerSums).not.toEqual(before.ledgerSums);
    expect(Object.keys(changed.objects)).not.toEqual(Object.keys(before.objects));

    const restored = await restoreBackup({ database: ctx.config.database, storage, folder });
    expect(restored.restored).toBe(manifest.objects.count);
    expect(restored.deleted).toBe(Object.keys(changed.objects).length);

    const after = await state();
    expect(after).toEqual(before);
    await expectLedgerBalanced(ctx.dataSource);
    // The API reads the restored data: the buyer whose cancellation came after the backup sees the order paid again.
    const orders = await first.buyer.get("/api/v1/orders");
    expect(orders.status).toBe(200);
    expect(orders.body.orders.map((o: { id: string; status: string }) => [o.id, o.status])).toEqual([[first.orderId, "paid"]]);
  }, 120_000);

  it("refuses a tampered, incomplete or foreign folder before touching the database or the bucket", async () => {
    await liveListing(sawyer, admin, { title: "Oak mantel slab", speciesSlug: "white-oak", rateMinor: 45_000 });
    const { folder } = await createBackup({ database: ctx.config.database, storage, root: backupsRoot, now: new Date(Date.now() + 5_000) });
    const before = await state();
    const refusal = async (dir: string) => {
      const error = await restoreBackup({ database: ctx.config.database, storage, folder: dir }).catch((e: unknown) => e);
      expect(error).toBeInstanceOf(BackupRefused);
      return (error as Error).message;
    };

    // One byte of one photo changed.
    const tampered = `${folder}-tampered`;
    cpSync(folder, tampered, { recursive: true });
    const objectLine = readFileSync(join(tampered, CHECKSUMS_FILE), "utf8")
      .split("\n")
      .find((line) => line.includes(`${OBJECTS_DIR}/`))!;
    const objectFile = join(tampered, objectLine.split("  ")[1]!);
    const bytes = readFileSync(objectFile);
    bytes[bytes.length >> 1] ^= 0xff;
    writeFileSync(objectFile, bytes);
    expect(await refusal(tampered)).toMatch(new RegExp(`${objectLine.split("  ")[1]} does not match its checksum`));

    // The dump edited (a row added by hand), and the manifest missing.
    const edited = `${folder}-edited`;
    cpSync(folder, edited, { recursive: true });
    writeFileSync(join(edited, DATABASE_FILE), `${readFileSync(join(edited, DATABASE_FILE), "utf8")}\nDELETE FROM buyer_order;\n`);
    rmSync(join(edited, MANIFEST_FILE));
    const message = await refusal(edited);
    expect(message).toMatch(/is not a Grainyard backup/);
    copyFileSync(join(folder, MANIFEST_FILE), join(edited, MANIFEST_FILE));
    expect(await refusal(edited)).toMatch(/database\.sql does not match its checksum/);

    // A file that is not part of the backup, a folder that does not exist, a folder that is not a backup.
    const extra = `${folder}-extra`;
    cpSync(folder, extra, { recursive: true });
    writeFileSync(join(extra, "notes.sql"), "DROP TABLE buyer_order;");
    expect(await refusal(extra)).toMatch(/notes\.sql is not part of the backup/);
    expect(await refusal(join(backupsRoot, "no-such-backup"))).toMatch(/does not exist/);
    expect(await refusal(tmpdir())).toMatch(/is not a Grainyard backup/);

    // Nothing was touched by any of these.
    expect(await state()).toEqual(before);
    // The untouched backup still verifies.
    await expect(verifyBackup(folder)).resolves.toMatchObject({ manifest: { format: "grainyard-backup" } });
    expect(existsSync(join(folder, MANIFEST_FILE))).toBe(true);
  }, 60_000);
});
