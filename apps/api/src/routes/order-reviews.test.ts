import { randomUUID } from "node:crypto";
import sharp from "sharp";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { AuditEntryEntity, ContentReportEntity, OrderEntity, OrderReviewEntity } from "../entities/index.ts";
import { until } from "../test-support/payments-harness.ts";
import { createTestContext, mailTo, testClock, type BrowserClient, type TestContext } from "../test-support/test-context.ts";

/*
 * Reviews of completed orders over HTTP, against real MariaDB and the real SMTP sink, with the
 * endpoint table's strict checks on (an undeclared error code or an answer outside the row's
 * schema is a 500): who may write, change, answer, hide and read them; the yard's rating on its
 * catalogue cards and slab pages; reporting a review. The orders are placed at a status directly
 * (the life-cycle that leads there has its own suites; services/order-review-service.test.ts
 * reviews orders that went the whole way through it).
 */
type Signed = BrowserClient & { account: { id: string; email: string; password: string } };
const DAY = 24 * 3_600_000;
const clock = testClock();
let ctx: TestContext;
let admin: Signed;
let sawyer: Signed;
let otherSawyer: Signed;
let listingId: string;

const good = { rating: 5, matchedListing: true, handoverWentWell: true, body: "Flat, dry and exactly as measured." };

/** A live listing of the sawyer (submitted with a photo, approved by the admin), so the catalogue shows the yard. */
async function liveListing(owner: Signed, title: string): Promise<string> {
  const slab = (
    await owner.post("/api/v1/yard/slabs", {
      speciesSlug: "black-cherry",
      lengthMm: 2100,
      thicknessMm: 50,
      widthStationsMm: [520, 500],
      liveEdge: "both",
      surfacing: "flattened",
      dryingMethod: "kiln",
    })
  ).body.slab;
  const id = (await owner.post("/api/v1/yard/listings", { title, slabIds: [slab.id], priceMode: "fixed", rateMinor: 60_000 })).body.listing
    .id as string;
  const photo = await sharp({ create: { width: 640, height: 480, channels: 3, background: "#8a4f32" } })
    .jpeg()
    .toBuffer();
  await owner.agent
    .post(`/api/v1/yard/listings/${id}/photos`)
    .set("x-csrf-token", owner.csrfToken)
    .set("content-type", "image/jpeg")
    .send(photo);
  expect((await owner.post(`/api/v1/yard/listings/${id}/submit`)).status).toBe(200);
  expect((await admin.post(`/api/v1/admin/listings/${id}/approve`)).status).toBe(200);
  return id;
}

/** An order of `buyer` from the sawyer at the given status (completed ones completed yesterday). */
async function orderAt(buyer: Signed, status: OrderEntity["status"], from: Signed = sawyer): Promise<string> {
  const id = randomUUID();
  const at = new Date(clock.now().getTime() - DAY);
  await ctx.dataSource.getRepository(OrderEntity).insert({
    id,
    buyerId: buyer.account.id,
    sawyerId: from.account.id,
    listingId,
    status,
    title: "Cherry bench top",
    slabSnapshot: [],
    currency: "USD",
    priceMinor: 60_000,
    platformFeeMinor: 6_000,
    processingFeeMinor: 1_770,
    sawyerNetMinor: 52_230,
    taxMinor: 0,
    totalMinor: 60_000,
    handover: "pickup",
    deliveryAddress: null,
    checkoutSessionId: null,
    checkoutUrl: null,
    paymentIntentId: null,
    reservedUntil: at,
    paidAt: at,
    ...(status === "completed" ? { handedOverAt: at, completedAt: at, completedBy: "buyer" as const } : {}),
  });
  return id;
}

const card = async () =>
  ((await (await ctx.client()).get("/api/v1/catalogue?limit=50")).body.results as { listingId: string; yardRating: unknown }[]).find(
    (c) => c.listingId === listingId,
  );
const slabPage = async () => (await (await ctx.client()).get(`/api/v1/catalogue/${listingId}`)).body;

beforeAll(async () => {
  ctx = await createTestContext({ clock, environment: { SIGN_IN_LIMIT_PER_IP: "1000", CATALOGUE_CACHE: "off" } });
  admin = (await ctx.signedInClient("admin")) as Signed;
  sawyer = (await ctx.signedInClient("sawyer", { yardName: "Tannery Row Slabs" })) as Signed;
  otherSawyer = (await ctx.signedInClient("sawyer")) as Signed;
  listingId = await liveListing(sawyer, "Cherry bench top");
}, 60_000);
afterAll(async () => ctx?.close());

