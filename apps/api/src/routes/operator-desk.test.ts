import sharp from "sharp";
import { IsNull } from "typeorm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import {
  AccountEntity,
  AuditEntryEntity,
  CatalogueEntryEntity,
  LedgerEntryEntity,
  ListingEntity,
  OrderEntity,
  SessionRecordEntity,
} from "../entities/index.ts";
import { median, weekStart } from "../services/dashboard-service.ts";
import { createTestContext, mailTo, type BrowserClient, type TestContext } from "../test-support/test-context.ts";

/*
 * The operator desk against real MariaDB, the SMTP sink and the payments fake: review with
 * plausibility warnings and what changed, the audit log, reports, suspension, settings, users.
 */
type Signed = BrowserClient & { account: { id: string; email: string; password: string } };
let ctx: TestContext;
let admin: Signed;
let sawyer: Signed;
let buyer: Signed;
let photo: Buffer;

async function draftListing(
  owner: Signed,
  overrides: { title?: string; moisture?: number; dryingMethod?: string; rateMinor?: number } = {},
) {
  const slab = (
    await owner.post("/api/v1/yard/slabs", {
      speciesSlug: "black-cherry",
      lengthMm: 2000,
      thicknessMm: 45,
      widthStationsMm: [600, 580],
      liveEdge: "both",
      surfacing: "sanded",
      dryingMethod: overrides.dryingMethod ?? "kiln",
    })
  ).body.slab;
  if (overrides.moisture !== undefined) {
    const reading = await owner.post(`/api/v1/yard/slabs/${slab.id}/readings`, {
      readOn: "2026-10-01",
      moistureContentPct: overrides.moisture,
      method: "pin_meter",
    });
    expect(reading.status).toBe(201);
  }
  const created = await owner.post("/api/v1/yard/listings", {
    title: overrides.title ?? `Cherry top ${Math.random().toString(36).slice(2, 6)}`,
    slabIds: [slab.id],
    priceMode: "fixed",
    rateMinor: overrides.rateMinor ?? 90_000,
  });
  expect(created.status).toBe(201);
  const listing = created.body.listing;
  await owner.agent
    .post(`/api/v1/yard/listings/${listing.id}/photos`)
    .set("x-csrf-token", owner.csrfToken)
    .set("content-type", "image/jpeg")
    .send(photo);
  return { listingId: listing.id as string, slabId: slab.id as string };
}
async function submitted(owner: Signed, overrides: Parameters<typeof draftListing>[1] = {}) {
  const ids = await draftListing(owner, overrides);
  expect((await owner.post(`/api/v1/yard/listings/${ids.listingId}/submit`)).status).toBe(200);
  return ids;
}
async function liveListing(owner: Signed) {
  const ids = await submitted(owner, { moisture: 8 });
  expect((await admin.post(`/api/v1/admin/listings/${ids.listingId}/approve`)).status).toBe(200);
  return ids;
}
const statusOf = async (id: string) => (await ctx.dataSource.getRepository(ListingEntity).findOneByOrFail({ id })).status;
const inCatalogue = async (id: string) => (await ctx.dataSource.getRepository(CatalogueEntryEntity).countBy({ listingId: id })) === 1;
const auditOf = (targetId: string) => ctx.dataSource.getRepository(AuditEntryEntity).find({ where: { targetId }, order: { id: "ASC" } });

beforeAll(async () => {
  ctx = await createTestContext({ environment: { SIGN_IN_LIMIT_PER_IP: "1000" } });
  admin = (await ctx.signedInClient("admin")) as Signed;
  sawyer = (await ctx.signedInClient("sawyer")) as Signed;
  buyer = (await ctx.signedInClient("buyer")) as Signed;
  photo = await sharp({ create: { width: 640, height: 480, channels: 3, background: "#8a4f32" } })
    .jpeg()
    .toBuffer();
}, 60_000);
afterAll(async () => ctx?.close());

