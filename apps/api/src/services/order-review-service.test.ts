import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { AuditEntryEntity, OrderReviewEntity } from "../entities/index.ts";
import { Conflict, Forbidden, NotFound } from "../errors.ts";
import { createServiceHarness, type ServiceHarness } from "../test-support/service-harness.ts";
import { buyerLabel } from "./order-review-service.ts";

/*
 * Reviews through the services themselves, on orders that went the whole way through the real
 * life-cycle (checkout, the provider's payment event, hand-over, completion), with the payments
 * port and the mailer in memory, on a throwaway MariaDB schema. routes/order-reviews.test.ts
 * checks the same rules over HTTP, with the catalogue, reports and real mail.
 */
let h: ServiceHarness;
const DAY = 24 * 3_600_000;
const inFuture = (hours: number) => new Date(h.clock.now().getTime() + hours * 3_600_000).toISOString();
const good = { rating: 5, matchedListing: true, handoverWentWell: true, body: "Flat, dry and exactly as measured." };

beforeAll(async () => {
  h = await createServiceHarness({ autoCompleteDays: 14 });
}, 60_000);
afterAll(async () => h?.close());

/** A pickup order taken to hand-over through the order service (paid by the in-memory provider). */
async function handedOverOrder() {
  const sawyer = await h.person("sawyer");
  const buyer = await h.person("buyer");
  const order = await h.paidOrder(buyer, await h.liveListing(sawyer, 80_000));
  const windows = { windows: [{ startsAt: inFuture(30), endsAt: inFuture(32) }], pickupAddress: "Gate 1, 9 Sawpit Lane" };
  await h.orders.proposePickupWindows(sawyer, order.id, windows);
  await h.orders.choosePickupWindow(buyer, order.id, { startsAt: windows.windows[0]!.startsAt });
  // Handed over before the booked time (a day ahead): the sawyer says why.
  await h.orders.markHandedOver(sawyer, order.id, { reason: "The buyer came a day early with a trailer." });
  return { sawyer, buyer, orderId: order.id };
}

