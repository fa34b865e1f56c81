import type { Server } from "node:http";
import type { AddressInfo } from "node:net";
import sharp from "sharp";
import request from "supertest";
import { afterAll, afterEach, beforeAll, describe, expect, it } from "vitest";
import { signatureHeader, type PaymentsFakeApp } from "@grainyard/payments-fake";
import { LedgerEntryEntity, ListingEntity, OrderEntity, OrderRefundEntity, PaymentEventEntity } from "../entities/index.ts";
import {
  expectLedgerBalanced,
  listenForWebhooks,
  startPaymentsFake,
  until,
  type TestPaymentsFake,
} from "../test-support/payments-harness.ts";
import { createTestContext, mailTo, testClock, type BrowserClient, type TestContext } from "../test-support/test-context.ts";
import { payOnHostedPage } from "../test-support/hosted-payment.ts";

/*
 * Checkout against a payments fake of this test's own (so its webhooks reach this test's app),
 * driven through the official SDK by the API, with real MariaDB and SMTP.
 */
const WEBHOOK_SECRET = "whsec_checkout_test";
let payments: TestPaymentsFake;
let webhookUrl = "";
let fake: PaymentsFakeApp;
let apiServer: Server;
let ctx: TestContext;
const clock = testClock();
let sawyer: BrowserClient & { account: { id: string; email: string } };
let admin: BrowserClient;
let photo: Buffer;
let fakeBase = "";

