import type { Server } from "node:http";
import { OFFER_ROUNDS, type Offer } from "@grainyard/contracts";
import { afterAll, afterEach, beforeAll, describe, expect, it } from "vitest";
import type { PaymentsFakeApp } from "@grainyard/payments-fake";
import { LedgerEntryEntity, ListingEntity, OfferEntity, OrderEntity } from "../entities/index.ts";
import { liveListing } from "../test-support/live-listing.ts";
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
 * Offers on the real stack: MariaDB, the SMTP sink, and a payments fake of this test's own (so
 * its webhooks reach this app) driven through the official SDK. Every rule of contracts'
 * offers.ts, the races (two accepts at once; an accept against "Buy" at once), and the agreed
 * price carried into the order and the ledger.
 */
let payments: TestPaymentsFake;
let fake: PaymentsFakeApp;
let apiServer: Server;
let ctx: TestContext;
const clock = testClock();
let sawyer: BrowserClient & { account: { id: string; email: string } };
let admin: BrowserClient;
let titles = 0;

/** A live fixed-price listing of "sawyer" (price in minor units) that welcomes offers, with an optional floor. */
async function listingWithOffers(priceMinor: number, floorMinor: number | null = null): Promise<string> {
  titles += 1;
  const id = await liveListing(sawyer, admin, { title: `Walnut offer top ${titles}`, speciesSlug: "black-walnut", rateMinor: priceMinor });
  const set = await sawyer.put(`/api/v1/yard/listings/${id}/offer-settings`, { offersWelcome: true, floorMinor });
  expect(set.status).toBe(200);
  return id;
}

const offerOn = (buyer: BrowserClient, listingId: string, amountMinor: number, extra: object = {}) =>
  buyer.post(`/api/v1/listings/${listingId}/offers`, { amountMinor, message: "Would you take this?", handover: "pickup", ...extra });

const listingStatus = async (id: string) => (await ctx.dataSource.getRepository(ListingEntity).findOneByOrFail({ id })).status;
const orderOf = async (id: string) => ctx.dataSource.getRepository(OrderEntity).findOneByOrFail({ id });
const offerRow = async (id: string) => ctx.dataSource.getRepository(OfferEntity).findOneByOrFail({ id });
const subjects = async (email: string) => (await mailTo(email)).map((m) => m.subject);
const offers = () => (ctx.app as unknown as { offers: { expireDue(): Promise<number> } }).offers;

beforeAll(async () => {
  payments = await startPaymentsFake({ secretKey: "sk_test_offers", webhookSecret: "whsec_offers_test" });
  ({ fake } = payments);
  ctx = await createTestContext({ clock, environment: { ...payments.environment, TAX_RATE_BPS: "800", SIGN_IN_LIMIT_PER_IP: "1000" } });
  const listening = await listenForWebhooks(ctx.app);
  apiServer = listening.server;
  fake.webhooks.options.url = listening.webhookUrl;
  sawyer = await ctx.signedInClient("sawyer");
  admin = await ctx.signedInClient("admin");
}, 60_000);
afterEach(async () => expectLedgerBalanced(ctx.dataSource));
afterAll(async () => {
  await new Promise((r) => apiServer?.close(r));
  await payments?.close();
  await ctx?.close();
});

describe("offer settings", () => {
  it("only the listing's sawyer reads and sets them; the floor stays below the price and is never shown to buyers", async () => {
    const listingId = await listingWithOffers(90_000);
    const other = await ctx.signedInClient("sawyer");
    expect((await other.get(`/api/v1/yard/listings/${listingId}/offer-settings`)).status).toBe(403);
    expect((await other.put(`/api/v1/yard/listings/${listingId}/offer-settings`, { offersWelcome: false })).status).toBe(403);
    const tooHigh = await sawyer.put(`/api/v1/yard/listings/${listingId}/offer-settings`, { offersWelcome: true, floorMinor: 90_000 });
    expect(tooHigh.status).toBe(422);
    expect(tooHigh.body.error.fields.floorMinor).toMatch(/below the price/);
    const set = await sawyer.put(`/api/v1/yard/listings/${listingId}/offer-settings`, { offersWelcome: true, floorMinor: 71_234 });
    expect(set.body.settings).toEqual({ offersWelcome: true, floorMinor: 71_234 });
    expect((await sawyer.get(`/api/v1/yard/listings/${listingId}/offer-settings`)).body.settings.floorMinor).toBe(71_234);

    const buyer = await ctx.signedInClient("buyer");
    const page = await buyer.get(`/api/v1/catalogue/${listingId}`);
    expect(page.body.listing.offersWelcome).toBe(true);
    expect(JSON.stringify(page.body)).not.toContain("71234");
    expect((await buyer.get(`/api/v1/yard/listings/${listingId}/offer-settings`)).status).toBe(403);
  });
});