describe("moderation desk", () => {
  it("lists submissions oldest first with plausibility warnings from slab-math", async () => {
    const first = await submitted(sawyer, { moisture: 3 });
    const second = await submitted(sawyer, { moisture: 8 });
    const desk = await admin.get("/api/v1/admin/review-desk");
    expect(desk.status).toBe(200);
    const ids = desk.body.items.map((i: { listing: { id: string } }) => i.listing.id);
    expect(ids.indexOf(first.listingId)).toBeLessThan(ids.indexOf(second.listingId));
    const item = desk.body.items.find((i: { listing: { id: string } }) => i.listing.id === first.listingId);
    expect(item.warnings.map((w: { code: string }) => w.code)).toEqual(["moisture_too_low"]);
    expect(item.listing.photos[0].largeUrl).toMatch(/large\.webp$/);
    expect(item.listing.slabs[0].figures.boardFeet).toBeGreaterThan(0);
    expect(item.lastReview).toBeNull();
    expect(item.changes).toEqual([]);
    expect(desk.body.items.find((i: { listing: { id: string } }) => i.listing.id === second.listingId).warnings).toEqual([]);
  });

  it("send back with a reason → mail; the resubmission shows what changed; approve → mail, live, audited", async () => {
    const { listingId } = await submitted(sawyer, { title: "Cherry top first try", moisture: 9 });
    const empty = await admin.post(`/api/v1/admin/listings/${listingId}/send-back`, { reason: "" });
    expect(empty.status).toBe(422);
    expect(empty.body.error.fields.reason).toBeTruthy();
    const sent = await admin.post(`/api/v1/admin/listings/${listingId}/send-back`, { reason: "Say which end has the crack." });
    expect(sent.status).toBe(200);
    expect(sent.body.listing.status).toBe("sent_back");
    expect((await mailTo(sawyer.account.email)).some((m) => m.text.includes("Say which end has the crack."))).toBe(true);

    expect(
      (await sawyer.patch(`/api/v1/yard/listings/${listingId}`, { title: "Cherry top, crack at the north end", rateMinor: 85_000 })).status,
    ).toBe(200);
    expect((await sawyer.post(`/api/v1/yard/listings/${listingId}/submit`)).status).toBe(200);
    const item = (await admin.get("/api/v1/admin/review-desk")).body.items.find(
      (i: { listing: { id: string } }) => i.listing.id === listingId,
    );
    expect(item.lastReview).toMatchObject({ decision: "sent_back", reason: "Say which end has the crack." });
    expect(item.changes).toEqual([
      { field: "title", label: "Title", before: "Cherry top first try", after: "Cherry top, crack at the north end" },
      { field: "price", label: "Price", before: "fixed: $900.00 USD", after: "fixed: $850.00 USD" },
    ]);

    const approved = await admin.post(`/api/v1/admin/listings/${listingId}/approve`);
    expect(approved.body.listing.status).toBe("live");
    expect(await inCatalogue(listingId)).toBe(true);
    expect((await mailTo(sawyer.account.email))[0]!.subject).toMatch(/live/i);
    const history = (await admin.get(`/api/v1/admin/listings/${listingId}/reviews`)).body.reviews;
    expect(history.map((r: { decision: string }) => r.decision)).toEqual(["approved", "sent_back"]);
    const entries = await auditOf(listingId);
    expect(entries.map((e) => e.action)).toEqual(["listing.send_back", "listing.approve"]);
    expect(entries[0]).toMatchObject({
      actorId: admin.account.id,
      actorLabel: admin.account.email,
      before: { status: "in_review" },
      after: { status: "sent_back" },
      reason: "Say which end has the crack.",
    });
    // A second approval is refused and writes nothing.
    expect((await admin.post(`/api/v1/admin/listings/${listingId}/approve`)).status).toBe(409);
    expect(await auditOf(listingId)).toHaveLength(2);
  });

  it("reject with a reason: final, mailed, the slab is free for another listing", async () => {
    const { listingId, slabId } = await submitted(sawyer, { moisture: 8 });
    expect((await admin.post(`/api/v1/admin/listings/${listingId}/reject`, { reason: "x" })).status).toBe(422);
    const rejected = await admin.post(`/api/v1/admin/listings/${listingId}/reject`, { reason: "Photos are of a different slab." });
    expect(rejected.body.listing.status).toBe("rejected");
    expect((await mailTo(sawyer.account.email))[0]).toMatchObject({ subject: expect.stringMatching(/not accepted/) });
    expect((await sawyer.post(`/api/v1/yard/listings/${listingId}/submit`)).status).toBe(409);
    expect(
      (await sawyer.post("/api/v1/yard/listings", { title: "Cherry, second go", slabIds: [slabId], priceMode: "fixed", rateMinor: 50_000 }))
        .status,
    ).toBe(201);
  });
});

