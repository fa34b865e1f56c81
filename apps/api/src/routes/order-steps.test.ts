import type { Server } from "node:http";
import sharp from "sharp";
import request from "supertest";
import { afterAll, afterEach, beforeAll, describe, expect, it } from "vitest";
import type { PaymentsFakeApp } from "@grainyard/payments-fake";
import { LedgerEntryEntity, ListingEntity, OrderEntity, OrderRefundEntity } from "../entities/index.ts";
import {
  expectLedgerBalanced,
  listenForWebhooks,
  startPaymentsFake,
  until,
  type TestPaymentsFake,
} from "../test-support/payments-harness.ts";
import { instantToYardTime, yardTimeToInstant } from "@grainyard/contracts";
import { createTestContext, mailTo, testClock, type BrowserClient, type TestContext } from "../test-support/test-context.ts";
import { payOnHostedPage } from "../test-support/hosted-payment.ts";

/*
 * The steps after payment — pickup windows or freight, hand-over, completion (by the buyer or by
 * the sweep), cancellation with a full refund — against a payments fake of this test's own
 * (through the official SDK), real MariaDB and the real SMTP sink.
 */
const WEBHOOK_SECRET = "whsec_order_steps_test";
let payments: TestPaymentsFake;
let webhookUrl = "";
let fake: PaymentsFakeApp;
let fakeServer: Server;
let fakePort = 0;
let apiServer: Server;
let ctx: TestContext;
const clock = testClock();
let sawyer: BrowserClient & { account: { id: string; email: string } };
let admin: BrowserClient;
let photo: Buffer;
const app = () => ctx.app as unknown as { orders: { completeDueOrders(): Promise<number>; retryPendingRefunds(): Promise<number> } };

async function liveListing(priceMinor: number) {
  const slab = (
    await sawyer.post("/api/v1/yard/slabs", {
      speciesSlug: "white-oak",
      lengthMm: 2400,
      thicknessMm: 50,
      widthStationsMm: [700, 680],
      liveEdge: "both",
      surfacing: "flattened",
      dryingMethod: "kiln",
    })
  ).body.slab;
  const listing = (
    await sawyer.post("/api/v1/yard/listings", {
      title: `Oak top ${Math.random().toString(36).slice(2, 6)}`,
      slabIds: [slab.id],
      priceMode: "fixed",
      rateMinor: priceMinor,
      freight: true,
    })
  ).body.listing;
  await sawyer.agent
    .post(`/api/v1/yard/listings/${listing.id}/photos`)
    .set("x-csrf-token", sawyer.csrfToken)
    .set("content-type", "image/jpeg")
    .send(photo);
  await sawyer.post(`/api/v1/yard/listings/${listing.id}/submit`);
  await admin.post(`/api/v1/admin/listings/${listing.id}/approve`);
  return listing.id as string;
}

const orderOf = async (id: string) => ctx.dataSource.getRepository(OrderEntity).findOneByOrFail({ id });
const listingStatus = async (id: string) => (await ctx.dataSource.getRepository(ListingEntity).findOneByOrFail({ id })).status;
const ledgerSumsToZero = () => expectLedgerBalanced(ctx.dataSource);
const mailed = (address: string, subject: RegExp) => until(async () => (await mailTo(address)).some((m) => subject.test(m.subject)));

/** A buyer buys a fresh listing with the test card; resolves once the webhook made the order paid. */
async function paidOrder(handover: "pickup" | "freight", priceMinor = 90_000) {
  const listingId = await liveListing(priceMinor);
  const buyer = await ctx.signedInClient("buyer");
  const res = await buyer.post(
    `/api/v1/listings/${listingId}/checkout`,
    handover === "freight" ? { handover, deliveryAddress: "7 Heron Walk, Lakemont" } : { handover },
  );
  expect(res.status).toBe(201);
  const paid = await payOnHostedPage(res.body.checkoutUrl);
  expect(paid.status).toBe(303);
  await until(async () => (await orderOf(res.body.order.id)).status === "paid");
  return { buyer, listingId, orderId: res.body.order.id as string };
}

