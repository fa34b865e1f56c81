import express from "express";
import request from "supertest";
import { afterAll, afterEach, beforeAll, describe, expect, it } from "vitest";
import { LedgerEntryEntity, ListingEntity, OrderRefundEntity, OutboxEmailEntity } from "../entities/index.ts";
import { Conflict, Forbidden, Invalid, ServiceUnavailable } from "../errors.ts";
import { orderEndpoints } from "@grainyard/contracts";
import { mountEndpoints, rowsOf } from "../http/endpoints.ts";
import { errorHandler } from "../http/errors.ts";
import { createLogger } from "../logger.ts";
import { orderHandlers } from "../routes/order-routes.ts";
import { createServiceHarness, type ServiceHarness } from "../test-support/service-harness.ts";

/*
 * The order's life-cycle through the services themselves, with the payments port and the mailer
 * in memory (fast; no HTTP, no webhooks to wait for) on a throwaway MariaDB schema. The same
 * journeys run against the payments fake through the official SDK in routes/checkout.test.ts and
 * routes/order-steps.test.ts.
 */
let h: ServiceHarness;
const DAY = 24 * 3_600_000;

beforeAll(async () => {
  h = await createServiceHarness({ autoCompleteDays: 14 });
}, 60_000);
afterEach(async () => h.ledgerBalanced());
afterAll(async () => h?.close());

const listingStatus = async (id: string) => (await h.dataSource.getRepository(ListingEntity).findOneByOrFail({ id })).status;
const inFuture = (hours: number) => new Date(h.clock.now().getTime() + hours * 3_600_000).toISOString();