describe("audit log", () => {
  it("searches by actor, action, target and dates, pages by keyset, and exports CSV", async () => {
    const all = await admin.get("/api/v1/admin/audit?limit=200");
    expect(all.status).toBe(200);
    const total = all.body.entries.length;
    expect(total).toBeGreaterThanOrEqual(3);
    const ids = all.body.entries.map((e: { id: string }) => Number(e.id));
    expect([...ids].sort((a, b) => b - a)).toEqual(ids);

    const pages: string[] = [];
    let cursor: string | null = null;
    do {
      const page: { body: { entries: { id: string }[]; nextCursor: string | null } } = await admin.get(
        `/api/v1/admin/audit?limit=2${cursor ? `&cursor=${cursor}` : ""}`,
      );
      pages.push(...page.body.entries.map((e) => e.id));
      cursor = page.body.nextCursor;
    } while (cursor);
    expect(pages).toEqual(all.body.entries.map((e: { id: string }) => e.id));

    const byAction = await admin.get("/api/v1/admin/audit?action=listing.reject");
    expect(byAction.body.entries.every((e: { action: string }) => e.action === "listing.reject")).toBe(true);
    expect(byAction.body.entries.length).toBeGreaterThanOrEqual(1);
    // Named for the sentence the desk reads: the admin by name, the listing by its title and yard.
    const rejected = byAction.body.entries[0];
    const rejectedListing = await ctx.dataSource.getRepository(ListingEntity).findOneByOrFail({ id: rejected.targetId });
    expect(rejected.actorName).toBe("Test admin");
    expect(rejected.subject).toEqual({ name: rejectedListing.title, owner: "Test Yard", currency: null });
    const byActor = await admin.get(`/api/v1/admin/audit?actor=${encodeURIComponent(admin.account.email.slice(0, 10))}`);
    expect(byActor.body.entries).toHaveLength(total);
    expect((await admin.get(`/api/v1/admin/audit?actor=${admin.account.id}`)).body.entries).toHaveLength(total);
    const target = all.body.entries[0].targetId;
    expect(
      (await admin.get(`/api/v1/admin/audit?target=${target}`)).body.entries.every((e: { targetId: string }) => e.targetId === target),
    ).toBe(true);
    const today = new Date().toISOString().slice(0, 10);
    expect((await admin.get(`/api/v1/admin/audit?from=${today}&to=${today}`)).body.entries).toHaveLength(total);
    expect((await admin.get("/api/v1/admin/audit?from=2020-01-01&to=2020-01-31")).body.entries).toHaveLength(0);
    const bad = await admin.get("/api/v1/admin/audit?from=2026-05-02&to=2026-05-01");
    expect(bad.status).toBe(422);
    expect(bad.body.error.fields.to).toBeTruthy();

    const csv = await admin.get("/api/v1/admin/audit.csv?action=listing.send_back");
    expect(csv.status).toBe(200);
    expect(csv.headers["content-type"]).toMatch(/text\/csv/);
    const lines = csv.text.trim().split("\n");
    expect(lines[0]).toBe("id,createdAt,actorId,actorLabel,action,targetKind,targetId,reason,before,after");
    expect(lines.slice(1).every((l) => l.includes("listing.send_back"))).toBe(true);
    expect(lines.length).toBeGreaterThanOrEqual(2);
  });
});