describe("making an offer", () => {
  it("takes signed-in buyers only, never on a listing without offers welcome, and checks the amount", async () => {
    const listingId = await listingWithOffers(50_000);
    const anonymous = await ctx.client();
    expect((await offerOn(anonymous, listingId, 40_000)).status).toBe(401);
    expect((await offerOn(sawyer, listingId, 40_000)).status).toBe(403);
    const otherSawyer = await ctx.signedInClient("sawyer");
    expect((await offerOn(otherSawyer, listingId, 40_000)).status).toBe(403);

    const buyer = await ctx.signedInClient("buyer");
    for (const [amount, field] of [
      [0, /above zero/],
      [-500, /above zero/],
      [123.5, /whole cents/],
      [100_000_001, /beyond/],
      [50_000, /less than the price/],
      [60_000, /less than the price/],
    ] as const) {
      const res = await offerOn(buyer, listingId, amount);
      expect(res.status, `amount ${amount}`).toBe(422);
      expect(res.body.error.fields.amountMinor).toMatch(field);
    }
    expect((await offerOn(buyer, listingId, "40000" as unknown as number)).status).toBe(422);
    const noAddress = await offerOn(buyer, listingId, 40_000, { handover: "freight" });
    expect(noAddress.status).toBe(422);
    expect(noAddress.body.error.fields.deliveryAddress).toBeTruthy();

    const made = await offerOn(buyer, listingId, 40_000);
    expect(made.status).toBe(201);
    expect(made.body.offer).toMatchObject({ status: "open", amountMinor: 40_000, round: 1, viewerIs: "buyer", actions: ["withdraw"] });
    const second = await offerOn(buyer, listingId, 41_000);
    expect(second.status).toBe(409);
    expect(second.body.error.code).toBe("offer_exists");
    await until(async () => (await subjects(sawyer.account.email)).some((s) => s.includes("offer of $400.00")));

    await sawyer.put(`/api/v1/yard/listings/${listingId}/offer-settings`, { offersWelcome: false });
    const closed = await offerOn(await ctx.signedInClient("buyer"), listingId, 40_000);
    expect(closed.status).toBe(409);
    expect(closed.body.error.code).toBe("offers_closed");
  });

  it("declines an offer below the floor at once and politely, without telling the floor", async () => {
    const listingId = await listingWithOffers(80_000, 66_600);
    const buyer = await ctx.signedInClient("buyer");
    const low = await offerOn(buyer, listingId, 50_000);
    expect(low.status).toBe(201);
    expect(low.body.offer).toMatchObject({ status: "declined", declineReason: "below_floor", actions: [] });
    expect(JSON.stringify(low.body)).not.toMatch(/66600|666\.00/);
    await until(async () => (await mailTo(buyer.account.email)).length > 0);
    const [mail] = await mailTo(buyer.account.email);
    expect(mail!.text).toMatch(/not taking offers this low/);
    expect(mail!.text).not.toMatch(/666/);
    // The sawyer is not bothered with it; an offer at the floor reaches them.
    expect((await subjects(sawyer.account.email)).some((s) => s.includes("$500.00"))).toBe(false);
    const atFloor = await offerOn(buyer, listingId, 66_600);
    expect(atFloor.body.offer.status).toBe("open");
  });
});

