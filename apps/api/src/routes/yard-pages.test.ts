import { randomUUID } from "node:crypto";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { AccountEntity, ListingEntity, MessageEntity, MessageThreadEntity } from "../entities/index.ts";
import { createCatalogueService } from "../services/catalogue-service.ts";
import { seedLakemontYards } from "../seed/lakemont-yard.ts";
import { seedLakemont } from "../seed/lakemont.ts";
import { createTestContext } from "../test-support/test-context.ts";

let ctx: Awaited<ReturnType<typeof createTestContext>>;
let ridgeback: AccountEntity;

beforeAll(async () => {
  ctx = await createTestContext();
  await seedLakemont(ctx.dataSource, 4);
  // The demo stock without photos or sales: live listings in the catalogue, logs still drying.
  await seedLakemontYards(ctx.dataSource);
  const catalogue = createCatalogueService({ dataSource: ctx.dataSource, cursorSecret: ctx.config.sessionSecret, cache: false });
  for (const listing of await ctx.dataSource.getRepository(ListingEntity).findBy({ status: "live" }))
    await ctx.dataSource.transaction((manager) => catalogue.refreshEntry(manager, listing.id));
  ridgeback = await ctx.dataSource.getRepository(AccountEntity).findOneByOrFail({ email: "yard@ridgeback-timber.test" });
});
afterAll(async () => {
  await ctx?.close();
});

/** Every key anywhere in a JSON value. */
function keysOf(value: unknown): string[] {
  if (Array.isArray(value)) return value.flatMap(keysOf);
  if (value && typeof value === "object") return Object.entries(value).flatMap(([key, inner]) => [key, ...keysOf(inner)]);
  return [];
}