describe("reviews of completed orders", () => {
  it("only a completed order can be reviewed, once, by its buyer; the sawyer answers once", async () => {
    const { sawyer, buyer, orderId } = await handedOverOrder();
    const stranger = await h.person("buyer");
    // Handed over but not completed yet: nothing to write.
    expect((await h.reviews.state(buyer, orderId)).actions).toEqual([]);
    await expect(h.reviews.write(buyer, orderId, good)).rejects.toMatchObject({ code: "order_state" });
    await h.orders.confirmReceipt(buyer, orderId);
    expect(await h.reviews.state(buyer, orderId)).toEqual({ review: null, actions: ["write"] });
    expect((await h.reviews.state(sawyer, orderId)).actions).toEqual([]);

    // Someone else's order, or the sawyer writing about their own sale: refused, nothing stored.
    await expect(h.reviews.write(stranger, orderId, good)).rejects.toBeInstanceOf(Forbidden);
    await expect(h.reviews.write(sawyer, orderId, good)).rejects.toBeInstanceOf(Forbidden);
    await expect(h.reviews.state(stranger, orderId)).rejects.toBeInstanceOf(Forbidden);
    expect(await h.dataSource.getRepository(OrderReviewEntity).countBy({ orderId })).toBe(0);

    const written = await h.reviews.write(buyer, orderId, good);
    expect(written.actions).toEqual(["edit"]);
    expect(written.review).toMatchObject({ rating: 5, matchedListing: true, answer: null, hidden: null, editedAt: null });
    await expect(h.reviews.write(buyer, orderId, { ...good, rating: 1 })).rejects.toMatchObject({ code: "review_exists" });
    expect((await h.mailsTo(sawyer.email)).at(-1)?.subject).toMatch(/reviewed ".*": 5 of 5$/);

    expect((await h.reviews.state(sawyer, orderId)).actions).toEqual(["answer"]);
    await expect(h.reviews.answer(stranger, orderId, { body: "Not mine to answer" })).rejects.toBeInstanceOf(Forbidden);
    const answered = await h.reviews.answer(sawyer, orderId, { body: "Thank you, enjoy the table." });
    expect(answered.review?.answer?.body).toBe("Thank you, enjoy the table.");
    expect(answered.actions).toEqual([]);
    await expect(h.reviews.answer(sawyer, orderId, { body: "And again" })).rejects.toMatchObject({ code: "review_answered" });
    expect((await h.mailsTo(buyer.email)).at(-1)?.text).toContain("Thank you, enjoy the table.");
  });

  it("an order that completed by itself can be reviewed; two writes at once give one review", async () => {
    const { sawyer, buyer, orderId } = await handedOverOrder();
    h.clock.advance(15 * DAY);
    expect(await h.orders.completeDueOrders()).toBeGreaterThanOrEqual(1);
    const results = await Promise.allSettled([
      h.reviews.write(buyer, orderId, good),
      h.reviews.write(buyer, orderId, { ...good, rating: 3 }),
    ]);
    expect(results.filter((r) => r.status === "fulfilled")).toHaveLength(1);
    const refused = results.find((r) => r.status === "rejected") as PromiseRejectedResult;
    expect(refused.reason).toMatchObject({ code: "review_exists" });
    expect(await h.dataSource.getRepository(OrderReviewEntity).countBy({ orderId })).toBe(1);
    expect((await h.reviews.yardReviews(sawyer.accountId, { limit: 10 })).rating.count).toBe(1);
  });

  it("the buyer may change a review for 14 days, and not after", async () => {
    const { buyer, orderId } = await handedOverOrder();
    await h.orders.confirmReceipt(buyer, orderId);
    await h.reviews.write(buyer, orderId, { ...good, rating: 3, matchedListing: false, matchedListingComment: "Thinner at one end." });
    h.clock.advance(13 * DAY);
    const edited = await h.reviews.edit(buyer, orderId, { ...good, rating: 4 });
    expect(edited.review).toMatchObject({ rating: 4, matchedListing: true, matchedListingComment: "" });
    expect(edited.review?.editedAt).not.toBeNull();
    h.clock.advance(2 * DAY);
    await expect(h.reviews.edit(buyer, orderId, { ...good, rating: 1 })).rejects.toMatchObject({ code: "review_edit_closed" });
    expect((await h.reviews.state(buyer, orderId)).actions).toEqual([]);
    expect((await h.dataSource.getRepository(OrderReviewEntity).findOneByOrFail({ orderId })).rating).toBe(4);
  });

  it("a comment is required for a no, and a rating outside 1–5 is refused", async () => {
    const { buyer, orderId } = await handedOverOrder();
    await h.orders.confirmReceipt(buyer, orderId);
    await expect(h.reviews.write(buyer, orderId, { ...good, handoverWentWell: false })).rejects.toMatchObject({
      issues: [expect.objectContaining({ path: ["handoverComment"] })],
    });
    await expect(h.reviews.write(buyer, orderId, { ...good, rating: 6 })).rejects.toThrow();
    expect(await h.dataSource.getRepository(OrderReviewEntity).countBy({ orderId })).toBe(0);
  });

  it("an admin hides a review (audited, out of the rating, nothing more to change) and shows it again", async () => {
    const { sawyer, buyer, orderId } = await handedOverOrder();
    const admin = await h.person("admin");
    await h.orders.confirmReceipt(buyer, orderId);
    const { review } = await h.reviews.write(buyer, orderId, { ...good, rating: 2, body: "Rude words about the sawyer" });
    expect((await h.reviews.yardReviews(sawyer.accountId, { limit: 10 })).rating).toMatchObject({ count: 1, average: 2 });

    await expect(h.reviews.hide(buyer, review!.id, "Not an admin")).rejects.toBeInstanceOf(Forbidden);
    const hidden = await h.reviews.hide(admin, review!.id, "Insults instead of a review of the slab.");
    expect(hidden.hidden?.reason).toBe("Insults instead of a review of the slab.");
    await expect(h.reviews.hide(admin, review!.id, "Twice over")).rejects.toMatchObject({ code: "review_hidden" });
    const audit = await h.dataSource.getRepository(AuditEntryEntity).findOneByOrFail({ action: "review.hide", targetId: review!.id });
    expect(audit.reason).toBe("Insults instead of a review of the slab.");
    expect((await h.mailsTo(buyer.email)).at(-1)?.subject).toMatch(/was hidden$/);

    const yard = await h.reviews.yardReviews(sawyer.accountId, { limit: 10 });
    expect(yard.rating).toMatchObject({ count: 0, average: null });
    expect(yard.reviews).toEqual([]);
    expect((await h.reviews.state(buyer, orderId)).actions).toEqual([]);
    expect((await h.reviews.state(admin, orderId)).actions).toEqual(["show"]);
    await expect(h.reviews.edit(buyer, orderId, good)).rejects.toMatchObject({ code: "review_edit_closed" });
    await expect(h.reviews.answer(sawyer, orderId, { body: "Hm." })).rejects.toMatchObject({ code: "review_hidden" });

    await h.reviews.show(admin, review!.id, "The buyer explained; it stays up.");
    await expect(h.reviews.show(admin, review!.id, "Again please")).rejects.toBeInstanceOf(Conflict);
    expect((await h.reviews.yardReviews(sawyer.accountId, { limit: 10 })).rating.count).toBe(1);
    expect(await h.dataSource.getRepository(AuditEntryEntity).countBy({ action: "review.show", targetId: review!.id })).toBe(1);
  });

  it("lists a yard's reviews newest first, page by page, with the buyer's name shortened", async () => {
    const sawyer = await h.person("sawyer");
    for (const rating of [5, 4, 3]) {
      const buyer = await h.person("buyer");
      const order = await h.paidOrder(buyer, await h.liveListing(sawyer, 50_000), "freight");
      await h.orders.markShipped(sawyer, order.id, { carrier: "Lakeshore Freight", trackingReference: `LF-${rating}` });
      await h.orders.markHandedOver(sawyer, order.id);
      await h.orders.confirmReceipt(buyer, order.id);
      await h.reviews.write(buyer, order.id, { ...good, rating });
      h.clock.advance(1000);
    }
    const first = await h.reviews.yardReviews(sawyer.accountId, { limit: 2 });
    expect(first.rating).toMatchObject({ count: 3, average: 4, matchedListingPct: 100, handoverPct: 100 });
    expect(first.reviews.map((r) => r.rating)).toEqual([3, 4]);
    expect(first.reviews[0]!.buyerLabel).toMatch(/^Test buyer \d\.$/);
    const second = await h.reviews.yardReviews(sawyer.accountId, { limit: 2, cursor: first.nextCursor! });
    expect(second.reviews.map((r) => r.rating)).toEqual([5]);
    expect(second.nextCursor).toBeNull();
    await expect(h.reviews.yardReviews(first.reviews[0]!.id, { limit: 2 })).rejects.toBeInstanceOf(NotFound);
  });

  it("shortens names to the last word's initial", () => {
    expect(buyerLabel("Ana and Theo Brandt")).toBe("Ana and Theo B.");
    expect(buyerLabel("Ines Calloway")).toBe("Ines C.");
    expect(buyerLabel("Fernhill")).toBe("Fernhill");
    expect(buyerLabel("  ")).toBe("A buyer");
  });
});