describe("answering an offer", () => {
  it("counters once per round, lets the buyer offer again up to the last round, and refuses everyone else", async () => {
    const listingId = await listingWithOffers(100_000);
    const buyer = await ctx.signedInClient("buyer");
    const offerId = (await offerOn(buyer, listingId, 70_000)).body.offer.id as string;
    const stranger = await ctx.signedInClient("buyer");
    const otherSawyer = await ctx.signedInClient("sawyer");
    expect((await stranger.get(`/api/v1/offers/${offerId}`)).status).toBe(403);
    expect((await otherSawyer.post(`/api/v1/offers/${offerId}/counter`, { amountMinor: 90_000 })).status).toBe(403);
    expect((await buyer.post(`/api/v1/offers/${offerId}/counter`, { amountMinor: 90_000 })).status).toBe(403);
    expect((await sawyer.post(`/api/v1/offers/${offerId}/counter`, { amountMinor: 70_000 })).status).toBe(422);
    expect((await sawyer.post(`/api/v1/offers/${offerId}/counter`, { amountMinor: 100_001 })).status).toBe(422);
    // The buyer cannot accept what was never countered.
    expect((await buyer.post(`/api/v1/offers/${offerId}/accept-counter`)).body.error.code).toBe("offer_state");

    let amount = 70_000;
    for (let round = 1; round <= OFFER_ROUNDS; round++) {
      const counter = 95_000 - round * 1_000;
      const countered = await sawyer.post(`/api/v1/offers/${offerId}/counter`, { amountMinor: counter, message: `Round ${round}` });
      expect(countered.status).toBe(200);
      expect(countered.body.offer).toMatchObject({ status: "countered", counterMinor: counter, round, actions: [] });
      // Once per round: a second answer to the same round is refused.
      const again = await sawyer.post(`/api/v1/offers/${offerId}/counter`, { amountMinor: counter - 100 });
      expect(again.status).toBe(409);
      expect(again.body.error.code).toBe("offer_state");
      expect((await sawyer.post(`/api/v1/offers/${offerId}/accept`)).body.error.code).toBe("offer_state");
      const seen = (await buyer.get(`/api/v1/offers/${offerId}`)).body.offer as Offer;
      if (round === OFFER_ROUNDS) {
        expect(seen.actions).toEqual(["accept_counter", "withdraw"]);
        const refused = await buyer.post(`/api/v1/offers/${offerId}/offer-again`, { amountMinor: amount + 1_000 });
        expect(refused.status).toBe(409);
        expect(refused.body.error.message).toMatch(new RegExp(`at most ${OFFER_ROUNDS} rounds`));
        break;
      }
      expect(seen.actions).toEqual(["accept_counter", "offer_again", "withdraw"]);
      // Between the last offer and the counter only.
      expect((await buyer.post(`/api/v1/offers/${offerId}/offer-again`, { amountMinor: amount })).status).toBe(422);
      expect((await buyer.post(`/api/v1/offers/${offerId}/offer-again`, { amountMinor: counter })).status).toBe(422);
      amount += 5_000;
      const next = await buyer.post(`/api/v1/offers/${offerId}/offer-again`, { amountMinor: amount, message: "A little more" });
      expect(next.body.offer).toMatchObject({ status: "open", round: round + 1, amountMinor: amount, counterMinor: null });
    }
    const final = (await sawyer.get(`/api/v1/offers/${offerId}`)).body.offer as Offer;
    expect(final.steps.map((s) => s.kind)).toEqual(["offer", "counter", "offer", "counter", "offer", "counter"]);
    await until(async () => (await subjects(buyer.account.email)).filter((s) => /answered your offer/.test(s)).length === OFFER_ROUNDS);
  });

  it("declines with a message, and a declined or withdrawn offer takes no more answers", async () => {
    const listingId = await listingWithOffers(60_000);
    const buyer = await ctx.signedInClient("buyer");
    const first = (await offerOn(buyer, listingId, 40_000)).body.offer.id as string;
    const declined = await sawyer.post(`/api/v1/offers/${first}/decline`, { message: "It is promised to a regular." });
    expect(declined.body.offer).toMatchObject({ status: "declined", declineReason: "sawyer" });
    expect((await sawyer.post(`/api/v1/offers/${first}/accept`)).body.error.code).toBe("offer_state");
    await until(async () => (await mailTo(buyer.account.email)).some((m) => m.text.includes("promised to a regular")));

    const second = (await offerOn(buyer, listingId, 45_000)).body.offer.id as string;
    expect((await buyer.post(`/api/v1/offers/${second}/withdraw`)).body.offer.status).toBe("withdrawn");
    expect((await buyer.post(`/api/v1/offers/${second}/withdraw`)).status).toBe(409);
    expect((await sawyer.post(`/api/v1/offers/${second}/accept`)).status).toBe(409);
    expect(await listingStatus(listingId)).toBe("live");
  });

  it("expires an offer unanswered for 48 hours: it reads as expired at once, the sweep closes it and tells both sides", async () => {
    const listingId = await listingWithOffers(60_000);
    const buyer = await ctx.signedInClient("buyer");
    const offerId = (await offerOn(buyer, listingId, 50_000)).body.offer.id as string;
    clock.advance(47 * 3_600_000);
    try {
      expect((await sawyer.get(`/api/v1/offers/${offerId}`)).body.offer.status).toBe("open");
      clock.advance(2 * 3_600_000);
      const seen = (await sawyer.get(`/api/v1/offers/${offerId}`)).body.offer as Offer;
      expect(seen).toMatchObject({ status: "expired", actions: [], expiresAt: null });
      const late = await sawyer.post(`/api/v1/offers/${offerId}/accept`);
      expect(late.status).toBe(409);
      expect(late.body.error.message).toMatch(/expired/);
      expect(await listingStatus(listingId)).toBe("live");
      expect(await offers().expireDue()).toBeGreaterThanOrEqual(1);
      expect((await offerRow(offerId)).status).toBe("expired");
      // A new offer is welcome once the old one is over.
      expect((await offerOn(buyer, listingId, 51_000)).status).toBe(201);
    } finally {
      clock.advance(-49 * 3_600_000);
    }
    await until(async () => (await subjects(buyer.account.email)).some((s) => /expired/.test(s)));
    await until(async () => (await subjects(sawyer.account.email)).some((s) => /expired/.test(s)));
  });
});