describe("a paid order, step by step", () => {
  it("pickup: paid → ready for pickup → window chosen → handed over → completed, each step only by its party", async () => {
    const sawyer = await h.person("sawyer");
    const buyer = await h.person("buyer");
    const stranger = await h.person("buyer");
    const order = await h.paidOrder(buyer, await h.liveListing(sawyer, 90_000));
    expect(order.status).toBe("paid");
    expect((await h.orders.get(sawyer, order.id)).actions).toEqual(["propose_pickup_windows", "cancel"]);
    expect((await h.orders.get(buyer, order.id)).actions).toEqual(["cancel"]);

    const windows = { windows: [{ startsAt: inFuture(26), endsAt: inFuture(28) }], pickupAddress: "Gate 2, 40 Millrace Road" };
    await expect(h.orders.proposePickupWindows(buyer, order.id, windows)).rejects.toBeInstanceOf(Forbidden);
    await expect(h.orders.proposePickupWindows(stranger, order.id, windows)).rejects.toBeInstanceOf(Forbidden);
    await expect(h.orders.markShipped(sawyer, order.id, { carrier: "Lakeshore", trackingReference: "LFL-1" })).rejects.toMatchObject({
      code: "order_state",
    });
    const ready = await h.orders.proposePickupWindows(sawyer, order.id, windows);
    expect(ready.status).toBe("ready_for_pickup");
    expect((await h.orders.get(buyer, order.id)).actions).toEqual(["choose_pickup_window", "cancel"]);

    const chosen = await h.orders.choosePickupWindow(buyer, order.id, { startsAt: windows.windows[0]!.startsAt });
    expect(chosen.chosenPickupWindow).toEqual(windows.windows[0]);
    await expect(h.orders.confirmReceipt(buyer, order.id)).rejects.toBeInstanceOf(Conflict);
    await expect(h.orders.markHandedOver(buyer, order.id)).rejects.toBeInstanceOf(Forbidden);
    // The booked time (26 hours away) has not come: a reason is asked, and nothing changes without one.
    await expect(h.orders.markHandedOver(sawyer, order.id)).rejects.toMatchObject({ fields: { reason: expect.stringMatching(/Say why/) } });
    await expect(h.orders.markHandedOver(sawyer, order.id, { reason: "  " })).rejects.toBeInstanceOf(Invalid);
    expect((await h.orderOf(order.id)).status).toBe("ready_for_pickup");
    const early = await h.orders.markHandedOver(sawyer, order.id, { reason: "The buyer came by on Friday with a trailer." });
    expect(early).toMatchObject({ status: "handed_over", handOverNote: "The buyer came by on Friday with a trailer." });
    expect((await h.orders.get(buyer, order.id)).handOverNote).toBe("The buyer came by on Friday with a trailer.");
    expect((await h.orders.get(sawyer, order.id)).actions).toEqual([]);
    await expect(h.orders.cancel(buyer, order.id, { reason: "Too late for this" })).rejects.toMatchObject({ code: "order_state" });
    const done = await h.orders.confirmReceipt(buyer, order.id);
    expect(done).toMatchObject({ status: "completed", completedBy: "buyer", actions: [] });

    const subjects = (await h.mailsTo(buyer.email)).map((m) => m.subject.split(":")[0]);
    expect(subjects).toEqual(["Your order", "Choose a pickup time", "Pickup booked", "Handed over", "Completed"]);
  });

  it("pickup at or after the booked time: handed over without a reason, and no note is kept", async () => {
    const sawyer = await h.person("sawyer");
    const buyer = await h.person("buyer");
    const order = await h.paidOrder(buyer, await h.liveListing(sawyer, 50_000));
    const window = { startsAt: inFuture(2), endsAt: inFuture(4) };
    await h.orders.proposePickupWindows(sawyer, order.id, { windows: [window], pickupAddress: "Gate 2, 40 Millrace Road" });
    await h.orders.choosePickupWindow(buyer, order.id, { startsAt: window.startsAt });
    h.clock.advance(2 * 3_600_000);
    try {
      expect(await h.orders.markHandedOver(sawyer, order.id, { reason: "ignored when on time" })).toMatchObject({
        status: "handed_over",
        handOverNote: null,
      });
    } finally {
      h.clock.advance(-2 * 3_600_000);
    }
  });

  it("freight: shipped, handed over, then completed by itself once the days after hand-over ran out (once, however often the sweep runs)", async () => {
    const sawyer = await h.person("sawyer");
    const buyer = await h.person("buyer");
    const order = await h.paidOrder(buyer, await h.liveListing(sawyer, 40_000), "freight");
    expect((await h.orders.get(sawyer, order.id)).actions).toEqual(["mark_shipped", "cancel"]);
    await expect(h.orders.proposePickupWindows(sawyer, order.id, { windows: [], pickupAddress: "Yard" })).rejects.toMatchObject({
      code: "order_state",
    });
    expect((await h.orders.markShipped(sawyer, order.id, { carrier: "Lakeshore Freight", trackingReference: "LFL-77" })).status).toBe(
      "shipped",
    );
    expect((await h.orders.get(buyer, order.id)).actions).toEqual([]);
    await h.orders.markHandedOver(sawyer, order.id);
    h.clock.advance(13 * DAY);
    try {
      expect(await h.orders.completeDueOrders()).toBe(0);
      h.clock.advance(2 * DAY);
      expect(await h.orders.completeDueOrders()).toBeGreaterThanOrEqual(1);
      expect(await h.orders.completeDueOrders()).toBe(0);
    } finally {
      h.clock.advance(-15 * DAY);
    }
    expect(await h.orderOf(order.id)).toMatchObject({ status: "completed", completedBy: "automatic" });
  });

  it("two sweeps at the same moment (two instances, were the job's lease ever lost) complete each due order once, with one e-mail to each party", async () => {
    const sawyer = await h.person("sawyer");
    const buyer = await h.person("buyer");
    const orderIds: string[] = [];
    for (let i = 0; i < 4; i++) {
      const order = await h.paidOrder(buyer, await h.liveListing(sawyer, 30_000), "freight");
      await h.orders.markShipped(sawyer, order.id, { carrier: "Lakeshore Freight", trackingReference: `LFL-${i}` });
      await h.orders.markHandedOver(sawyer, order.id);
      orderIds.push(order.id);
    }
    h.clock.advance(15 * DAY);
    try {
      const [first, second] = await Promise.all([h.orders.completeDueOrders(), h.orders.completeDueOrders()]);
      // Other tests' orders may be due too; these four are completed by exactly one of the two sweeps.
      expect(first + second).toBeGreaterThanOrEqual(4);
      expect(await h.orders.completeDueOrders()).toBe(0);
    } finally {
      h.clock.advance(-15 * DAY);
    }
    for (const orderId of orderIds) {
      expect(await h.orderOf(orderId)).toMatchObject({ status: "completed", completedBy: "automatic" });
      const mails = await h.dataSource
        .getRepository(OutboxEmailEntity)
        .createQueryBuilder("mail")
        .where("mail.kind = 'order_completed' AND mail.text_body LIKE :link", { link: `%/orders/${orderId}%` })
        .getMany();
      expect(mails.map((mail) => mail.recipient).sort()).toEqual([buyer.email, sawyer.email].sort());
    }
  });
});