describe("GET /api/v1/yard-pages/:slug", () => {
  it("shows the yard's name, story, town, member since, rating, every live slab and its logs still drying", async () => {
    const client = await ctx.client();
    const res = await client.get(`/api/v1/yard-pages/${ridgeback.yardSlug}`);
    expect(res.status).toBe(200);
    expect(ridgeback.yardSlug).toBe("ridgeback-urban-timber");
    expect(res.body.yard).toMatchObject({
      id: ridgeback.id,
      slug: "ridgeback-urban-timber",
      name: "Ridgeback Urban Timber",
      town: "Lakemont",
      memberSince: "2021-04-12T15:00:00.000Z",
      slabsSold: 0,
      firstReply: { medianMinutes: null, asked: 0, answered: 0 },
      rating: { count: 0, average: null },
    });
    expect(res.body.yard.story).toMatch(/band mill/);
    const live = await ctx.dataSource.getRepository(ListingEntity).findBy({ sawyerId: ridgeback.id, status: "live" });
    expect(live.length).toBeGreaterThan(2);
    expect(res.body.liveSlabs.map((c: { listingId: string }) => c.listingId).sort()).toEqual(live.map((l) => l.id).sort());
    for (const card of res.body.liveSlabs)
      expect(card).toMatchObject({ yardSlug: "ridgeback-urban-timber", yardName: "Ridgeback Urban Timber" });
    // The Millrace Street maple was felled months ago and is still wet: projected from its own readings.
    const millrace = res.body.dryingLogs.find((l: { siteNeighbourhood: string }) => l.siteNeighbourhood === "Millrace Street");
    expect(millrace).toMatchObject({ speciesSlug: "silver-maple", slabCount: 5, projection: { status: "projected" } });
    expect(millrace.lastMoisturePct).toBeGreaterThan(20);
    expect(Date.parse(millrace.projection.projectedDate)).toBeGreaterThan(Date.parse(millrace.lastReadOn));
    // A log whose slabs are listed is not "still drying".
    expect(res.body.dryingLogs.map((l: { siteNeighbourhood: string }) => l.siteNeighbourhood)).not.toContain("Courthouse Square");
  });

  it("never shows the street, the pickup position or the e-mail", async () => {
    const client = await ctx.client();
    const res = await client.get(`/api/v1/yard-pages/${ridgeback.yardSlug}`);
    const keys = keysOf(res.body);
    for (const banned of ["latitude", "longitude", "email", "pickupAddress", "address", "deliveryAddress"])
      expect(keys).not.toContain(banned);
    const text = JSON.stringify(res.body);
    expect(text).not.toContain(ridgeback.email);
    expect(text).not.toContain(String(ridgeback.pickupLatitude));
    expect(text).not.toContain(String(ridgeback.pickupLongitude));
  });

  it("gives the median time to the sawyer's first reply over the threads buyers started", async () => {
    const yard = await ctx.dataSource.getRepository(AccountEntity).findOneByOrFail({ email: "hello@tamarack-lane.test" });
    const buyers = await ctx.dataSource.getRepository(AccountEntity).findBy({ role: "buyer" });
    const listing = await ctx.dataSource.getRepository(ListingEntity).findOneByOrFail({ sawyerId: yard.id, status: "live" });
    const start = Date.parse("2026-03-02T15:00:00Z");
    // Replies after 30 min, 90 min and 10 h, one question never answered; a sawyer's message before the question does not count.
    for (const [index, replyMinutes] of [30, 90, 600, null].entries()) {
      const threadId = randomUUID();
      const buyer = buyers[index]!;
      const asked = new Date(start + index * 86_400_000);
      await ctx.dataSource.getRepository(MessageThreadEntity).insert({
        id: threadId,
        listingId: listing.id,
        buyerId: buyer.id,
        sawyerId: yard.id,
        lastMessageAt: asked,
        createdAt: asked,
      });
      const messages: Partial<MessageEntity>[] = [
        { threadId, authorId: buyer.id, body: "Is it still flat?", createdAt: asked },
        { threadId, authorId: buyer.id, body: "And the moisture?", createdAt: new Date(asked.getTime() + 5 * 60_000) },
      ];
      if (replyMinutes !== null) {
        messages.push({ threadId, authorId: yard.id, body: "Yes.", createdAt: new Date(asked.getTime() + replyMinutes * 60_000) });
        messages.push({ threadId, authorId: yard.id, body: "Also…", createdAt: new Date(asked.getTime() + (replyMinutes + 1) * 60_000) });
      }
      await ctx.dataSource.getRepository(MessageEntity).insert(messages);
    }
    const client = await ctx.client();
    const res = await client.get(`/api/v1/yard-pages/${yard.yardSlug}`);
    expect(res.status).toBe(200);
    // Median of 30, 90 and 600 (Python's statistics.median rule, in slab-math): 90.
    expect(res.body.yard.firstReply).toEqual({ medianMinutes: 90, asked: 4, answered: 3 });
  });

  it("answers 404 for an unknown address and for a suspended yard", async () => {
    const client = await ctx.client();
    expect((await client.get("/api/v1/yard-pages/no-such-yard")).status).toBe(404);
    const yard = await ctx.dataSource.getRepository(AccountEntity).findOneByOrFail({ email: "barn@ashgrove-slabs.test" });
    expect((await client.get(`/api/v1/yard-pages/${yard.yardSlug}`)).status).toBe(200);
    await ctx.dataSource.getRepository(AccountEntity).update({ id: yard.id }, { suspendedAt: new Date(), suspensionReason: "Test." });
    expect((await client.get(`/api/v1/yard-pages/${yard.yardSlug}`)).status).toBe(404);
  });

  it("gives a renamed yard a page address from its new name, unique among yards", async () => {
    const sawyer = await ctx.signedInClient("sawyer", { yardName: "Marsh Lane Slabs" });
    const other = await ctx.createAccount("sawyer", { yardName: "Marsh Lane Slabs" });
    const mine = await ctx.dataSource.getRepository(AccountEntity).findOneByOrFail({ email: sawyer.account.email });
    expect(mine.yardSlug).toBe("marsh-lane-slabs");
    expect((await ctx.dataSource.getRepository(AccountEntity).findOneByOrFail({ id: other.id })).yardSlug).toBe("marsh-lane-slabs-2");
    const res = await sawyer.patch(`/api/v1/yards/${mine.id}`, { yardName: "Ridgeback Urban Timber", yardStory: "  Our story.  " });
    expect(res.status).toBe(200);
    expect(res.body.account).toMatchObject({ yardSlug: "ridgeback-urban-timber-2", yardStory: "Our story." });
  });
});