async function liveListing(priceMinor = 120_000) {
  const slab = (
    await sawyer.post("/api/v1/yard/slabs", {
      speciesSlug: "black-cherry",
      lengthMm: 2000,
      thicknessMm: 45,
      widthStationsMm: [600, 580],
      liveEdge: "both",
      surfacing: "sanded",
      dryingMethod: "kiln",
    })
  ).body.slab;
  const listing = (
    await sawyer.post("/api/v1/yard/listings", {
      title: `Cherry top ${Math.random().toString(36).slice(2, 6)}`,
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

const listingStatus = async (id: string) => (await ctx.dataSource.getRepository(ListingEntity).findOneByOrFail({ id })).status;
const orderOf = async (id: string) => ctx.dataSource.getRepository(OrderEntity).findOneByOrFail({ id });
const ledgerSumsToZero = () => expectLedgerBalanced(ctx.dataSource);

beforeAll(async () => {
  payments = await startPaymentsFake({ secretKey: "sk_test_checkout", webhookSecret: WEBHOOK_SECRET });
  ({ fake } = payments);
  fakeBase = payments.base;
  ctx = await createTestContext({
    clock,
    environment: { ...payments.environment, TAX_RATE_BPS: "800", SIGN_IN_LIMIT_PER_IP: "1000" },
  });
  ({ server: apiServer, webhookUrl } = await listenForWebhooks(ctx.app));
  fake.webhooks.options.url = webhookUrl;
  sawyer = await ctx.signedInClient("sawyer");
  admin = await ctx.signedInClient("admin");
  photo = await sharp({ create: { width: 640, height: 480, channels: 3, background: "#8a4f32" } })
    .jpeg()
    .toBuffer();
}, 60_000);
afterEach(async () => ledgerSumsToZero());
afterAll(async () => {
  await new Promise((r) => apiServer.close(r));
  await payments.close();
  await ctx?.close();
});

describe("buying a slab", () => {
  it("reserves, sends the buyer to the hosted page, and only the webhook makes the order paid, with e-mails and a balanced ledger", async () => {
    const listingId = await liveListing(120_000);
    const buyer = await ctx.signedInClient("buyer");
    const res = await buyer.post(`/api/v1/listings/${listingId}/checkout`, { handover: "pickup" });
    expect(res.status).toBe(201);
    expect(res.body.checkoutUrl.startsWith(`${fakeBase}/pay/`)).toBe(true);
    // Tax 8 % of 1 200.00 = 96.00 (half-up once); total 1 296.00.
    expect(res.body.order).toMatchObject({
      status: "awaiting_payment",
      priceMinor: 120_000,
      taxMinor: 9_600,
      totalMinor: 129_600,
      sawyerShare: null,
    });
    expect(await listingStatus(listingId)).toBe("reserved");
    expect((await request(ctx.app).get(`/api/v1/catalogue/${listingId}`)).body.listing.status).toBe("reserved");

    // The success redirect alone proves nothing: until the webhook arrives the order waits.
    fake.webhooks.options.url = undefined;
    const paid = await payOnHostedPage(res.body.checkoutUrl, "4242 4242 4242 4242");
    expect(paid.headers.get("location")).toContain(`/orders/${res.body.order.id}?paid=1`);
    expect((await buyer.get(`/api/v1/orders/${res.body.order.id}`)).body.order.status).toBe("awaiting_payment");
    fake.webhooks.options.url = `http://127.0.0.1:${(apiServer.address() as AddressInfo).port}/api/v1/payments/webhook`;
    fake.webhooks.resendAll();
    await until(async () => (await orderOf(res.body.order.id)).status === "paid");
    expect(await listingStatus(listingId)).toBe("sold");

    const entries = await ctx.dataSource.getRepository(LedgerEntryEntity).findBy({ orderId: res.body.order.id });
    expect(entries.reduce((sum, e) => sum + e.amountMinor, 0)).toBe(0);
    expect(entries.find((e) => e.account === `sawyer:${sawyer.account.id}`)!.amountMinor).toBe(
      -(await orderOf(res.body.order.id)).sawyerNetMinor,
    );
    expect(entries.every((e) => Number.isInteger(e.amountMinor))).toBe(true);
    await until(async () => (await mailTo(buyer.account.email)).some((m) => /your order/i.test(m.subject)));
    await until(async () => (await mailTo(sawyer.account.email)).some((m) => /^sold/i.test(m.subject)));
    const sawyerView = await sawyer.get(`/api/v1/orders/${res.body.order.id}`);
    expect(sawyerView.body.order.sawyerShare.sawyerNetMinor).toBeGreaterThan(0);
    expect((await (await ctx.signedInClient("buyer")).get(`/api/v1/orders/${res.body.order.id}`)).status).toBe(403);
    await ledgerSumsToZero();
  });

  it("lets exactly one of 50 concurrent buyers reserve a slab; the others hear it was just reserved", async () => {
    const listingId = await liveListing(80_000);
    const buyers = await Promise.all(Array.from({ length: 50 }, () => ctx.signedInClient("buyer")));
    const answers = await Promise.all(buyers.map((b) => b.post(`/api/v1/listings/${listingId}/checkout`, { handover: "pickup" })));
    const winners = answers.filter((a) => a.status === 201);
    expect(winners).toHaveLength(1);
    const losers = answers.filter((a) => a.status === 409);
    expect(losers).toHaveLength(49);
    expect(losers[0]!.body.error.message).toMatch(/just reserved/);
    expect(await ctx.dataSource.getRepository(OrderEntity).countBy({ listingId })).toBe(1);
  });

  it("handles every webhook three times and out of order: one paid order, one set of ledger entries", async () => {
    const listingId = await liveListing(64_000);
    const buyer = await ctx.signedInClient("buyer");
    const { body } = await buyer.post(`/api/v1/listings/${listingId}/checkout`, {
      handover: "freight",
      deliveryAddress: "14 Quarry Lane, Cedar Hollow",
    });
    fake.webhooks.options.copies = 3;
    fake.webhooks.options.shuffle = true;
    const answeredBefore = fake.webhooks.deliveredCopies();
    try {
      await payOnHostedPage(body.checkoutUrl, "4242424242424242");
      await until(async () => (await orderOf(body.order.id)).status === "paid");
      await fake.webhooks.settled();
      // Every copy was delivered and answered, so the ledger below saw all three.
      expect(fake.webhooks.deliveredCopies() - answeredBefore).toBeGreaterThanOrEqual(3);
    } finally {
      fake.webhooks.options.copies = 1;
      fake.webhooks.options.shuffle = false;
    }
    const entries = await ctx.dataSource.getRepository(LedgerEntryEntity).findBy({ orderId: body.order.id });
    expect(entries.filter((e) => e.account === "provider_clearing")).toHaveLength(1);
    await ledgerSumsToZero();
  });

  it("a payment that lands after the hold ran out and the slab was sold to someone else goes straight back, in full, once", async () => {
    const listingId = await liveListing(45_000);
    const late = await ctx.signedInClient("buyer");
    const first = (await late.post(`/api/v1/listings/${listingId}/checkout`, { handover: "pickup" })).body;
    // The first buyer pays, but the provider's webhook does not reach us yet.
    fake.webhooks.options.url = undefined;
    expect((await payOnHostedPage(first.checkoutUrl, "4242 4242 4242 4242")).status).toBe(303);
    // Their hold runs out meanwhile, and a second buyer buys the slab.
    clock.advance(16 * 60_000);
    try {
      const app = ctx.app as unknown as { checkout: { sweepExpiredReservations(): Promise<number> } };
      expect(await app.checkout.sweepExpiredReservations()).toBeGreaterThanOrEqual(1);
    } finally {
      clock.advance(-16 * 60_000);
    }
    expect((await orderOf(first.order.id)).status).toBe("expired");
    fake.webhooks.options.url = webhookUrl;
    const winner = await ctx.signedInClient("buyer");
    const second = (await winner.post(`/api/v1/listings/${listingId}/checkout`, { handover: "pickup" })).body;
    await payOnHostedPage(second.checkoutUrl, "4242 4242 4242 4242");
    await until(async () => (await orderOf(second.order.id)).status === "paid");

    // Now the first payment's event arrives (the provider retries it): refunded, never sold twice.
    fake.webhooks.resendAll();
    await until(async () => (await orderOf(first.order.id)).status === "refunded");
    const lateOrder = await orderOf(first.order.id);
    expect(lateOrder.refundedAt).not.toBeNull();
    const refunds = fake.store.all("refund").filter((r) => r.payment_intent === lateOrder.paymentIntentId);
    expect(refunds.map((r) => r.amount)).toEqual([lateOrder.totalMinor]);
    await until(async () => (await orderOf(first.order.id)).refundId === refunds[0]!.id);
    expect(await listingStatus(listingId)).toBe("sold");
    expect(await ctx.dataSource.getRepository(LedgerEntryEntity).countBy({ orderId: first.order.id })).toBe(0);
    const recorded = await ctx.dataSource.getRepository(OrderRefundEntity).findBy({ orderId: first.order.id });
    expect(recorded).toMatchObject([{ kind: "sold_elsewhere", amountMinor: lateOrder.totalMinor, providerRefundId: refunds[0]!.id }]);

    // Every event once more: still one refund.
    const paidEvent = fake.store.state.events
      .map((id) => fake.store.get(id)!)
      .find(
        (e) =>
          e.type === "checkout.session.completed" &&
          (e.data as { object: { metadata: Record<string, string> } }).object.metadata.order_id === first.order.id,
      )!;
    const answered = () => fake.webhooks.attempts.filter((a) => a.eventId === paidEvent.id && a.status === 200).length;
    const before = answered();
    fake.webhooks.resendAll();
    await until(async () => answered() > before);
    expect(fake.store.all("refund").filter((r) => r.payment_intent === lateOrder.paymentIntentId)).toHaveLength(1);
  });

  it("refuses an unsigned or tampered webhook and changes nothing", async () => {
    const listingId = await liveListing(50_000);
    const buyer = await ctx.signedInClient("buyer");
    const { body } = await buyer.post(`/api/v1/listings/${listingId}/checkout`, { handover: "pickup" });
    const forged = JSON.stringify({
      id: "evt_forged",
      object: "event",
      type: "checkout.session.completed",
      data: { object: { id: "cs_x", metadata: { order_id: body.order.id }, payment_intent: "pi_x" } },
    });
    const unsigned = await request(ctx.app).post("/api/v1/payments/webhook").set("content-type", "application/json").send(forged);
    expect(unsigned.status).toBe(400);
    const wrongKey = await request(ctx.app)
      .post("/api/v1/payments/webhook")
      .set("content-type", "application/json")
      .set("stripe-signature", signatureHeader(forged, "whsec_not_ours"))
      .send(forged);
    expect(wrongKey.status).toBe(400);
    const signed = signatureHeader(forged, WEBHOOK_SECRET);
    const tampered = await request(ctx.app)
      .post("/api/v1/payments/webhook")
      .set("content-type", "application/json")
      .set("stripe-signature", signed)
      .send(forged.replace("cs_x", "cs_y"));
    expect(tampered.status).toBe(400);
    expect((await orderOf(body.order.id)).status).toBe("awaiting_payment");
    expect(await listingStatus(listingId)).toBe("reserved");
  });

  it("a declined card is not the end: the page stays open, the slab stays held, and another card in the same session pays", async () => {
    const listingId = await liveListing(70_000);
    const buyer = await ctx.signedInClient("buyer");
    const { body } = await buyer.post(`/api/v1/listings/${listingId}/checkout`, { handover: "pickup" });
    const declined = await payOnHostedPage(body.checkoutUrl, "4000 0000 0000 0002");
    expect(declined.status).toBe(402);
    expect(await declined.text()).toMatch(/declined[\s\S]*Try another card/);
    // The provider's payment_failed event reached the API and was handled (recorded once) …
    await fake.webhooks.settled();
    const recorded = await ctx.dataSource.getRepository(PaymentEventEntity).findBy({ type: "payment_failed" });
    expect(recorded.some((event) => JSON.parse(event.payload).orderId === body.order.id)).toBe(true);
    // … and changed nothing: the order still awaits payment, the slab is held, the page is open.
    expect((await orderOf(body.order.id)).status).toBe("awaiting_payment");
    expect(await listingStatus(listingId)).toBe("reserved");
    const sessionId = (await orderOf(body.order.id)).checkoutSessionId!;
    expect(fake.store.get(sessionId)?.status).toBe("open");
    // The buyer's order offers the way back to that same page; another buyer meets the hold.
    expect((await buyer.get(`/api/v1/orders/${body.order.id}`)).body.order.paymentPageUrl).toBe(body.checkoutUrl);
    const another = await ctx.signedInClient("buyer");
    expect((await another.post(`/api/v1/listings/${listingId}/checkout`, { handover: "pickup" })).status).toBe(409);

    const paid = await payOnHostedPage(body.checkoutUrl, "4242 4242 4242 4242");
    expect(paid.status).toBe(303);
    await until(async () => (await orderOf(body.order.id)).status === "paid");
    expect(await listingStatus(listingId)).toBe("sold");
    expect((await buyer.get(`/api/v1/orders/${body.order.id}`)).body.order.paymentPageUrl).toBeNull();
    await ledgerSumsToZero();
  });

  it("a payment page whose time ran out says so and links back to the order (expired, so the web offers the slab again)", async () => {
    const listingId = await liveListing(33_000);
    const buyer = await ctx.signedInClient("buyer");
    const { body } = await buyer.post(`/api/v1/listings/${listingId}/checkout`, { handover: "pickup" });
    await payOnHostedPage(body.checkoutUrl, "4000 0000 0000 0002");
    clock.advance(16 * 60_000);
    try {
      const app = ctx.app as unknown as { checkout: { sweepExpiredReservations(): Promise<number> } };
      expect(await app.checkout.sweepExpiredReservations()).toBeGreaterThanOrEqual(1);
    } finally {
      clock.advance(-16 * 60_000);
    }
    expect((await orderOf(body.order.id)).status).toBe("expired");
    expect(await listingStatus(listingId)).toBe("live");
    const page = await fetch(body.checkoutUrl);
    expect(page.status).toBe(410);
    const html = await page.text();
    expect(html).toContain("This payment page has expired");
    const back = /href="([^"]+)"[^>]*data-test="back-to-shop"/.exec(html)?.[1];
    expect(back).toMatch(new RegExp(`/orders/${body.order.id}\\?cancelled=1$`));
    // A card tried on the expired page changes nothing.
    expect((await payOnHostedPage(body.checkoutUrl, "4242 4242 4242 4242")).status).toBe(410);
    expect((await orderOf(body.order.id)).status).toBe("expired");
  });

  it("releases a reservation whose time ran out (the sweep), and a second sweep changes nothing", async () => {
    const listingId = await liveListing(30_000);
    const buyer = await ctx.signedInClient("buyer");
    const { body } = await buyer.post(`/api/v1/listings/${listingId}/checkout`, { handover: "pickup" });
    clock.advance(16 * 60_000);
    try {
      const app = ctx.app as unknown as { checkout: { sweepExpiredReservations(): Promise<number> } };
      expect(await app.checkout.sweepExpiredReservations()).toBeGreaterThanOrEqual(1);
      expect(await app.checkout.sweepExpiredReservations()).toBe(0);
    } finally {
      clock.advance(-16 * 60_000);
    }
    expect((await orderOf(body.order.id)).status).toBe("expired");
    expect(await listingStatus(listingId)).toBe("live");
  });

  it("with the payments provider down: a clear error, the slab released, no half-made order", async () => {
    const down = await createTestContext({ environment: { PAYMENTS_PORT: "9" } });
    try {
      const seller = await down.signedInClient("sawyer");
      const downAdmin = await down.signedInClient("admin");
      const slab = (
        await seller.post("/api/v1/yard/slabs", {
          speciesSlug: "black-cherry",
          lengthMm: 2000,
          thicknessMm: 45,
          widthStationsMm: [600, 580],
          liveEdge: "both",
          surfacing: "sanded",
          dryingMethod: "kiln",
        })
      ).body.slab;
      const listing = (
        await seller.post("/api/v1/yard/listings", { title: "Provider down", slabIds: [slab.id], priceMode: "fixed", rateMinor: 20_000 })
      ).body.listing;
      await seller.agent
        .post(`/api/v1/yard/listings/${listing.id}/photos`)
        .set("x-csrf-token", seller.csrfToken)
        .set("content-type", "image/jpeg")
        .send(photo);
      await seller.post(`/api/v1/yard/listings/${listing.id}/submit`);
      await downAdmin.post(`/api/v1/admin/listings/${listing.id}/approve`);
      const buyer = await down.signedInClient("buyer");
      const res = await buyer.post(`/api/v1/listings/${listing.id}/checkout`, { handover: "pickup" });
      expect(res.status).toBe(503);
      expect(res.body.error.message).toMatch(/not available right now/);
      expect((await down.dataSource.getRepository(ListingEntity).findOneByOrFail({ id: listing.id })).status).toBe("live");
      expect(await down.dataSource.getRepository(OrderEntity).countBy({ listingId: listing.id, status: "awaiting_payment" })).toBe(0);
    } finally {
      await down.close();
    }
  });

  it("refuses bad checkout input and buying one's own listing", async () => {
    const listingId = await liveListing(10_000);
    const buyer = await ctx.signedInClient("buyer");
    expect((await buyer.post(`/api/v1/listings/${listingId}/checkout`, { handover: "freight" })).status).toBe(422);
    expect((await buyer.post(`/api/v1/listings/${listingId}/checkout`, { handover: "teleport" })).status).toBe(422);
    expect((await sawyer.post(`/api/v1/listings/${listingId}/checkout`, { handover: "pickup" })).status).toBe(403);
    expect((await (await ctx.client()).post(`/api/v1/listings/${listingId}/checkout`, { handover: "pickup" })).status).toBe(401);
    await ledgerSumsToZero();
  });
});