describe("paying", () => {
  it("a declined card keeps the hold and the hosted page open for another card; the provider down at Buy leaves nothing reserved", async () => {
    const sawyer = await h.person("sawyer");
    const buyer = await h.person("buyer");
    const listingId = await h.liveListing(sawyer, 30_000);
    const { order } = await h.checkout.checkout(buyer, listingId, { handover: "pickup" });
    const checkoutId = (await h.orderOf(order.id)).checkoutSessionId!;
    expect(h.payments.checkouts.get(checkoutId)).toMatchObject({ amountMinor: 31_500, currency: "USD", status: "open" });
    const declined = h.payments.decline(checkoutId);
    expect(await h.checkout.handleEvent(declined)).toBe("handled");
    expect(await h.checkout.handleEvent(declined)).toBe("duplicate");
    expect((await h.orderOf(order.id)).status).toBe("awaiting_payment");
    expect(await listingStatus(listingId)).toBe("reserved");
    expect(h.payments.checkouts.get(checkoutId)!.status).toBe("open");
    // The second card goes through on the same page.
    expect(await h.checkout.handleEvent(h.payments.pay(checkoutId))).toBe("handled");
    expect((await h.orderOf(order.id)).status).toBe("paid");
    expect(await listingStatus(listingId)).toBe("sold");
    // A decline reported after the payment changes nothing.
    expect(await h.checkout.handleEvent({ ...declined, eventId: "evt_late_decline" })).toBe("ignored");
    expect((await h.orderOf(order.id)).status).toBe("paid");

    const other = await h.liveListing(sawyer, 30_000);
    h.payments.down = true;
    try {
      await expect(h.checkout.checkout(buyer, other, { handover: "pickup" })).rejects.toBeInstanceOf(ServiceUnavailable);
    } finally {
      h.payments.down = false;
    }
    expect(await listingStatus(other)).toBe("live");
    expect(await h.checkout.ordersOfListing(other)).toEqual([]);
  });

  it("the webhook route verifies through the port: a signed event is handled once; an unsigned or altered one is refused and changes nothing", async () => {
    const sawyer = await h.person("sawyer");
    const buyer = await h.person("buyer");
    const listingId = await h.liveListing(sawyer, 35_000);
    const { order } = await h.checkout.checkout(buyer, listingId, { handover: "pickup" });
    const paid = h.payments.pay((await h.orderOf(order.id)).checkoutSessionId!);
    // The webhook's row of the endpoint table, mounted as the app mounts it.
    const app = express();
    const raw = express.raw({ type: () => true });
    const rows = rowsOf({ orders: orderEndpoints }, { orders: orderHandlers(h.checkout, h.orders, h.payments) });
    mountEndpoints(
      app,
      rows.filter((row) => row.key === "orders.paymentWebhook"),
      { bodyReaders: { json: express.json(), photo_bytes: raw, csv_text: raw, provider_event: raw }, strict: true },
    );
    app.use(errorHandler(createLogger("silent")));
    const post = (body: Buffer, signature?: string) => {
      const req = request(app).post(orderEndpoints.paymentWebhook.path).set("content-type", "application/json");
      // As text: a Buffer with a JSON content type would be re-encoded by supertest.
      return (signature ? req.set(h.payments.webhookSignatureHeader, signature) : req).send(body.toString("utf8"));
    };
    const { body, signature } = h.payments.signed(paid);
    expect((await post(body)).status).toBe(400);
    const altered = Buffer.from(body.toString().replace(order.id, "00000000-0000-0000-0000-000000000000"));
    expect((await post(altered, signature)).status).toBe(400);
    expect((await h.orderOf(order.id)).status).toBe("awaiting_payment");
    expect((await post(body, signature)).body).toEqual({ received: true, outcome: "handled" });
    expect((await post(body, signature)).body).toEqual({ received: true, outcome: "duplicate" });
    expect((await h.orderOf(order.id)).status).toBe("paid");
  });

  it("handles each event once: a repeated checkout_completed records one sale", async () => {
    const sawyer = await h.person("sawyer");
    const buyer = await h.person("buyer");
    const listingId = await h.liveListing(sawyer, 25_000);
    const { order } = await h.checkout.checkout(buyer, listingId, { handover: "pickup" });
    const paid = h.payments.pay((await h.orderOf(order.id)).checkoutSessionId!);
    expect(await h.checkout.handleEvent(paid)).toBe("handled");
    expect(await h.checkout.handleEvent(paid)).toBe("duplicate");
    expect(await h.dataSource.getRepository(LedgerEntryEntity).countBy({ orderId: order.id, account: "provider_clearing" })).toBe(1);
    expect((await h.mailsTo(buyer.email)).filter((m) => m.subject.startsWith("Your order"))).toHaveLength(1);
    expect(await listingStatus(listingId)).toBe("sold");
  });

  it("a payment arriving after the hold ran out, with the slab sold to someone else, is refunded in full through the refund service, once", async () => {
    const sawyer = await h.person("sawyer");
    const late = await h.person("buyer");
    const listingId = await h.liveListing(sawyer, 60_000);
    const { order } = await h.checkout.checkout(late, listingId, { handover: "pickup" });
    const checkoutId = (await h.orderOf(order.id)).checkoutSessionId!;
    const lateEvent = h.payments.pay(checkoutId); // paid, but the event is late
    h.clock.advance(16 * 60_000);
    try {
      expect(await h.checkout.sweepExpiredReservations()).toBeGreaterThanOrEqual(1);
    } finally {
      h.clock.advance(-16 * 60_000);
    }
    expect((await h.orderOf(order.id)).status).toBe("expired");
    const winner = await h.paidOrder(await h.person("buyer"), listingId);
    expect(winner.status).toBe("paid");

    expect(await h.checkout.handleEvent(lateEvent)).toBe("handled");
    const refunded = await h.orderOf(order.id);
    expect(refunded).toMatchObject({ status: "refunded", paymentIntentId: lateEvent.paymentId });
    expect(h.payments.refunds).toContainEqual(
      expect.objectContaining({
        paymentId: lateEvent.paymentId,
        cause: "sold_elsewhere",
        amountMinor: 63_000,
        idempotencyKey: `late-${order.id}`,
      }),
    );
    expect(refunded.refundId).toBe(h.payments.refunds.find((r) => r.paymentId === lateEvent.paymentId)!.refundId);
    expect(await h.dataSource.getRepository(OrderRefundEntity).findBy({ orderId: order.id })).toMatchObject([
      { kind: "sold_elsewhere", amountMinor: 63_000, createdBy: null, providerRefundId: refunded.refundId },
    ]);
    expect(await h.dataSource.getRepository(LedgerEntryEntity).countBy({ orderId: order.id })).toBe(0);
    expect(await h.checkout.handleEvent(lateEvent)).toBe("duplicate");
    expect(h.payments.refunds.filter((r) => r.paymentId === lateEvent.paymentId)).toHaveLength(1);
    expect(await listingStatus(listingId)).toBe("sold");
  });

  it("if the provider does not take the late refund, nothing is kept: the event's retry does it all", async () => {
    const sawyer = await h.person("sawyer");
    const listingId = await h.liveListing(sawyer, 20_000);
    const { order } = await h.checkout.checkout(await h.person("buyer"), listingId, { handover: "pickup" });
    const lateEvent = h.payments.pay((await h.orderOf(order.id)).checkoutSessionId!);
    h.clock.advance(16 * 60_000);
    try {
      await h.checkout.sweepExpiredReservations();
    } finally {
      h.clock.advance(-16 * 60_000);
    }
    await h.paidOrder(await h.person("buyer"), listingId);
    h.payments.failNext("refund", "unavailable");
    await expect(h.checkout.handleEvent(lateEvent)).rejects.toThrow(/did not answer/);
    expect((await h.orderOf(order.id)).status).toBe("expired");
    expect(await h.dataSource.getRepository(OrderRefundEntity).countBy({ orderId: order.id })).toBe(0);
    expect(await h.checkout.handleEvent(lateEvent)).toBe("handled");
    expect((await h.orderOf(order.id)).status).toBe("refunded");
  });
});