const hours = (n: number) => new Date(clock.now().getTime() + n * 3_600_000).toISOString();
const windowsInput = () => ({
  windows: [
    { startsAt: hours(48), endsAt: hours(50) },
    { startsAt: hours(24), endsAt: hours(26) },
  ],
  pickupAddress: "Gate 2, 48 Sawmill Road, Lakemont",
});

beforeAll(async () => {
  payments = await startPaymentsFake({ secretKey: "sk_test_steps", webhookSecret: WEBHOOK_SECRET });
  ({ fake, server: fakeServer } = payments);
  fakePort = payments.port;
  ctx = await createTestContext({
    clock,
    environment: { ...payments.environment, TAX_RATE_BPS: "500", AUTO_COMPLETE_DAYS: "14", SIGN_IN_LIMIT_PER_IP: "1000" },
  });
  ({ server: apiServer, webhookUrl } = await listenForWebhooks(ctx.app));
  fake.webhooks.options.url = webhookUrl;
  sawyer = await ctx.signedInClient("sawyer", {
    yardName: "Heron Bay Slabs",
    pickupTown: "Lakemont",
    pickupLatitude: 44.618,
    pickupLongitude: -85.402,
  });
  admin = await ctx.signedInClient("admin");
  photo = await sharp({ create: { width: 640, height: 480, channels: 3, background: "#9a6a3a" } })
    .jpeg()
    .toBuffer();
}, 60_000);
afterEach(async () => ledgerSumsToZero());
afterAll(async () => {
  await new Promise((r) => apiServer.close(r));
  await payments.close();
  await ctx?.close();
});