describe("accepting", () => {
  it("reserves the slab at the agreed price, declines the other offers, and the order and ledger carry that price", async () => {
    const listingId = await listingWithOffers(120_000);
    const buyer = await ctx.signedInClient("buyer");
    const rival = await ctx.signedInClient("buyer");
    const offerId = (await offerOn(buyer, listingId, 100_000)).body.offer.id as string;
    const rivalId = (await offerOn(rival, listingId, 95_000)).body.offer.id as string;

    const accepted = await sawyer.post(`/api/v1/offers/${offerId}/accept`);
    expect(accepted.status).toBe(200);
    expect(accepted.body.offer).toMatchObject({ status: "accepted", agreedMinor: 100_000 });
    // The payment page is the buyer's, not the sawyer's.
    expect(accepted.body.checkoutUrl).toBeNull();
    // Tax 8 % of 1 000.00 = 80.00; fees from USUAL_FEES (10 % platform, 2.9 % + 0.30 processing; common practice).
    expect(accepted.body.order).toMatchObject({ status: "awaiting_payment", priceMinor: 100_000, taxMinor: 8_000, totalMinor: 108_000 });
    expect(accepted.body.order.sawyerShare).toEqual({ platformFeeMinor: 10_000, processingFeeMinor: 2_930, sawyerNetMinor: 87_070 });
    expect(await listingStatus(listingId)).toBe("reserved");
    expect((await offerRow(rivalId)).status).toBe("declined");
    expect((await rival.get(`/api/v1/offers/${rivalId}`)).body.offer.declineReason).toBe("other_offer_accepted");
    // Nothing else can be bought or accepted while it is reserved.
    const buy = await (await ctx.signedInClient("buyer")).post(`/api/v1/listings/${listingId}/checkout`, { handover: "pickup" });
    expect(buy.status).toBe(409);

    // The buyer pays on the same hosted checkout, from the order page.
    const orderId = accepted.body.order.id as string;
    const order = (await buyer.get(`/api/v1/orders/${orderId}`)).body.order;
    expect(order.paymentPageUrl).toBeTruthy();
    expect((await payOnHostedPage(order.paymentPageUrl)).status).toBe(303);
    await until(async () => (await orderOf(orderId)).status === "paid");
    expect(await listingStatus(listingId)).toBe("sold");
    const entries = await ctx.dataSource.getRepository(LedgerEntryEntity).findBy({ orderId });
    const of = (account: string) => entries.find((e) => e.account === account)?.amountMinor;
    expect(of("provider_clearing")).toBe(108_000);
    expect(of("platform_fees")).toBe(-10_000);
    expect(of("processing_fees")).toBe(-2_930);
    expect(of("tax_payable")).toBe(-8_000);
    expect(of(`sawyer:${sawyer.account.id}`)).toBe(-87_070);
    const charged = fake.store.all("checkout.session").find((s) => (s.metadata as Record<string, string>).order_id === orderId);
    expect(charged?.amount_total).toBe(108_000);
    await until(async () => (await subjects(buyer.account.email)).some((s) => /Offer accepted/.test(s)));
    await until(async () => (await subjects(rival.account.email)).some((s) => /was declined/.test(s)));
  });

  it("the buyer accepts a counter and goes straight to the hosted checkout at the counter's price", async () => {
    const listingId = await listingWithOffers(80_000);
    const buyer = await ctx.signedInClient("buyer");
    const offerId = (await offerOn(buyer, listingId, 60_000)).body.offer.id as string;
    await sawyer.post(`/api/v1/offers/${offerId}/counter`, { amountMinor: 72_500, message: "Meet me here." });
    const took = await buyer.post(`/api/v1/offers/${offerId}/accept-counter`, {
      handover: "freight",
      deliveryAddress: "3 Kiln Row, Lakemont",
    });
    expect(took.status).toBe(200);
    expect(took.body.checkoutUrl).toMatch(/\/pay\//);
    expect(took.body.order).toMatchObject({ priceMinor: 72_500, taxMinor: 5_800, totalMinor: 78_300, handover: "freight" });
    expect((await payOnHostedPage(took.body.checkoutUrl)).status).toBe(303);
    await until(async () => (await orderOf(took.body.order.id)).status === "paid");
    const order = await orderOf(took.body.order.id);
    expect(order.priceMinor + order.taxMinor).toBe(78_300);
    expect(order.platformFeeMinor + order.processingFeeMinor + order.sawyerNetMinor).toBe(72_500);
    await until(async () => (await subjects(sawyer.account.email)).some((s) => s.includes("accepted your $725.00")));
  });

  it("once the slab is sold through Buy, the offers waiting on it are declined", async () => {
    const listingId = await listingWithOffers(70_000);
    const hopeful = await ctx.signedInClient("buyer");
    const offerId = (await offerOn(hopeful, listingId, 60_000)).body.offer.id as string;
    const bought = await (await ctx.signedInClient("buyer")).post(`/api/v1/listings/${listingId}/checkout`, { handover: "pickup" });
    // Reserved by a checkout: the sawyer cannot accept, and the offer still waits.
    const refused = await sawyer.post(`/api/v1/offers/${offerId}/accept`);
    expect(refused.status).toBe(409);
    expect(refused.body.error.code).toBe("listing_not_available");
    expect((await offerRow(offerId)).status).toBe("open");
    await payOnHostedPage(bought.body.checkoutUrl);
    await until(async () => (await offerRow(offerId)).status === "declined");
    expect((await offerRow(offerId)).declineReason).toBe("slab_sold");
  });
});

describe("races", () => {
  it("two accepts of two different offers at once: exactly one is accepted, the other gets a clear 409", async () => {
    for (let round = 0; round < 4; round++) {
      const listingId = await listingWithOffers(90_000);
      const [a, b] = [await ctx.signedInClient("buyer"), await ctx.signedInClient("buyer")];
      const ids = [(await offerOn(a, listingId, 80_000)).body.offer.id, (await offerOn(b, listingId, 81_000)).body.offer.id] as string[];
      // Two tabs of the sawyer (one session), each accepting a different offer.
      const answers = await Promise.all(ids.map((id) => sawyer.post(`/api/v1/offers/${id}/accept`)));
      expect(answers.map((r) => r.status).sort()).toEqual([200, 409]);
      const loser = answers.find((r) => r.status === 409)!;
      expect(["listing_not_available", "offer_state"]).toContain(loser.body.error.code);
      expect(loser.body.error.message.length).toBeGreaterThan(20);
      const rows = await ctx.dataSource.getRepository(OfferEntity).findBy({ listingId });
      expect(rows.filter((r) => r.status === "accepted")).toHaveLength(1);
      expect(await ctx.dataSource.getRepository(OrderEntity).countBy({ listingId })).toBe(1);
    }
  });

  it("an accept against a Buy of the same slab at once: exactly one wins, the other gets a clear 409", async () => {
    const winners = { accept: 0, checkout: 0 };
    for (let round = 0; round < 4; round++) {
      const listingId = await listingWithOffers(90_000);
      const offerer = await ctx.signedInClient("buyer");
      const offerId = (await offerOn(offerer, listingId, 80_000)).body.offer.id as string;
      const shopper = await ctx.signedInClient("buyer");
      const [accept, buy] = await Promise.all([
        sawyer.post(`/api/v1/offers/${offerId}/accept`),
        shopper.post(`/api/v1/listings/${listingId}/checkout`, { handover: "pickup" }),
      ]);
      expect([accept.status, buy.status].sort()).toEqual(accept.status === 200 ? [200, 409] : [201, 409]);
      const lost = accept.status === 409 ? accept : buy;
      expect(lost.body.error.code).toBe("listing_not_available");
      expect(lost.body.error.message).toMatch(/reserved|no longer for sale/);
      if (accept.status === 200) winners.accept += 1;
      else winners.checkout += 1;
      const orders = await ctx.dataSource.getRepository(OrderEntity).findBy({ listingId });
      expect(orders).toHaveLength(1);
      expect(orders[0]!.priceMinor).toBe(accept.status === 200 ? 80_000 : 90_000);
      expect(await listingStatus(listingId)).toBe("reserved");
    }
    expect(winners.accept + winners.checkout).toBe(4);
  });
});