describe("reports and suspension", () => {
  it("anyone signed in reports a listing or a message; the admin dismisses or takes the listing down", async () => {
    const { listingId } = await liveListing(sawyer);
    expect(
      (await (await ctx.client()).post("/api/v1/reports", { targetKind: "listing", targetId: listingId, reason: "Looks copied." })).status,
    ).toBe(401);
    expect((await buyer.post("/api/v1/reports", { targetKind: "listing", targetId: listingId, reason: "" })).status).toBe(422);
    const report = await buyer.post("/api/v1/reports", {
      targetKind: "listing",
      targetId: listingId,
      reason: "The photos are from another site.",
    });
    expect(report.status).toBe(201);
    expect((await buyer.post("/api/v1/reports", { targetKind: "listing", targetId: listingId, reason: "Again, the photos." })).status).toBe(
      409,
    );
    expect((await sawyer.post("/api/v1/reports", { targetKind: "listing", targetId: listingId, reason: "Reporting myself." })).status).toBe(
      422,
    );

    const thread = (await buyer.post(`/api/v1/listings/${listingId}/messages`, { body: "Is the crack stable?" })).body.thread;
    const answer = await sawyer.post(`/api/v1/threads/${thread.id}/messages`, { body: "Rude words here" });
    expect(answer.status).toBe(201);
    const messageId = String(answer.body.message.id);
    const outsider = (await ctx.signedInClient("buyer")) as Signed;
    expect(
      (await outsider.post("/api/v1/reports", { targetKind: "message", targetId: messageId, reason: "Not mine but rude." })).status,
    ).toBe(404);
    const messageReport = await buyer.post("/api/v1/reports", {
      targetKind: "message",
      targetId: messageId,
      reason: "Rude answer to a question.",
    });
    expect(messageReport.status).toBe(201);
    // The reporter gets a receipt, never the reported person's details.
    expect(messageReport.body.report).toEqual({ id: expect.any(String), targetKind: "message", targetId: messageId, status: "open" });

    const queue = (await admin.get("/api/v1/admin/reports")).body.reports;
    expect(queue.map((r: { id: string }) => r.id)).toEqual([report.body.report.id, messageReport.body.report.id]);
    expect(queue[1].excerpt).toBe("Rude words here");
    const dismissed = await admin.post(`/api/v1/admin/reports/${messageReport.body.report.id}/resolve`, {
      resolution: "dismiss",
      note: "Blunt, not abusive.",
    });
    expect(dismissed.body.report.status).toBe("dismissed");
    expect(
      (await admin.post(`/api/v1/admin/reports/${messageReport.body.report.id}/resolve`, { resolution: "dismiss", note: "Again please." }))
        .status,
    ).toBe(409);

    const down = await admin.post(`/api/v1/admin/reports/${report.body.report.id}/resolve`, {
      resolution: "take_down",
      note: "Photos traced to another seller.",
    });
    expect(down.body.report.status).toBe("listing_taken_down");
    expect(await statusOf(listingId)).toBe("taken_down");
    expect(await inCatalogue(listingId)).toBe(false);
    expect((await buyer.get(`/api/v1/catalogue/${listingId}`)).status).toBe(404);
    expect((await mailTo(sawyer.account.email))[0]!.subject).toMatch(/taken down/);
    expect((await auditOf(listingId)).map((e) => e.action)).toContain("listing.take_down");
    expect((await admin.get("/api/v1/admin/reports")).body.reports).toHaveLength(0);
  });

  it("suspend from a report: no sign-in (clear message), sessions dead, listings hidden, reservations released; restore brings back only what was live", async () => {
    const seller = (await ctx.signedInClient("sawyer")) as Signed;
    const live = await liveListing(seller);
    const withdrawn = await liveListing(seller);
    expect((await seller.post(`/api/v1/yard/listings/${withdrawn.listingId}/withdraw`)).status).toBe(200);
    // The seller also holds a reservation on someone else's slab, as a buyer would.
    const other = await liveListing(sawyer);
    const holder = (await ctx.signedInClient("buyer")) as Signed;
    const order = await holder.post(`/api/v1/listings/${other.listingId}/checkout`, { handover: "pickup" });
    expect(order.status).toBe(201);
    expect(await statusOf(other.listingId)).toBe("reserved");

    const report = await buyer.post("/api/v1/reports", {
      targetKind: "listing",
      targetId: live.listingId,
      reason: "Seller asks for payment outside Grainyard.",
    });
    const resolved = await admin.post(`/api/v1/admin/reports/${report.body.report.id}/resolve`, {
      resolution: "suspend",
      note: "Asked buyers to pay off the platform.",
    });
    expect(resolved.body.report.status).toBe("user_suspended");
    expect(resolved.body.report.reported.suspended).toBe(true);

    expect((await seller.get("/api/v1/yard")).status).toBe(401);
    expect(await ctx.dataSource.getRepository(SessionRecordEntity).countBy({ accountId: seller.account.id, revokedAt: IsNull() })).toBe(0);
    const again = await (await ctx.client()).post("/api/v1/session", { email: seller.account.email, password: seller.account.password });
    expect(again.status).toBe(403);
    expect(again.body.error.code).toBe("account_suspended");
    expect(again.body.error.message).toMatch(/suspended/);
    expect(await statusOf(live.listingId)).toBe("suspended");
    expect(await inCatalogue(live.listingId)).toBe(false);
    expect((await buyer.post(`/api/v1/listings/${live.listingId}/checkout`, { handover: "pickup" })).status).toBe(409);
    expect((await mailTo(seller.account.email))[0]!.subject).toMatch(/suspended/);

    // Suspend the holder directly from the user screen: their reservation is released.
    const suspendHolder = await admin.post(`/api/v1/admin/users/${holder.account.id}/suspend`, { reason: "Test of a held reservation." });
    expect(suspendHolder.status).toBe(200);
    expect((await ctx.dataSource.getRepository(OrderEntity).findOneByOrFail({ id: order.body.order.id })).status).toBe("expired");
    expect(await statusOf(other.listingId)).toBe("live");
    expect(await inCatalogue(other.listingId)).toBe(true);
    expect((await admin.post(`/api/v1/admin/users/${holder.account.id}/suspend`, { reason: "Twice in a row." })).status).toBe(409);

    const restored = await admin.post(`/api/v1/admin/users/${seller.account.id}/restore`, { reason: "Spoke on the phone; understood." });
    expect(restored.status).toBe(200);
    expect(restored.body.user.suspended).toBe(false);
    expect(await statusOf(live.listingId)).toBe("live");
    expect(await inCatalogue(live.listingId)).toBe(true);
    expect(await statusOf(withdrawn.listingId)).toBe("withdrawn");
    expect(
      (await (await ctx.client()).post("/api/v1/session", { email: seller.account.email, password: seller.account.password })).status,
    ).toBe(200);
    const entries = (await auditOf(seller.account.id)).map((e) => e.action);
    expect(entries).toEqual(["account.suspend", "account.restore"]);
    // The desk names the account as it reads now (a sawyer by their yard), and the report by the listing it was about.
    const named = (await admin.get(`/api/v1/admin/audit?target=${seller.account.id}`)).body.entries;
    const sellerYard = (await ctx.dataSource.getRepository(AccountEntity).findOneByOrFail({ id: seller.account.id })).yardName;
    expect(named.map((e: { subject: { name: string } }) => e.subject.name)).toEqual([sellerYard, sellerYard]);
    const reportEntry = (await admin.get(`/api/v1/admin/audit?target=${report.body.report.id}`)).body.entries[0];
    expect(reportEntry.subject).toEqual({
      name: (await ctx.dataSource.getRepository(ListingEntity).findOneByOrFail({ id: live.listingId })).title,
      owner: sellerYard,
      currency: null,
    });
    // Admins cannot be suspended from the desk, nor oneself.
    expect((await admin.post(`/api/v1/admin/users/${admin.account.id}/suspend`, { reason: "Myself, oddly." })).status).toBe(403);
  });
});