describe("writing a review", () => {
  it("is for the buyer of a completed order only: not someone else's order, not before completion, not the sawyer", async () => {
    const buyer = (await ctx.signedInClient("buyer")) as Signed;
    const otherBuyer = (await ctx.signedInClient("buyer")) as Signed;
    const handedOver = await orderAt(buyer, "handed_over");
    expect((await buyer.post(`/api/v1/orders/${handedOver}/review`, good)).body.error.code).toBe("order_state");
    const refunded = await orderAt(buyer, "refunded");
    expect((await buyer.post(`/api/v1/orders/${refunded}/review`, good)).status).toBe(409);

    const completed = await orderAt(buyer, "completed");
    // Someone else's order: refused, and they cannot even read it.
    const stranger = await otherBuyer.post(`/api/v1/orders/${completed}/review`, good);
    expect(stranger.status).toBe(403);
    expect((await otherBuyer.get(`/api/v1/orders/${completed}/review`)).status).toBe(403);
    expect((await otherBuyer.patch(`/api/v1/orders/${completed}/review`, good)).status).toBe(403);
    expect((await sawyer.post(`/api/v1/orders/${completed}/review`, good)).status).toBe(403);
    expect((await (await ctx.client()).post(`/api/v1/orders/${completed}/review`, good)).status).toBe(401);
    expect((await buyer.post(`/api/v1/orders/${randomUUID()}/review`, good)).status).toBe(404);

    expect(await buyer.get(`/api/v1/orders/${completed}/review`).then((r) => r.body)).toEqual({ review: null, actions: ["write"] });
    const written = await buyer.post(`/api/v1/orders/${completed}/review`, good);
    expect(written.status).toBe(201);
    expect(written.body.review).toMatchObject({ orderId: completed, rating: 5, yardName: "Tannery Row Slabs", hidden: null });
    expect(written.body.actions).toEqual(["edit"]);
    // One per order.
    const again = await buyer.post(`/api/v1/orders/${completed}/review`, { ...good, rating: 1 });
    expect(again.status).toBe(409);
    expect(again.body.error.code).toBe("review_exists");
    await until(async () => (await mailTo(sawyer.account.email)).some((m) => /reviewed "Cherry bench top": 5 of 5/.test(m.subject)));
  });

  it("needs a rating of 1–5 and a comment for each no; nothing is stored otherwise", async () => {
    const buyer = (await ctx.signedInClient("buyer")) as Signed;
    const completed = await orderAt(buyer, "completed");
    const bad = await buyer.post(`/api/v1/orders/${completed}/review`, { rating: 0, matchedListing: false, handoverWentWell: false });
    expect(bad.status).toBe(422);
    expect(Object.keys(bad.body.error.fields).sort()).toEqual(["handoverComment", "matchedListingComment", "rating"]);
    expect((await buyer.post(`/api/v1/orders/${completed}/review`, { ...good, rating: 4.5 })).status).toBe(422);
    expect((await buyer.get(`/api/v1/orders/${completed}/review`)).body.review).toBeNull();
    const withNo = await buyer.post(`/api/v1/orders/${completed}/review`, {
      rating: 3,
      matchedListing: false,
      matchedListingComment: "A check ran further than the photos showed.",
      handoverWentWell: true,
    });
    expect(withNo.status).toBe(201);
    expect(withNo.body.review).toMatchObject({ matchedListing: false, handoverComment: "", body: "" });
  });
});