describe("cancelling and its refund", () => {
  it("the buyer cancels: one full refund keyed by the order, the sale reversed, the slab back on sale; the provider's refunded event changes nothing more", async () => {
    const sawyer = await h.person("sawyer");
    const buyer = await h.person("buyer");
    const listingId = await h.liveListing(sawyer, 150_000);
    const order = await h.paidOrder(buyer, listingId);
    const cancelled = await h.orders.cancel(buyer, order.id, { reason: "Our dining room plans changed." });
    expect(cancelled).toMatchObject({ status: "refunded", cancelledBy: "buyer", actions: [] });
    expect(h.payments.refunds.filter((r) => r.orderId === order.id)).toEqual([
      expect.objectContaining({ cause: "cancellation", idempotencyKey: `refund-${order.id}`, amountMinor: 157_500 }),
    ]);
    expect(await listingStatus(listingId)).toBe("live");
    const entries = await h.dataSource.getRepository(LedgerEntryEntity).findBy({ orderId: order.id });
    expect(entries.filter((e) => e.kind === "refund")).toHaveLength(entries.filter((e) => e.kind === "payment").length);
    expect(await h.checkout.handleEvent(h.payments.refundedEvent(order.paymentIntentId!))).toBe("ignored");
    expect(await h.dataSource.getRepository(LedgerEntryEntity).countBy({ orderId: order.id })).toBe(entries.length);
    await expect(h.orders.cancel(sawyer, order.id, { reason: "Again" })).rejects.toMatchObject({ code: "order_state" });
    expect((await h.mailsTo(sawyer.email)).map((m) => m.subject)).toContain(`Cancelled and refunded: ${order.title}`);
  });

  it("the provider down: cancelled at once, refunded by the retry sweep with the same key; its event first and our answer second fill in one refund", async () => {
    const sawyer = await h.person("sawyer");
    const buyer = await h.person("buyer");
    const first = await h.paidOrder(buyer, await h.liveListing(sawyer, 40_000));
    const second = await h.paidOrder(buyer, await h.liveListing(sawyer, 60_000));
    h.payments.down = true;
    try {
      for (const order of [first, second])
        expect((await h.orders.cancel(sawyer, order.id, { reason: "Found a crack right through." })).status).toBe("cancelled");
      expect(await h.orders.retryPendingRefunds()).toBe(0);
    } finally {
      h.payments.down = false;
    }
    const pending = await h.dataSource.getRepository(OrderRefundEntity).findBy({ orderId: first.id });
    expect(pending).toMatchObject([{ kind: "cancellation", providerRefundId: null, createdBy: sawyer.accountId }]);

    // The second: the provider took the refund but our answer was lost; its event arrives first.
    await h.payments.refund({
      paymentId: second.paymentIntentId!,
      orderId: second.id,
      cause: "cancellation",
      idempotencyKey: `refund-${second.id}`,
    });
    expect(await h.checkout.handleEvent(h.payments.refundedEvent(second.paymentIntentId!))).toBe("handled");
    expect(await h.orderOf(second.id)).toMatchObject({ status: "refunded", refundId: null });
    // Our retry then replays the same key: no second refund, and the refund's id is filled in.
    expect(await h.refunds.refundCancelledOrder(await h.orderOf(second.id))).toBe(true);
    const replayed = h.payments.refunds.filter((r) => r.orderId === second.id);
    expect(replayed).toHaveLength(1);
    expect((await h.orderOf(second.id)).refundId).toBe(replayed[0]!.refundId);

    // The sweep refunds the first, once.
    expect(await h.orders.retryPendingRefunds()).toBe(1);
    expect(await h.orders.retryPendingRefunds()).toBe(0);
    expect((await h.orderOf(first.id)).status).toBe("refunded");
    expect(h.payments.refunds.filter((r) => r.orderId === first.id)).toHaveLength(1);
    for (const order of [first, second]) {
      const payment = await h.dataSource.getRepository(LedgerEntryEntity).countBy({ orderId: order.id, kind: "payment" });
      expect(await h.dataSource.getRepository(LedgerEntryEntity).countBy({ orderId: order.id, kind: "refund" })).toBe(payment);
    }
  });
});