describe("other admin actions", () => {
  it("an admin changing a sawyer's yard is audited with before and after; the sawyer's own change is not", async () => {
    const yard = (await ctx.signedInClient("sawyer", { yardName: "Old Mill Yard" })) as Signed;
    expect((await yard.patch(`/api/v1/yards/${yard.account.id}`, { yardName: "Own Rename Yard" })).status).toBe(200);
    expect(await auditOf(yard.account.id)).toHaveLength(0);
    expect((await admin.patch(`/api/v1/yards/${yard.account.id}`, { yardName: "Desk Rename Yard" })).status).toBe(200);
    const entries = await auditOf(yard.account.id);
    expect(entries).toHaveLength(1);
    expect(entries[0]).toMatchObject({
      action: "yard.update",
      actorId: admin.account.id,
      before: { yardName: "Own Rename Yard" },
      after: { yardName: "Desk Rename Yard" },
    });
  });
});

describe("marketplace settings", () => {
  it("defaults from the old constants and env; changes are validated, audited and used by listings and checkout", async () => {
    const initial = await admin.get("/api/v1/admin/settings");
    expect(initial.body.settings).toEqual({
      platformFeeBps: 1000,
      processingFeeBps: 290,
      processingFixedMinor: 30,
      holdDays: 7,
      reservationMinutes: ctx.config.checkout.reservationMinutes,
      taxRateBps: ctx.config.checkout.taxRateBps,
    });
    expect(initial.body.changedKeys).toEqual([]);

    const bad = await admin.patch("/api/v1/admin/settings", { platformFeeBps: 12.5, reservationMinutes: 1, reason: "Trying bad numbers." });
    expect(bad.status).toBe(422);
    expect(Object.keys(bad.body.error.fields).sort()).toEqual(["platformFeeBps", "reservationMinutes"]);
    expect((await admin.patch("/api/v1/admin/settings", { platformFeeBps: 800 })).status).toBe(422);
    expect((await admin.patch("/api/v1/admin/settings", { wizardFee: 1, reason: "Unknown setting." })).status).toBe(422);

    const changed = await admin.patch("/api/v1/admin/settings", {
      platformFeeBps: 800,
      reservationMinutes: 30,
      taxRateBps: 500,
      reason: "Winter promotion for yards.",
    });
    expect(changed.status).toBe(200);
    expect(changed.body.changedKeys).toEqual(["platformFeeBps", "reservationMinutes", "taxRateBps"]);
    const [entry] = await auditOf("marketplace");
    expect(entry).toMatchObject({
      action: "settings.update",
      before: {
        platformFeeBps: 1000,
        reservationMinutes: ctx.config.checkout.reservationMinutes,
        taxRateBps: ctx.config.checkout.taxRateBps,
      },
      after: { platformFeeBps: 800, reservationMinutes: 30, taxRateBps: 500 },
      reason: "Winter promotion for yards.",
    });

    // The public fees follow at once, for the sawyer's listing-form preview.
    expect((await sawyer.get("/api/v1/marketplace/fees")).body).toEqual({
      fees: { platformFeeBps: 800, processingFeeBps: 290, processingFixedMinor: 30 },
    });

    // 8 % of 900.00 is 72.00 (slab-math feeBreakdown, basis points).
    const { listingId } = await draftListing(sawyer, { rateMinor: 90_000 });
    const listing = (await sawyer.get(`/api/v1/yard/listings/${listingId}`)).body.listing;
    expect(listing.figures.platformFeeMinor).toBe(7_200);

    const live = await liveListing(sawyer);
    const before = Date.now();
    const order = await buyer.post(`/api/v1/listings/${live.listingId}/checkout`, { handover: "pickup" });
    expect(order.status).toBe(201);
    const minutes = (Date.parse(order.body.order.reservedUntil) - before) / 60_000;
    expect(minutes).toBeGreaterThan(29.5);
    expect(minutes).toBeLessThan(30.5);
    expect(order.body.order.taxMinor).toBe(Math.round(order.body.order.priceMinor * 0.05));
    expect((await buyer.get("/api/v1/admin/settings")).status).toBe(403);
  });
});