describe("order steps after payment", () => {
  it("pickup: the sawyer proposes windows, the buyer picks one, hand-over, the buyer confirms; each step stamped and mailed to both", async () => {
    const { buyer, orderId } = await paidOrder("pickup");
    const path = `/api/v1/orders/${orderId}`;
    // The buyer and the admin see it in their lists; another buyer does not.
    expect((await buyer.get("/api/v1/orders")).body.orders.map((o: { id: string }) => o.id)).toEqual([orderId]);
    expect((await admin.get("/api/v1/orders")).body.orders.map((o: { id: string }) => o.id)).toContain(orderId);
    expect((await (await ctx.signedInClient("buyer")).get("/api/v1/orders")).body.orders).toEqual([]);

    // Only the sawyer proposes; bad windows are a 422 with field messages, and change nothing.
    expect((await buyer.post(`${path}/pickup-windows`, windowsInput())).status).toBe(403);
    const none = await sawyer.post(`${path}/pickup-windows`, { windows: [], pickupAddress: "Gate 2" });
    expect(none.status).toBe(422);
    expect(none.body.error.fields.windows).toMatch(/at least one/);
    const six = await sawyer.post(`${path}/pickup-windows`, {
      windows: Array.from({ length: 6 }, (_, i) => ({ startsAt: hours(24 + i * 3), endsAt: hours(25 + i * 3) })),
      pickupAddress: "Gate 2",
    });
    expect(six.status).toBe(422);
    const backwards = await sawyer.post(`${path}/pickup-windows`, {
      windows: [{ startsAt: hours(30), endsAt: hours(29) }],
      pickupAddress: "Gate 2",
    });
    expect(backwards.body.error.fields["windows.0.endsAt"]).toMatch(/end after/);
    const past = await sawyer.post(`${path}/pickup-windows`, {
      windows: [{ startsAt: hours(-3), endsAt: hours(-1) }],
      pickupAddress: "Gate 2",
    });
    expect(past.body.error.fields["windows.0.startsAt"]).toMatch(/future/);
    expect((await orderOf(orderId)).status).toBe("paid");

    const input = windowsInput();
    const proposed = await sawyer.post(`${path}/pickup-windows`, input);
    expect(proposed.status).toBe(200);
    expect(proposed.body.order).toMatchObject({
      status: "ready_for_pickup",
      pickupAddress: "Gate 2, 48 Sawmill Road, Lakemont",
      chosenPickupWindow: null,
      actions: ["propose_pickup_windows", "mark_handed_over", "cancel"],
    });
    // Sorted by start.
    expect(proposed.body.order.pickupWindows.map((w: { startsAt: string }) => w.startsAt)).toEqual([
      input.windows[1]!.startsAt,
      input.windows[0]!.startsAt,
    ]);
    expect(proposed.body.order.steps.readyForPickupAt).not.toBeNull();
    await mailed(buyer.account.email, /^Choose a pickup time/);
    await mailed(sawyer.account.email, /^Pickup times sent/);

    // The buyer picks one of the proposed windows (and only those).
    expect((await sawyer.post(`${path}/pickup-choice`, { startsAt: proposed.body.order.pickupWindows[0].startsAt })).status).toBe(403);
    const stranger = await buyer.post(`${path}/pickup-choice`, { startsAt: hours(100) });
    expect(stranger.status).toBe(422);
    const chosen = await buyer.post(`${path}/pickup-choice`, { startsAt: proposed.body.order.pickupWindows[1].startsAt });
    expect(chosen.status).toBe(200);
    expect(chosen.body.order.chosenPickupWindow).toEqual(proposed.body.order.pickupWindows[1]);
    await mailed(buyer.account.email, /^Pickup booked/);
    await mailed(sawyer.account.email, /^The buyer chose a pickup time/);
    const booked = (await mailTo(buyer.account.email)).find((m) => /^Pickup booked/.test(m.subject))!;
    expect(booked.text).toContain("Gate 2, 48 Sawmill Road, Lakemont");
    expect(booked.text).toMatch(/two people or a machine/);
    // In the yard's own time (Lakemont keeps US Eastern time), named, not UTC.
    expect(booked.text).toMatch(/\d(:\d{2})?–\d{1,2}(:\d{2})? [ap]m, yard time \(America\/Detroit\)/);

    // The buyer cannot confirm before hand-over: 409 with a plain message.
    const early = await buyer.post(`${path}/completion`);
    expect(early.status).toBe(409);
    expect(early.body.error.message).toBe("This order is ready for pickup, so it cannot be confirmed as received now.");

    expect((await buyer.post(`${path}/handed-over`)).status).toBe(403);
    // Before the booked time: a reason is asked (422 on the field), then taken and shown on the order.
    const noReason = await sawyer.post(`${path}/handed-over`);
    expect(noReason.status).toBe(422);
    expect(noReason.body.error.fields.reason).toMatch(/before the booked time/);
    expect((await orderOf(orderId)).status).toBe("ready_for_pickup");
    const handed = await sawyer.post(`${path}/handed-over`, { reason: "Collected a day early; the buyer was passing." });
    expect(handed.status).toBe(200);
    expect(handed.body.order.status).toBe("handed_over");
    expect((await buyer.get(path)).body.order.handOverNote).toBe("Collected a day early; the buyer was passing.");
    const handedOverAt = (await orderOf(orderId)).handedOverAt!;
    expect(handedOverAt).toBeInstanceOf(Date);
    // Completes by itself 14 days after hand-over unless the buyer confirms first.
    expect(Date.parse(handed.body.order.autoCompleteAt) - handedOverAt.getTime()).toBe(14 * 86_400_000);
    expect((await sawyer.post(`${path}/handed-over`)).status).toBe(409);
    await mailed(buyer.account.email, /^Handed over/);
    await mailed(sawyer.account.email, /^Handed over/);

    expect((await sawyer.post(`${path}/completion`)).status).toBe(403);
    const done = await buyer.post(`${path}/completion`);
    expect(done.status).toBe(200);
    expect(done.body.order).toMatchObject({ status: "completed", completedBy: "buyer", actions: [] });
    const stamped = await orderOf(orderId);
    expect(stamped.completedAt!.getTime()).toBeGreaterThanOrEqual(handedOverAt.getTime());
    expect(stamped.paidAt).not.toBeNull();
    expect(stamped.readyForPickupAt).not.toBeNull();
    expect(stamped.pickupChosenAt).not.toBeNull();
    await mailed(buyer.account.email, /^Completed/);
    const sawyerDone = (await mailTo(sawyer.account.email)).find((m) => /^Completed/.test(m.subject))!;
    expect(sawyerDone.text).toContain("Your net for this sale");
    expect((await buyer.post(`${path}/completion`)).status).toBe(409);
    // A completed order can no longer be cancelled.
    expect((await buyer.post(`${path}/cancellation`, { reason: "Changed my mind" })).status).toBe(409);
  });

  it("a window entered as 09:00–11:00 yard time is stored with the yard's zone and reads 9–11 am yard time in the answer and every e-mail", async () => {
    const { buyer, orderId } = await paidOrder("pickup");
    const path = `/api/v1/orders/${orderId}`;
    // Lakemont (44.618, −85.402) lies in Michigan's lower peninsula: US Eastern time (IANA tz database: America/Detroit).
    const zone = "America/Detroit";
    expect((await sawyer.get(path)).body.order.pickupTimeZone).toBe(zone);
    // What the sawyer's form sends for 09:00–11:00 typed on the yard's day after tomorrow.
    const day = instantToYardTime(new Date(clock.now().getTime() + 2 * 86_400_000), zone).day;
    const startsAt = yardTimeToInstant(day, "09:00", zone)!;
    const endsAt = yardTimeToInstant(day, "11:00", zone)!;
    // Eastern time is UTC−5 (EST) or UTC−4 (EDT): 09:00 there is 14:00 or 13:00 UTC, whatever this machine's zone.
    expect([13, 14]).toContain(startsAt.getUTCHours());
    expect(endsAt.getTime() - startsAt.getTime()).toBe(2 * 3_600_000);
    const proposed = await sawyer.post(`${path}/pickup-windows`, {
      windows: [{ startsAt: startsAt.toISOString(), endsAt: endsAt.toISOString() }],
      pickupAddress: "Gate 2, 48 Sawmill Road, Lakemont",
    });
    expect(proposed.status).toBe(200);
    expect(proposed.body.order.pickupTimeZone).toBe(zone);
    const stored = await orderOf(orderId);
    expect(stored.pickupTimeZone).toBe(zone);
    expect(stored.pickupWindows).toEqual([{ startsAt: startsAt.toISOString(), endsAt: endsAt.toISOString() }]);

    const [year, month, date] = day.split("-").map(Number) as [number, number, number];
    const weekday = new Intl.DateTimeFormat("en-GB", { weekday: "short", timeZone: "UTC" }).format(Date.UTC(year, month - 1, date));
    const monthName = new Intl.DateTimeFormat("en-GB", { month: "short", timeZone: "UTC" }).format(Date.UTC(year, month - 1, date));
    const expected = `${weekday} ${date} ${monthName}, 9–11 am, yard time (America/Detroit)`;
    await mailed(buyer.account.email, /^Choose a pickup time/);
    const offered = (await mailTo(buyer.account.email)).find((m) => /^Choose a pickup time/.test(m.subject))!;
    expect(offered.text).toContain(`1. ${expected}`);
    const chosen = await buyer.post(`${path}/pickup-choice`, { startsAt: startsAt.toISOString() });
    expect(chosen.status).toBe(200);
    const subject = `The buyer chose a pickup time: ${proposed.body.order.title}`;
    await until(async () => (await mailTo(sawyer.account.email)).some((m) => m.subject === subject));
    const told = (await mailTo(sawyer.account.email)).find((m) => m.subject === subject)!;
    expect(told.text).toContain(expected);
  });

  it("freight: shipped with carrier and tracking, handed over, then completed by the sweep after AUTO_COMPLETE_DAYS (once, even with two sweeps at once)", async () => {
    const { buyer, orderId } = await paidOrder("freight");
    const path = `/api/v1/orders/${orderId}`;
    // Pickup windows are for pickup orders; hand-over needs the shipment first.
    expect((await sawyer.post(`${path}/pickup-windows`, windowsInput())).status).toBe(409);
    const tooSoon = await sawyer.post(`${path}/handed-over`);
    expect(tooSoon.status).toBe(409);
    expect(tooSoon.body.error.message).toBe("This order is paid, so it cannot be marked as handed over now.");
    const blank = await sawyer.post(`${path}/shipment`, { carrier: "", trackingReference: "" });
    expect(blank.status).toBe(422);
    expect(Object.keys(blank.body.error.fields).sort()).toEqual(["carrier", "trackingReference"]);

    const shipped = await sawyer.post(`${path}/shipment`, { carrier: "Lakeshore Freight Lines", trackingReference: "LFL-2026-11873" });
    expect(shipped.status).toBe(200);
    expect(shipped.body.order).toMatchObject({
      status: "shipped",
      carrier: "Lakeshore Freight Lines",
      trackingReference: "LFL-2026-11873",
    });
    expect((await sawyer.post(`${path}/shipment`, { carrier: "Again", trackingReference: "AGAIN-1" })).status).toBe(409);
    // On its way: no longer cancellable from the app.
    expect((await buyer.post(`${path}/cancellation`, { reason: "Too slow" })).status).toBe(409);
    await mailed(buyer.account.email, /^On its way/);
    const onItsWay = (await mailTo(buyer.account.email)).find((m) => /^On its way/.test(m.subject))!;
    expect(onItsWay.text).toContain("LFL-2026-11873");
    await mailed(sawyer.account.email, /^Marked as shipped/);

    expect((await sawyer.post(`${path}/handed-over`)).status).toBe(200);
    // 13 days later: not yet.
    clock.advance(13 * 86_400_000);
    try {
      await app().orders.completeDueOrders();
      expect((await orderOf(orderId)).status).toBe("handed_over");
      clock.advance(1 * 86_400_000 + 60_000);
      // Two instances sweeping at the same moment: the conditional update lets one of them win.
      const [a, b] = await Promise.all([app().orders.completeDueOrders(), app().orders.completeDueOrders()]);
      expect((await orderOf(orderId)).status).toBe("completed");
      expect((await orderOf(orderId)).completedBy).toBe("automatic");
      expect(a + b).toBeGreaterThanOrEqual(1);
      expect(await app().orders.completeDueOrders()).toBe(0);
    } finally {
      clock.advance(-(14 * 86_400_000 + 60_000));
    }
    await mailed(buyer.account.email, /^Completed/);
    const completedMails = (await mailTo(buyer.account.email)).filter((m) => /^Completed/.test(m.subject));
    expect(completedMails).toHaveLength(1);
    expect(completedMails[0]!.text).toMatch(/14 days have passed since hand-over/);
  });

  it("lets exactly one of 12 simultaneous hand-over clicks through; the rest hear 409", async () => {
    const { orderId } = await paidOrder("freight");
    await sawyer.post(`/api/v1/orders/${orderId}/shipment`, { carrier: "Lakeshore Freight Lines", trackingReference: "LFL-RACE-1" });
    const answers = await Promise.all(Array.from({ length: 12 }, () => sawyer.post(`/api/v1/orders/${orderId}/handed-over`)));
    expect(answers.filter((a) => a.status === 200)).toHaveLength(1);
    expect(answers.filter((a) => a.status === 409)).toHaveLength(11);
  });

  it("only the buyer and the sawyer of the order act on it; others get 403, anonymous 401", async () => {
    const { orderId } = await paidOrder("pickup");
    const otherBuyer = await ctx.signedInClient("buyer");
    const otherSawyer = await ctx.signedInClient("sawyer");
    for (const client of [otherBuyer, otherSawyer, admin]) {
      expect((await client.post(`/api/v1/orders/${orderId}/pickup-windows`, windowsInput())).status).toBe(403);
      expect((await client.post(`/api/v1/orders/${orderId}/cancellation`, { reason: "Not mine to cancel" })).status).toBe(403);
    }
    expect((await request(ctx.app).get(`/api/v1/orders/${orderId}`)).status).toBe(401);
    expect((await orderOf(orderId)).status).toBe("paid");
  });
});

