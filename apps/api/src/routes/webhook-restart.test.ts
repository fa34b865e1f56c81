import { createServer } from "node:http";
import type { AddressInfo } from "node:net";
import sharp from "sharp";
import { afterAll, afterEach, beforeAll, describe, expect, it } from "vitest";
import type { PaymentsFakeApp } from "@grainyard/payments-fake";
import { createApp } from "../app.ts";
import { createDataSource } from "../db/data-source.ts";
import { LedgerEntryEntity, ListingEntity, OrderEntity } from "../entities/index.ts";
import { createMailer } from "../integrations/mail.ts";
import { createPayments } from "../integrations/payments-stripe.ts";
import { createPhotoStorage } from "../integrations/storage.ts";
import { createLogger } from "../logger.ts";
import { expectLedgerBalanced, startPaymentsFake, until, type TestPaymentsFake } from "../test-support/payments-harness.ts";
import { createTestContext, mailTo, trackDeliveries, type BrowserClient, type TestContext } from "../test-support/test-context.ts";
import { payOnHostedPage } from "../test-support/hosted-payment.ts";

/*
 * The API restarts between the buyer paying and the provider's webhook. The payments fake keeps
 * retrying with back-off (as the provider does); the first deliveries find nothing listening, and
 * a second app instance — a fresh process after the restart, on the same database — takes the
 * retried delivery and completes the order exactly once.
 */
const WEBHOOK_SECRET = "whsec_restart_test";
let payments: TestPaymentsFake;
let fake: PaymentsFakeApp;
let ctx: TestContext;
let sawyer: BrowserClient & { account: { id: string; email: string } };
let admin: BrowserClient;
let photo: Buffer;
let webhookPort = 0;
const cleanups: (() => Promise<void>)[] = [];

async function freePort(): Promise<number> {
  const probe = createServer().listen(0, "127.0.0.1");
  await new Promise((r) => probe.once("listening", r));
  const port = (probe.address() as AddressInfo).port;
  await new Promise((r) => probe.close(r));
  return port;
}
const ledgerSumsToZero = () => expectLedgerBalanced(ctx.dataSource);

/** Another API process on the same database (as after a restart), listening where the webhooks go. */
async function startSecondInstance(port: number) {
  const config = ctx.config;
  const dataSource = createDataSource(config.database);
  await dataSource.initialize();
  const mailer = createMailer(config.mail);
  const storage = createPhotoStorage(config.storage);
  const app = createApp({ config, dataSource, mailer, storage, payments: createPayments(config.payments), logger: createLogger("silent") });
  const untrack = trackDeliveries(app);
  const server = createServer(app).listen(port, "127.0.0.1");
  await new Promise((r) => server.once("listening", r));
  const stop = async () => {
    await new Promise((r) => server.close(r));
    server.closeAllConnections();
    await app.background.settled();
    untrack();
    mailer.close();
    storage.close();
    await dataSource.destroy();
  };
  cleanups.push(stop);
  return { app, stop };
}

beforeAll(async () => {
  payments = await startPaymentsFake({ secretKey: "sk_test_restart", webhookSecret: WEBHOOK_SECRET, retryBaseMs: 150, maxAttempts: 8 });
  fake = payments.fake;
  ctx = await createTestContext({ environment: { ...payments.environment, SIGN_IN_LIMIT_PER_IP: "1000" } });
  webhookPort = await freePort();
  fake.webhooks.options.url = `http://127.0.0.1:${webhookPort}/api/v1/payments/webhook`;
  sawyer = await ctx.signedInClient("sawyer");
  admin = await ctx.signedInClient("admin");
  photo = await sharp({ create: { width: 640, height: 480, channels: 3, background: "#7a5030" } })
    .jpeg()
    .toBuffer();
}, 60_000);
afterEach(async () => ledgerSumsToZero());
afterAll(async () => {
  fake.webhooks.stop();
  for (const cleanup of cleanups) await cleanup().catch(() => undefined);
  await payments.close();
  await ctx?.close();
});