describe("users", () => {
  it("searches by e-mail, name and role with listing and order counts, and filters suspended accounts", async () => {
    const res = await admin.get(`/api/v1/admin/users?query=${encodeURIComponent(sawyer.account.email)}`);
    expect(res.status).toBe(200);
    expect(res.body.users).toHaveLength(1);
    const row = res.body.users[0];
    expect(row.account.id).toBe(sawyer.account.id);
    const listings = await ctx.dataSource.getRepository(ListingEntity).countBy({ sawyerId: sawyer.account.id });
    const orders = await ctx.dataSource.getRepository(OrderEntity).countBy({ sawyerId: sawyer.account.id });
    expect(row.listingsCount).toBe(listings);
    expect(row.ordersCount).toBe(orders);
    expect(orders).toBeGreaterThanOrEqual(2);
    const suspended = (await admin.get("/api/v1/admin/users?suspended=yes")).body.users;
    expect(suspended.length).toBeGreaterThanOrEqual(1);
    expect(suspended.every((u: { suspended: boolean }) => u.suspended)).toBe(true);
    expect(
      (await admin.get("/api/v1/admin/users?role=buyer")).body.users.every(
        (u: { account: { role: string } }) => u.account.role === "buyer",
      ),
    ).toBe(true);
    expect((await admin.get("/api/v1/admin/users?role=wizard")).status).toBe(422);
  });
});