describe("changing and answering", () => {
  it("the buyer changes it for 14 days; the sawyer answers once; the buyer hears of the answer", async () => {
    const buyer = (await ctx.signedInClient("buyer")) as Signed;
    const completed = await orderAt(buyer, "completed");
    await buyer.post(`/api/v1/orders/${completed}/review`, { ...good, rating: 3 });
    const edited = await buyer.patch(`/api/v1/orders/${completed}/review`, { ...good, rating: 4, body: "Better after a second look." });
    expect(edited.status).toBe(200);
    expect(edited.body.review).toMatchObject({ rating: 4, body: "Better after a second look." });
    expect(edited.body.review.editedAt).not.toBeNull();

    expect((await otherSawyer.post(`/api/v1/orders/${completed}/review/answer`, { body: "Not mine" })).status).toBe(403);
    expect((await buyer.post(`/api/v1/orders/${completed}/review/answer`, { body: "Me too" })).status).toBe(403);
    const answered = await sawyer.post(`/api/v1/orders/${completed}/review/answer`, { body: "Thank you; send us a photo of the bench!" });
    expect(answered.status).toBe(201);
    expect(answered.body.review.answer.body).toBe("Thank you; send us a photo of the bench!");
    const twice = await sawyer.post(`/api/v1/orders/${completed}/review/answer`, { body: "One more thing" });
    expect(twice.body.error.code).toBe("review_answered");
    await until(async () => (await mailTo(buyer.account.email)).some((m) => /Tannery Row Slabs answered your review/.test(m.subject)));

    // Written 14 days and a minute ago (moving the clock instead would end the session: services/order-review-service.test.ts does that).
    await ctx.dataSource
      .getRepository(OrderReviewEntity)
      .update({ orderId: completed }, { createdAt: new Date(clock.now().getTime() - 14 * DAY - 60_000) });
    const late = await buyer.patch(`/api/v1/orders/${completed}/review`, { ...good, rating: 1 });
    expect(late.status).toBe(409);
    expect(late.body.error.code).toBe("review_edit_closed");
    expect((await buyer.get(`/api/v1/orders/${completed}/review`)).body).toMatchObject({ review: { rating: 4 }, actions: [] });
  });
});

describe("the yard's rating", () => {
  it("shows on its catalogue card and slab page, counts visible reviews only, and anyone reads the reviews", async () => {
    const rating = (await slabPage()).yard.rating;
    expect(rating.count).toBeGreaterThanOrEqual(3);
    const reviews = await (await ctx.client()).get(`/api/v1/yards/${sawyer.account.id}/reviews?limit=50`);
    expect(reviews.status).toBe(200);
    expect(reviews.body.rating).toEqual(rating);
    const ratings = reviews.body.reviews.map((r: { rating: number }) => r.rating) as number[];
    expect(rating.average).toBe(Math.round((ratings.reduce((a, b) => a + b, 0) * 10) / ratings.length) / 10);
    expect((await card())?.yardRating).toEqual({ average: rating.average, count: rating.count });
    // Public: the buyer by first names and an initial, no e-mail, no order id.
    const text = JSON.stringify(reviews.body);
    expect(text).not.toMatch(/@lakemont\.test|orderId/);
    expect(reviews.body.reviews[0].buyerLabel).toBe("Test B."); // "Test buyer", shortened
    expect(reviews.body.yard).toEqual({ id: sawyer.account.id, name: "Tannery Row Slabs", town: "Lakemont" });
    // Another yard without reviews: no rating on its page.
    expect((await (await ctx.client()).get(`/api/v1/yards/${otherSawyer.account.id}/reviews`)).body.rating).toEqual({
      count: 0,
      average: null,
      matchedListingPct: null,
      handoverPct: null,
    });
    expect((await (await ctx.client()).get(`/api/v1/yards/${randomUUID()}/reviews`)).status).toBe(404);
    expect((await (await ctx.client()).get(`/api/v1/yards/${sawyer.account.id}/reviews?cursor=nonsense`)).status).toBe(422);
  });
});