describe("a payment whose event never came", () => {
  it("is confirmed by asking the provider: once, and the provider's own event afterwards changes nothing", async () => {
    const sawyer = await h.person("sawyer");
    const buyer = await h.person("buyer");
    const listingId = await h.liveListing(sawyer, 42_000);
    const { order } = await h.checkout.checkout(buyer, listingId, { handover: "pickup" });
    // Nothing to confirm before the buyer pays.
    expect(await h.checkout.reconcilePayment(order.id)).toBe("ignored");
    const event = h.payments.pay((await h.orderOf(order.id)).checkoutSessionId!);
    expect(await h.checkout.reconcilePayment(order.id)).toBe("handled");
    expect(await h.orderOf(order.id)).toMatchObject({ status: "paid", paymentIntentId: event.paymentId });
    expect(await listingStatus(listingId)).toBe("sold");
    expect(await h.checkout.reconcilePayment(order.id)).toBe("duplicate");
    expect(await h.checkout.handleEvent(event)).toBe("ignored");
    const sales = await h.dataSource.getRepository(LedgerEntryEntity).countBy({ orderId: order.id, kind: "payment" });
    expect(sales).toBeGreaterThan(0);
    expect(await h.dataSource.getRepository(LedgerEntryEntity).countBy({ orderId: order.id })).toBe(sales);
  });
});