describe("dashboard", () => {
  it("counts what waits, what is live by species, review times, orders by state", async () => {
    await submitted(sawyer, { moisture: 8 });
    const res = await admin.get("/api/v1/admin/dashboard");
    expect(res.status).toBe(200);
    const d = res.body.dashboard;
    const waiting = await ctx.dataSource.getRepository(ListingEntity).countBy({ status: "in_review" });
    expect(d.awaitingReview.count).toBe(waiting);
    const live = await ctx.dataSource.getRepository(CatalogueEntryEntity).countBy({ speciesSlug: "black-cherry" });
    expect(d.liveBySpecies).toContainEqual({ speciesSlug: "black-cherry", count: live });
    expect(d.reviewTimes).toHaveLength(12);
    expect(d.reviewTimes.at(-1).reviews).toBeGreaterThanOrEqual(4);
    // The held order that expired on suspension was never paid: it is not an order here (admin-orders.test.ts has more).
    expect(await ctx.dataSource.getRepository(OrderEntity).countBy({ status: "expired" })).toBe(1);
    expect(d.ordersByState.map((o: { status: string }) => o.status)).not.toContain("expired");
    // Money per week straight from the ledger: a payment (sums to zero) and a refund of the platform fee this week.
    const now = new Date();
    await ctx.dataSource.getRepository(LedgerEntryEntity).insert([
      {
        orderId: null,
        account: "provider_clearing",
        amountMinor: 108_000,
        currency: "CAD",
        kind: "payment",
        providerEventId: null,
        createdAt: now,
      },
      {
        orderId: null,
        account: "platform_fees",
        amountMinor: -10_000,
        currency: "CAD",
        kind: "payment",
        providerEventId: null,
        createdAt: now,
      },
      {
        orderId: null,
        account: "tax_payable",
        amountMinor: -8_000,
        currency: "CAD",
        kind: "payment",
        providerEventId: null,
        createdAt: now,
      },
      { orderId: null, account: "sawyer:x", amountMinor: -90_000, currency: "CAD", kind: "payment", providerEventId: null, createdAt: now },
      {
        orderId: null,
        account: "platform_fees",
        amountMinor: 2_500,
        currency: "CAD",
        kind: "refund",
        providerEventId: null,
        createdAt: now,
      },
      {
        orderId: null,
        account: "provider_clearing",
        amountMinor: -2_500,
        currency: "CAD",
        kind: "refund",
        providerEventId: null,
        createdAt: now,
      },
    ]);
    const money = (await admin.get("/api/v1/admin/dashboard")).body.dashboard.salesByWeek.filter(
      (r: { currency: string }) => r.currency === "CAD",
    );
    expect(money).toEqual([{ week: weekStart(now), currency: "CAD", salesMinor: 108_000, platformRevenueMinor: 7_500 }]);
    expect(d.suspendedUsers).toBe(
      await ctx.dataSource.getRepository(AccountEntity).createQueryBuilder("a").where("a.suspended_at IS NOT NULL").getCount(),
    );
  });
});

describe("dashboard helpers", () => {
  it("weeks start on Monday (ISO 8601), in UTC", () => {
    expect(weekStart(new Date("2026-12-02T10:00:00Z"))).toBe("2026-11-30"); // a Wednesday
    expect(weekStart(new Date("2026-11-30T00:00:00Z"))).toBe("2026-11-30"); // the Monday itself
    expect(weekStart(new Date("2026-12-06T23:59:59Z"))).toBe("2026-11-30"); // the Sunday after
  });
  it("median of an odd and an even count", () => {
    expect(median([5, 1, 3])).toBe(3);
    expect(median([4, 1, 3, 2])).toBe(2.5);
    expect(median([])).toBe(0);
  });
});