describe("moderation", () => {
  it("an admin hides a review with a reason (audited), it leaves the rating, the card follows; and shows it again", async () => {
    const buyer = (await ctx.signedInClient("buyer")) as Signed;
    const completed = await orderAt(buyer, "completed");
    const { review } = (await buyer.post(`/api/v1/orders/${completed}/review`, { ...good, rating: 1, body: "Bad words" })).body as {
      review: OrderReviewEntity;
    };
    const before = (await slabPage()).yard.rating;

    expect((await sawyer.post(`/api/v1/admin/order-reviews/${review.id}/hide`, { reason: "Not allowed" })).status).toBe(403);
    expect((await admin.post(`/api/v1/admin/order-reviews/${review.id}/hide`, { reason: "no" })).status).toBe(422);
    const hidden = await admin.post(`/api/v1/admin/order-reviews/${review.id}/hide`, { reason: "Insults, not a review of the slab." });
    expect(hidden.status).toBe(200);
    expect(hidden.body.review.hidden.reason).toBe("Insults, not a review of the slab.");
    expect((await admin.post(`/api/v1/admin/order-reviews/${review.id}/hide`, { reason: "Once more, please" })).body.error.code).toBe(
      "review_hidden",
    );
    const audit = await ctx.dataSource.getRepository(AuditEntryEntity).findOneByOrFail({ action: "review.hide", targetId: review.id });
    expect(audit).toMatchObject({ actorId: admin.account.id, reason: "Insults, not a review of the slab." });

    const after = (await slabPage()).yard.rating;
    expect(after.count).toBe(before.count - 1);
    expect((await card())?.yardRating).toMatchObject({ count: after.count });
    const publicList = (await (await ctx.client()).get(`/api/v1/yards/${sawyer.account.id}/reviews?limit=50`)).body.reviews;
    expect(publicList.map((r: { id: string }) => r.id)).not.toContain(review.id);
    // Its buyer sees why; it cannot be changed or answered while hidden.
    expect((await buyer.get(`/api/v1/orders/${completed}/review`)).body).toMatchObject({
      review: { hidden: { reason: "Insults, not a review of the slab." } },
      actions: [],
    });
    expect((await buyer.patch(`/api/v1/orders/${completed}/review`, good)).body.error.code).toBe("review_edit_closed");
    expect((await sawyer.post(`/api/v1/orders/${completed}/review/answer`, { body: "Noted." })).body.error.code).toBe("review_hidden");
    await until(async () => (await mailTo(buyer.account.email)).some((m) => /was hidden$/.test(m.subject)));
    const desk = (await admin.get("/api/v1/admin/order-reviews?hidden=yes")).body.reviews;
    expect(desk.map((r: { id: string }) => r.id)).toContain(review.id);

    const shown = await admin.post(`/api/v1/admin/order-reviews/${review.id}/show`, { reason: "The buyer rewrote it by e-mail." });
    expect(shown.status).toBe(200);
    expect(shown.body.review.hidden).toBeNull();
    expect((await admin.post(`/api/v1/admin/order-reviews/${review.id}/show`, { reason: "And again" })).body.error.code).toBe(
      "review_not_hidden",
    );
    expect((await slabPage()).yard.rating.count).toBe(before.count);
    expect(await ctx.dataSource.getRepository(AuditEntryEntity).countBy({ action: "review.show", targetId: review.id })).toBe(1);
  });

  it("the sawyer reports a review; the admin hides it from the report (not 'take down'); the report closes as review hidden", async () => {
    const buyer = (await ctx.signedInClient("buyer")) as Signed;
    const completed = await orderAt(buyer, "completed");
    const reviewId = (await buyer.post(`/api/v1/orders/${completed}/review`, { ...good, rating: 2, body: "Phone number 555-0100 call me" }))
      .body.review.id as string;
    // The buyer cannot report their own words; the sawyer (and anyone signed in) can.
    expect((await buyer.post("/api/v1/reports", { targetKind: "review", targetId: reviewId, reason: "Mine, oops" })).status).toBe(422);
    const filed = await sawyer.post("/api/v1/reports", {
      targetKind: "review",
      targetId: reviewId,
      reason: "A phone number to deal outside.",
    });
    expect(filed.status).toBe(201);
    expect((await sawyer.post("/api/v1/reports", { targetKind: "review", targetId: randomUUID(), reason: "No such review" })).status).toBe(
      404,
    );

    const open = (await admin.get("/api/v1/admin/reports")).body.reports.find((r: { targetId: string }) => r.targetId === reviewId);
    expect(open).toMatchObject({ targetKind: "review", reported: { id: buyer.account.id } });
    expect(open.excerpt).toContain("2 of 5");
    expect(open.excerpt).toContain("555-0100");
    const takeDown = await admin.post(`/api/v1/admin/reports/${open.id}/resolve`, { resolution: "take_down", note: "Wrong button here." });
    expect(takeDown.status).toBe(422);
    const resolved = await admin.post(`/api/v1/admin/reports/${open.id}/resolve`, {
      resolution: "hide_review",
      note: "Contact details to trade off the platform.",
    });
    expect(resolved.status).toBe(200);
    expect(resolved.body.report.status).toBe("review_hidden");
    expect((await ctx.dataSource.getRepository(ContentReportEntity).findOneByOrFail({ id: open.id })).status).toBe("review_hidden");
    expect((await buyer.get(`/api/v1/orders/${completed}/review`)).body.review.hidden.reason).toBe(
      "Contact details to trade off the platform.",
    );
    expect(await ctx.dataSource.getRepository(AuditEntryEntity).countBy({ action: "review.hide", targetId: reviewId })).toBe(1);
    // A hidden review is no longer there for others to report.
    const stranger = (await ctx.signedInClient("buyer")) as Signed;
    expect((await stranger.post("/api/v1/reports", { targetKind: "review", targetId: reviewId, reason: "Seen it before" })).status).toBe(
      404,
    );
  });
});