describe("the API restarting between payment and webhook", () => {
  it("the first deliveries fail while nothing listens; the retried one reaches the new instance and pays the order once", async () => {
    const slab = (
      await sawyer.post("/api/v1/yard/slabs", {
        speciesSlug: "black-walnut",
        lengthMm: 1800,
        thicknessMm: 45,
        widthStationsMm: [520, 500],
        liveEdge: "both",
        surfacing: "sanded",
        dryingMethod: "kiln",
      })
    ).body.slab;
    const listing = (
      await sawyer.post("/api/v1/yard/listings", { title: "Walnut bench top", slabIds: [slab.id], priceMode: "fixed", rateMinor: 48_000 })
    ).body.listing;
    await sawyer.agent
      .post(`/api/v1/yard/listings/${listing.id}/photos`)
      .set("x-csrf-token", sawyer.csrfToken)
      .set("content-type", "image/jpeg")
      .send(photo);
    await sawyer.post(`/api/v1/yard/listings/${listing.id}/submit`);
    await admin.post(`/api/v1/admin/listings/${listing.id}/approve`);
    const buyer = await ctx.signedInClient("buyer");
    const { body } = await buyer.post(`/api/v1/listings/${listing.id}/checkout`, { handover: "pickup" });
    const orderId = body.order.id as string;

    // The first instance (ctx.app) is not listening anywhere: it has "gone down" after checkout.
    const paid = await payOnHostedPage(body.checkoutUrl);
    expect(paid.status).toBe(303);
    const completedEvent = () =>
      fake.store.state.events
        .map((id) => fake.store.get(id)!)
        .find(
          (e) =>
            e.type === "checkout.session.completed" &&
            (e.data as { object: { metadata: Record<string, string> } }).object.metadata.order_id === orderId,
        );
    await until(async () => {
      const event = completedEvent();
      return !!event && fake.webhooks.attempts.filter((a) => a.eventId === event.id && a.status === "network_error").length >= 2;
    });
    expect((await ctx.dataSource.getRepository(OrderEntity).findOneByOrFail({ id: orderId })).status).toBe("awaiting_payment");

    // The API comes back as a new process on the same database; the next retry reaches it.
    await startSecondInstance(webhookPort);
    await until(async () => (await ctx.dataSource.getRepository(OrderEntity).findOneByOrFail({ id: orderId })).status === "paid");
    const event = completedEvent()!;
    // The answer is recorded once the handler (and its e-mails) finished.
    await until(async () => fake.webhooks.attempts.some((a) => a.eventId === event.id && a.status === 200));
    const attempts = fake.webhooks.attempts.filter((a) => a.eventId === event.id).map((a) => a.status);
    expect(attempts.slice(0, 2)).toEqual(["network_error", "network_error"]);
    expect(attempts.at(-1)).toBe(200);

    expect((await ctx.dataSource.getRepository(ListingEntity).findOneByOrFail({ id: listing.id })).status).toBe("sold");
    expect(await ctx.dataSource.getRepository(LedgerEntryEntity).countBy({ orderId, account: "provider_clearing" })).toBe(1);
    await until(async () => (await mailTo(buyer.account.email)).some((m) => /^Your order/.test(m.subject)));

    // Every event resent once more (a provider retry after a lost answer): still one sale, one e-mail.
    const answeredBeforeResend = fake.webhooks.deliveredCopies(event.id);
    fake.webhooks.resendAll();
    await fake.webhooks.settled();
    expect(fake.webhooks.deliveredCopies(event.id)).toBe(answeredBeforeResend + 1);
    expect(await ctx.dataSource.getRepository(LedgerEntryEntity).countBy({ orderId, account: "provider_clearing" })).toBe(1);
    expect((await mailTo(buyer.account.email)).filter((m) => /^Your order/.test(m.subject))).toHaveLength(1);
    expect((await mailTo(sawyer.account.email)).filter((m) => /^Sold/.test(m.subject))).toHaveLength(1);
  });

  it("two instances answering at once (one restarting, one up): a burst of duplicate deliveries still pays once", async () => {
    const slab = (
      await sawyer.post("/api/v1/yard/slabs", {
        speciesSlug: "black-walnut",
        lengthMm: 1500,
        thicknessMm: 45,
        widthStationsMm: [450, 440],
        liveEdge: "both",
        surfacing: "sanded",
        dryingMethod: "kiln",
      })
    ).body.slab;
    const listing = (
      await sawyer.post("/api/v1/yard/listings", { title: "Walnut shelf", slabIds: [slab.id], priceMode: "fixed", rateMinor: 22_000 })
    ).body.listing;
    await sawyer.agent
      .post(`/api/v1/yard/listings/${listing.id}/photos`)
      .set("x-csrf-token", sawyer.csrfToken)
      .set("content-type", "image/jpeg")
      .send(photo);
    await sawyer.post(`/api/v1/yard/listings/${listing.id}/submit`);
    await admin.post(`/api/v1/admin/listings/${listing.id}/approve`);
    const buyer = await ctx.signedInClient("buyer");
    const { body } = await buyer.post(`/api/v1/listings/${listing.id}/checkout`, { handover: "pickup" });
    // The first instance listens too now, on its own port; the fake sends each event 4 times to each.
    const first = createServer(ctx.app).listen(0, "127.0.0.1");
    await new Promise((r) => first.once("listening", r));
    cleanups.push(async () => void (await new Promise((r) => first.close(r))));
    const second = `http://127.0.0.1:${webhookPort}/api/v1/payments/webhook`;
    const firstUrl = `http://127.0.0.1:${(first.address() as AddressInfo).port}/api/v1/payments/webhook`;
    fake.webhooks.options.copies = 4;
    try {
      await payOnHostedPage(body.checkoutUrl);
      fake.webhooks.options.url = firstUrl;
      fake.webhooks.resendAll();
      fake.webhooks.options.url = second;
      await until(async () => (await ctx.dataSource.getRepository(OrderEntity).findOneByOrFail({ id: body.order.id })).status === "paid");
      // Every copy to both instances had its answer before the counts below.
      await fake.webhooks.settled();
    } finally {
      fake.webhooks.options.copies = 1;
      fake.webhooks.options.url = second;
    }
    expect(await ctx.dataSource.getRepository(LedgerEntryEntity).countBy({ orderId: body.order.id, account: "provider_clearing" })).toBe(1);
  });
});
