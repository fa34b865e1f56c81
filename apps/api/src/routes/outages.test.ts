import { createServer, type AddressInfo } from "node:net";
import request from "supertest";
import sharp from "sharp";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { ListingEntity, ListingPhotoEntity, OrderEntity } from "../entities/index.ts";
import { createTestContext, type BrowserClient, type TestContext } from "../test-support/test-context.ts";

/*
 * A part that is down answers 503 with Retry-After and a message that names it, never its
 * internals; nothing is left half-done. Each outage is this file's own: the API is pointed at a
 * loopback port this file opened and closed, so nothing shared is stopped.
 */

/** A loopback port where nothing listens: opened by this test, then closed. */
async function closedPort(): Promise<number> {
  const server = createServer();
  await new Promise<void>((resolve) => server.listen(0, "127.0.0.1", resolve));
  const { port } = server.address() as AddressInfo;
  await new Promise<void>((resolve) => server.close(() => resolve()));
  return port;
}

const INTERNALS = /ECONN|127\.0\.0\.1|:\d{4,5}|originals\/|display\/|stack|at .*\.ts|S3|stripe|socket/i;

let photo: Buffer;
let storageDown: TestContext;
let paymentsDown: TestContext;

async function slabAndListing(sawyer: BrowserClient, title: string): Promise<string> {
  const slab = (
    await sawyer.post("/api/v1/yard/slabs", {
      speciesSlug: "white-oak",
      lengthMm: 1900,
      thicknessMm: 45,
      widthStationsMm: [540, 520],
      liveEdge: "both",
      surfacing: "flattened",
      dryingMethod: "kiln",
    })
  ).body.slab;
  return (await sawyer.post("/api/v1/yard/listings", { title, slabIds: [slab.id], priceMode: "fixed", rateMinor: 60_000 })).body.listing
    .id as string;
}

const upload = (sawyer: BrowserClient, listingId: string) =>
  sawyer.agent
    .post(`/api/v1/yard/listings/${listingId}/photos`)
    .set("x-csrf-token", sawyer.csrfToken)
    .set("content-type", "image/jpeg")
    .send(photo);

beforeAll(async () => {
  photo = await sharp({ create: { width: 800, height: 600, channels: 3, background: "#7a5634" } })
    .jpeg()
    .toBuffer();
  storageDown = await createTestContext({ environment: { S3_ENDPOINT: `http://127.0.0.1:${await closedPort()}` } });
  paymentsDown = await createTestContext({ environment: { PAYMENTS_PORT: String(await closedPort()), SIGN_IN_LIMIT_PER_IP: "1000" } });
}, 60_000);

afterAll(async () => {
  await storageDown?.close();
  await paymentsDown?.close();
});

describe("photo storage down", () => {
  it("answers a photo upload 503 storage_unavailable with Retry-After, names photo storage, and stores nothing", async () => {
    const sawyer = await storageDown.signedInClient("sawyer");
    const listingId = await slabAndListing(sawyer, "Oak bench top");
    const res = await upload(sawyer, listingId);
    expect(res.status).toBe(503);
    expect(res.headers["retry-after"]).toBe("30");
    expect(res.body.error.code).toBe("storage_unavailable");
    expect(res.body.error.message).toMatch(/photo storage/i);
    expect(JSON.stringify(res.body)).not.toMatch(INTERNALS);
    expect(await storageDown.dataSource.getRepository(ListingPhotoEntity).countBy({ listingId })).toBe(0);

    const health = await request(storageDown.app).get("/api/health");
    expect(health.status).toBe(503);
    expect(health.body.components).toMatchObject({ database: "up", storage: "down", payments: "up" });
    expect(health.body.message).toBe("Down just now: photo storage.");
  });
});

describe("card payments down", () => {
  it("answers Buy 503 payments_unavailable with Retry-After and puts the slab back on sale; payout set-up the same", async () => {
    const ctx = paymentsDown;
    const sawyer = await ctx.signedInClient("sawyer");
    const admin = await ctx.signedInClient("admin");
    const listingId = await slabAndListing(sawyer, "Oak desk top");
    expect((await upload(sawyer, listingId)).status).toBe(201);
    await sawyer.post(`/api/v1/yard/listings/${listingId}/submit`);
    expect((await admin.post(`/api/v1/admin/listings/${listingId}/approve`)).status).toBe(200);

    const buyer = await ctx.signedInClient("buyer");
    const res = await buyer.post(`/api/v1/listings/${listingId}/checkout`, { handover: "pickup" });
    expect(res.status).toBe(503);
    expect(res.headers["retry-after"]).toBe("30");
    expect(res.body.error.code).toBe("payments_unavailable");
    expect(res.body.error.message).toMatch(/card payments/i);
    expect(JSON.stringify(res.body)).not.toMatch(INTERNALS);
    // Nothing half-done: the slab is on sale again and no order waits for a payment.
    expect((await ctx.dataSource.getRepository(ListingEntity).findOneByOrFail({ id: listingId })).status).toBe("live");
    const orders = await ctx.dataSource.getRepository(OrderEntity).findBy({ listingId });
    expect(orders.filter((o) => o.status === "awaiting_payment")).toEqual([]);

    const setUp = await sawyer.post("/api/v1/yard/payouts/account");
    expect(setUp.status).toBe(503);
    expect(setUp.headers["retry-after"]).toBe("30");
    expect(setUp.body.error.code).toBe("payments_unavailable");
    expect(setUp.body.error.message).toMatch(/payment provider/i);
    expect(JSON.stringify(setUp.body)).not.toMatch(INTERNALS);

    const health = await request(ctx.app).get("/api/health");
    expect(health.status).toBe(503);
    expect(health.body.components).toMatchObject({ database: "up", storage: "up", payments: "down" });
    expect(health.body.message).toBe("Down just now: card payments.");
  });
});