describe("cancelling before hand-over", () => {
  it("the buyer cancels: a full refund through the provider, the slab back on sale, the sale reversed in the ledger — and the refund webhook changes nothing more", async () => {
    const { buyer, orderId, listingId } = await paidOrder("pickup", 150_000);
    await sawyer.post(`/api/v1/orders/${orderId}/pickup-windows`, windowsInput());
    expect(await listingStatus(listingId)).toBe("sold");
    const noReason = await buyer.post(`/api/v1/orders/${orderId}/cancellation`, { reason: "" });
    expect(noReason.status).toBe(422);
    expect(noReason.body.error.fields.reason).toMatch(/why/);

    fake.webhooks.options.copies = 3;
    fake.webhooks.options.shuffle = true;
    let res;
    try {
      const answeredBefore = fake.webhooks.deliveredCopies();
      res = await buyer.post(`/api/v1/orders/${orderId}/cancellation`, { reason: "Our dining room plans changed." });
      await fake.webhooks.settled();
      // The three copies of the refund's event were all delivered and answered.
      expect(fake.webhooks.deliveredCopies() - answeredBefore).toBeGreaterThanOrEqual(3);
    } finally {
      fake.webhooks.options.copies = 1;
      fake.webhooks.options.shuffle = false;
    }
    expect(res.status).toBe(200);
    expect(res.body.order).toMatchObject({
      status: "refunded",
      cancelledBy: "buyer",
      cancelReason: "Our dining room plans changed.",
      actions: [],
    });
    const order = await orderOf(orderId);
    expect(order.refundId).toMatch(/^re_/);
    expect(order.cancelledAt).not.toBeNull();
    expect(order.refundedAt).not.toBeNull();
    // One refund recorded, keyed by the order, by the buyer who cancelled.
    expect(await ctx.dataSource.getRepository(OrderRefundEntity).findBy({ orderId })).toMatchObject([
      {
        kind: "cancellation",
        amountMinor: 157_500,
        idempotencyKey: `refund-${orderId}`,
        providerRefundId: order.refundId,
        createdBy: buyer.account.id,
        reason: "Our dining room plans changed.",
      },
    ]);

    // The provider refunded exactly the total paid (price 1 500.00 + 5 % tax 75.00), once.
    const intent = fake.store.get(order.paymentIntentId!)!;
    expect(intent.amount_refunded).toBe(157_500);
    expect(fake.store.all("refund").filter((r) => r.payment_intent === order.paymentIntentId)).toHaveLength(1);

    // Back on sale, in the catalogue too.
    expect(await listingStatus(listingId)).toBe("live");
    expect((await request(ctx.app).get(`/api/v1/catalogue/${listingId}`)).body.listing.status).toBe("live");

    // One sale and one reversal: every account of this order nets to zero, the sawyer is owed nothing.
    const entries = await ctx.dataSource.getRepository(LedgerEntryEntity).findBy({ orderId });
    expect(entries.filter((e) => e.kind === "payment")).toHaveLength(entries.filter((e) => e.kind === "refund").length);
    expect(entries.filter((e) => e.kind === "refund" && e.account === "provider_clearing").map((e) => e.amountMinor)).toEqual([-157_500]);
    const byAccount = new Map<string, number>();
    for (const e of entries) byAccount.set(e.account, (byAccount.get(e.account) ?? 0) + e.amountMinor);
    for (const total of byAccount.values()) expect(total).toBe(0);

    // A resend of every webhook (the provider's retry) changes nothing.
    const answeredBeforeResend = fake.webhooks.deliveredCopies();
    fake.webhooks.resendAll();
    await fake.webhooks.settled();
    expect(fake.webhooks.deliveredCopies()).toBeGreaterThan(answeredBeforeResend);
    expect(await ctx.dataSource.getRepository(LedgerEntryEntity).countBy({ orderId })).toBe(entries.length);
    expect((await buyer.post(`/api/v1/orders/${orderId}/cancellation`, { reason: "Again" })).status).toBe(409);

    await mailed(buyer.account.email, /^Cancelled and refunded/);
    await mailed(sawyer.account.email, /^Cancelled and refunded/);
    const sawyerMail = (await mailTo(sawyer.account.email)).find(
      (m) => /^Cancelled and refunded/.test(m.subject) && m.text.includes("Our dining room plans changed."),
    )!;
    expect(sawyerMail.text).toMatch(/back on sale/);

    // Someone else can buy it now.
    const another = await ctx.signedInClient("buyer");
    expect((await another.post(`/api/v1/listings/${listingId}/checkout`, { handover: "pickup" })).status).toBe(201);
  });

  it("the sawyer cancels while the provider is unreachable: cancelled and back on sale at once; refunded later by the retry sweep, or by the provider's charge.refunded webhook", async () => {
    const first = await paidOrder("freight", 40_000);
    const second = await paidOrder("pickup", 60_000);
    await new Promise<void>((resolve) => {
      fakeServer.close(() => resolve());
      fakeServer.closeAllConnections();
    });
    try {
      for (const { orderId, listingId } of [first, second]) {
        const res = await sawyer.post(`/api/v1/orders/${orderId}/cancellation`, {
          reason: "Found a crack right through while wrapping it.",
        });
        expect(res.status).toBe(200);
        expect(res.body.order.status).toBe("cancelled");
        expect(await listingStatus(listingId)).toBe("live");
      }
      expect(await app().orders.retryPendingRefunds()).toBe(0);
      expect(await ctx.dataSource.getRepository(LedgerEntryEntity).countBy({ orderId: first.orderId, kind: "refund" })).toBe(0);
    } finally {
      fakeServer = fake.listen(fakePort, "127.0.0.1");
      payments.server = fakeServer;
      await new Promise((r) => fakeServer.once("listening", r));
    }

    // The second order is refunded at the provider first (same idempotency key the API uses):
    // its charge.refunded webhook alone records the refund and reverses the sale.
    const secondIntent = (await orderOf(second.orderId)).paymentIntentId!;
    const atProvider = await fetch(`http://127.0.0.1:${fakePort}/v1/refunds`, {
      method: "POST",
      headers: {
        authorization: "Bearer sk_test_steps",
        "content-type": "application/x-www-form-urlencoded",
        "idempotency-key": `refund-${second.orderId}`,
      },
      body: new URLSearchParams({ payment_intent: secondIntent, "metadata[order_id]": second.orderId }),
    });
    expect(atProvider.status).toBe(200);
    await until(async () => (await orderOf(second.orderId)).status === "refunded");
    expect(await ctx.dataSource.getRepository(LedgerEntryEntity).countBy({ orderId: second.orderId, kind: "refund" })).toBeGreaterThan(0);

    // The sweep refunds the first; the second's replayed key makes no second refund.
    expect(await app().orders.retryPendingRefunds()).toBe(1);
    await until(async () => (await orderOf(first.orderId)).status === "refunded");
    expect(fake.store.get((await orderOf(first.orderId)).paymentIntentId!)!.amount_refunded).toBe(42_000);
    expect(fake.store.get(secondIntent)!.amount_refunded).toBe(63_000);
    expect(fake.store.all("refund").filter((r) => r.payment_intent === secondIntent)).toHaveLength(1);
    expect(await app().orders.retryPendingRefunds()).toBe(0);
    for (const { orderId } of [first, second]) {
      const payment = await ctx.dataSource.getRepository(LedgerEntryEntity).countBy({ orderId, kind: "payment" });
      expect(await ctx.dataSource.getRepository(LedgerEntryEntity).countBy({ orderId, kind: "refund" })).toBe(payment);
    }
  });
});
