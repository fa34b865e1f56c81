import type { Server } from "node:http";
import type { AddressInfo } from "node:net";
import sharp from "sharp";
import { afterAll, afterEach, beforeAll, describe, expect, it } from "vitest";
import type { PaymentsFakeApp } from "@grainyard/payments-fake";
import { feeBreakdown } from "@grainyard/slab-math";
import { OrderEntity, PayoutAccountEntity } from "../entities/index.ts";
import { createPayments } from "../integrations/payments-stripe.ts";
import {
  expectLedgerBalanced,
  listenForWebhooks,
  startPaymentsFake,
  until,
  type TestPaymentsFake,
} from "../test-support/payments-harness.ts";
import { browserClient, createTestContext, mailTo, testClock, type BrowserClient, type TestContext } from "../test-support/test-context.ts";
import { payOnHostedPage } from "../test-support/hosted-payment.ts";

/*
 * Paying sawyers, against a payments fake of this test's own (through the official SDK), real
 * MariaDB and the real SMTP sink: payout accounts through the hosted set-up, balances from the
 * ledger with the hold after hand-over, approvals (one, batch, twice), a failed transfer, a
 * refund after a payout, and dispute refunds. The ledger sums to zero after every test.
 */
const WEBHOOK_SECRET = "whsec_payouts_test";
const DAY = 24 * 3_600_000;
let payments: TestPaymentsFake;
let webhookUrl = "";
let fake: PaymentsFakeApp;
let fakeServer: Server;
let fakeBase = "";
let apiServer: Server;
let ctx: TestContext;
const clock = testClock();
let photo: Buffer;
type Client = BrowserClient & { account: { id: string; email: string; password: string; totpSecret?: string | null } };

/** Sessions last 14 days and the test clock moves weeks ahead: the same person signs in afresh. */
async function signInAgain(client: Client): Promise<Client> {
  const fresh = await browserClient(ctx.app);
  const res = await fresh.post("/api/v1/session", { email: client.account.email, password: client.account.password });
  expect(res.status).toBe(200);
  // An admin goes through the second factor's code step (the test clock has moved on, so the code is a new one).
  if (res.body.secondStep && client.account.totpSecret)
    expect((await fresh.post("/api/v1/session/second-factor", { code: await ctx.codeFor(client.account.totpSecret) })).status).toBe(200);
  return Object.assign(fresh, { account: client.account });
}

const ledgerSumsToZero = () => expectLedgerBalanced(ctx.dataSource);
const orderOf = (id: string) => ctx.dataSource.getRepository(OrderEntity).findOneByOrFail({ id });

/** A sawyer, an admin and a buyer of their own (sessions start at the test clock's time). */
async function people() {
  const sawyer = (await ctx.signedInClient("sawyer", {
    yardName: `Marsh Lane Slabs ${Math.random().toString(36).slice(2, 5)}`,
    pickupTown: "Lakemont",
  })) as Client;
  const admin = (await ctx.signedInClient("admin")) as Client;
  const buyer = (await ctx.signedInClient("buyer")) as Client;
  return { sawyer, admin, buyer };
}

/** A live fixed-price listing of one slab by this sawyer. */
async function liveListing(sawyer: Client, admin: Client, priceMinor: number) {
  const slab = (
    await sawyer.post("/api/v1/yard/slabs", {
      speciesSlug: "black-walnut",
      lengthMm: 2200,
      thicknessMm: 55,
      widthStationsMm: [640, 620],
      liveEdge: "both",
      surfacing: "flattened",
      dryingMethod: "kiln",
    })
  ).body.slab;
  const listing = (
    await sawyer.post("/api/v1/yard/listings", {
      title: `Walnut top ${Math.random().toString(36).slice(2, 6)}`,
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
  expect((await admin.post(`/api/v1/admin/listings/${listing.id}/approve`)).status).toBe(200);
  return listing.id as string;
}

/** Bought with the test card, shipped and handed over: the sale is on the sawyer's side of the ledger. */
async function handedOverSale(sawyer: Client, admin: Client, buyer: Client, priceMinor: number, handOver = true) {
  const listingId = await liveListing(sawyer, admin, priceMinor);
  const res = await buyer.post(`/api/v1/listings/${listingId}/checkout`, {
    handover: "freight",
    deliveryAddress: "12 Alder Row, Lakemont",
  });
  expect(res.status).toBe(201);
  const paid = await payOnHostedPage(res.body.checkoutUrl);
  expect(paid.status).toBe(303);
  const orderId = res.body.order.id as string;
  await until(async () => (await orderOf(orderId)).status === "paid");
  if (handOver) {
    expect(
      (
        await sawyer.post(`/api/v1/orders/${orderId}/shipment`, {
          carrier: "Lakeshore Freight Lines",
          trackingReference: `LFL-${orderId.slice(0, 6)}`,
        })
      ).status,
    ).toBe(200);
    expect((await sawyer.post(`/api/v1/orders/${orderId}/handed-over`)).status).toBe(200);
  }
  return orderId;
}

/** The sawyer goes through the fake's hosted set-up; the `account.updated` webhook marks the account ready. */
async function onboard(sawyer: Client) {
  const link = await sawyer.post("/api/v1/yard/payouts/account");
  expect(link.status).toBe(200);
  const url = new URL(link.body.url as string);
  expect(url.origin).toBe(fakeBase);
  const page = await fetch(url);
  expect(page.status).toBe(200);
  const finished = await fetch(`${fakeBase}${url.pathname}`, {
    method: "POST",
    headers: { "content-type": "application/x-www-form-urlencoded" },
    body: new URLSearchParams({
      name: "Marsh Lane Slabs",
      return_url: url.searchParams.get("return_url")!,
      refresh_url: url.searchParams.get("refresh_url")!,
    }),
    redirect: "manual",
  });
  expect(finished.status).toBe(303);
  expect(finished.headers.get("location")).toMatch(/\/yard\/payouts\?setup=returned$/);
  await until(async () => (await sawyer.get("/api/v1/yard/payouts")).body.account.state === "ready");
}

/** What the slab-math fee split leaves the sawyer of a price (10 % platform, 2.9 % + 30 processing: the defaults). */
const netOf = (priceMinor: number) =>
  feeBreakdown(priceMinor, { platformFeeBps: 1000, processingFeeBps: 290, processingFixedMinor: 30 }).sawyerNetMinor;
const balanceOf = async (sawyer: Client) =>
  (await sawyer.get("/api/v1/yard/payouts")).body.balances[0] as { pendingMinor: number; availableMinor: number; paidMinor: number };
const dueFor = async (admin: Client, sawyerId: string) =>
  (
    (await admin.get("/api/v1/admin/payouts/due")).body.due as {
      sawyerId: string;
      dueKey: string;
      amountMinor: number;
      currency: string;
      lines: { orderId: string; amountMinor: number }[];
      blockedReason: string | null;
      accountState: string;
    }[]
  ).filter((d) => d.sawyerId === sawyerId);
const transfersTo = (accountId: string) => fake.store.all("transfer").filter((t) => t.destination === accountId);
const providerAccountOf = async (sawyerId: string) =>
  (await ctx.dataSource.getRepository(PayoutAccountEntity).findOneByOrFail({ sawyerId })).providerAccountId;

beforeAll(async () => {
  payments = await startPaymentsFake({ secretKey: "sk_test_payouts", webhookSecret: WEBHOOK_SECRET });
  ({ fake, server: fakeServer } = payments);
  fakeBase = payments.base;
  ctx = await createTestContext({
    clock,
    environment: { ...payments.environment, TAX_RATE_BPS: "0", SIGN_IN_LIMIT_PER_IP: "1000" },
  });
  ({ server: apiServer, webhookUrl } = await listenForWebhooks(ctx.app));
  fake.webhooks.options.url = webhookUrl;
  photo = await sharp({ create: { width: 640, height: 480, channels: 3, background: "#5a3a22" } })
    .jpeg()
    .toBuffer();
}, 60_000);
afterEach(async () => ledgerSumsToZero());
afterAll(async () => {
  await new Promise((r) => apiServer.close(r));
  await payments.close();
  await ctx?.close();
});

describe("payouts to sawyers", () => {
  it("a sale is pending until hand-over plus the 7-day hold, then due; the admin approves, one transfer goes out, the sawyer sees it paid with a statement", async () => {
    const { sawyer, admin, buyer } = await people();
    // No payout account yet: the sawyer can sell but sees why money cannot be sent.
    const before = await sawyer.get("/api/v1/yard/payouts");
    expect(before.body).toMatchObject({ account: { state: "none" }, holdDays: 7, balances: [], payouts: [] });
    expect(before.body.blockedReason).toMatch(/Set up a payout account/);

    const orderId = await handedOverSale(sawyer, admin, buyer, 120_000, false);
    const net = netOf(120_000); // 120 000 − 12 000 − (3 480 + 30) = 104 490
    expect(net).toBe(104_490);
    expect(await balanceOf(sawyer)).toEqual({ currency: "USD", pendingMinor: net, availableMinor: 0, paidMinor: 0 });
    // Not handed over yet: no date to give.
    expect((await sawyer.get("/api/v1/yard/payouts")).body.pending).toMatchObject([{ orderId, amountMinor: net, availableFrom: null }]);
    await sawyer.post(`/api/v1/orders/${orderId}/shipment`, { carrier: "Lakeshore Freight Lines", trackingReference: "LFL-77120" });
    await sawyer.post(`/api/v1/orders/${orderId}/handed-over`);
    clock.advance(6 * DAY); // inside the hold
    expect(await balanceOf(sawyer)).toMatchObject({ pendingMinor: net, availableMinor: 0 });
    // The pending money says when it becomes available: the hand-over plus the 7 hold days.
    const handedOverAt = (await sawyer.get(`/api/v1/orders/${orderId}`)).body.order.steps.handedOverAt as string;
    expect((await sawyer.get("/api/v1/yard/payouts")).body.pending).toEqual([
      {
        orderId,
        listingTitle: expect.any(String),
        currency: "USD",
        amountMinor: net,
        availableFrom: new Date(Date.parse(handedOverAt) + 7 * DAY).toISOString(),
      },
    ]);
    expect(await dueFor(admin, sawyer.account.id)).toEqual([]);
    clock.advance(1 * DAY + 60_000); // hold over
    expect(await balanceOf(sawyer)).toMatchObject({ pendingMinor: 0, availableMinor: net });

    // Due, but blocked until the sawyer finishes the payout account.
    const [blocked] = await dueFor(admin, sawyer.account.id);
    expect(blocked).toMatchObject({ amountMinor: net, accountState: "none", lines: [{ orderId, amountMinor: net }] });
    const refused = await admin.post("/api/v1/admin/payouts", { sawyerId: sawyer.account.id, currency: "USD", dueKey: blocked!.dueKey });
    expect(refused.status).toBe(409);
    expect(refused.body.error.code).toBe("payout_account_missing");

    await onboard(sawyer);
    const [due] = await dueFor(admin, sawyer.account.id);
    expect(due).toMatchObject({ accountState: "ready", blockedReason: null, dueKey: blocked!.dueKey });
    // Buyers and sawyers cannot approve payouts.
    expect((await sawyer.post("/api/v1/admin/payouts", { sawyerId: sawyer.account.id, currency: "USD", dueKey: due!.dueKey })).status).toBe(
      403,
    );

    const approved = await admin.post("/api/v1/admin/payouts", { sawyerId: sawyer.account.id, currency: "USD", dueKey: due!.dueKey });
    expect(approved.status).toBe(200);
    expect(approved.body.payout).toMatchObject({
      status: "sent",
      amountMinor: net,
      currency: "USD",
      failureReason: null,
      lines: [{ orderId, amountMinor: net }],
    });
    const account = await providerAccountOf(sawyer.account.id);
    expect(transfersTo(account).map((t) => t.amount)).toEqual([net]);

    // Approving the same payout again sends nothing more.
    const again = await admin.post("/api/v1/admin/payouts", { sawyerId: sawyer.account.id, currency: "USD", dueKey: due!.dueKey });
    expect(again.body.payout.id).toBe(approved.body.payout.id);
    expect(transfersTo(account)).toHaveLength(1);
    expect(await dueFor(admin, sawyer.account.id)).toEqual([]);

    const mine = await sawyer.get("/api/v1/yard/payouts");
    expect(mine.body.balances[0]).toEqual({ currency: "USD", pendingMinor: 0, availableMinor: 0, paidMinor: net });
    expect(mine.body.pending).toEqual([]);
    expect(mine.body.payouts).toMatchObject([{ status: "sent", amountMinor: net, lines: [{ orderId }] }]);
    await until(async () => (await mailTo(sawyer.account.email)).some((m) => /^Grainyard sent you \$1,044\.90/.test(m.subject)));

    const csv = await sawyer.get("/api/v1/yard/payouts/statement.csv");
    expect(csv.headers["content-type"]).toMatch(/text\/csv/);
    const rows = csv.text.trim().split("\n");
    expect(rows[0]).toBe("date,what,order,listing,currency,amount,owed to you after");
    expect(rows.slice(1).map((r) => r.split(",").slice(1, 2)[0])).toEqual(["sale", "paid out to you"]);
    expect(rows.at(-1)!.endsWith(",USD,-1044.90,0.00")).toBe(true);
    // The admin's audit log has the approval.
    const audit = await admin.get("/api/v1/admin/audit?action=payout.approve");
    expect(audit.status).toBe(200);
    expect(JSON.stringify(audit.body)).toContain(approved.body.payout.id);
  });

  it("two approvals of the same payout at once send money once; a stale statement is refused", async () => {
    const { sawyer, admin, buyer } = await people();
    await onboard(sawyer);
    await handedOverSale(sawyer, admin, buyer, 50_000);
    clock.advance(8 * DAY);
    const [due] = await dueFor(admin, sawyer.account.id);
    const stale = await admin.post("/api/v1/admin/payouts", { sawyerId: sawyer.account.id, currency: "USD", dueKey: "not-the-key" });
    expect(stale.status).toBe(409);
    expect(stale.body.error.code).toBe("payout_changed");
    const both = await Promise.all(
      [0, 1].map(() => admin.post("/api/v1/admin/payouts", { sawyerId: sawyer.account.id, currency: "USD", dueKey: due!.dueKey })),
    );
    expect(both.map((r) => r.status)).toEqual([200, 200]);
    expect(both[0]!.body.payout.id).toBe(both[1]!.body.payout.id);
    expect(transfersTo(await providerAccountOf(sawyer.account.id)).map((t) => t.amount)).toEqual([netOf(50_000)]);
  });

  it("with the provider down the payout stays open (503, nothing in the ledger); approving again later sends it with the same idempotency key, once", async () => {
    const { sawyer, admin, buyer } = await people();
    await onboard(sawyer);
    await handedOverSale(sawyer, admin, buyer, 70_000);
    clock.advance(8 * DAY);
    const [due] = await dueFor(admin, sawyer.account.id);
    const port = (fakeServer.address() as AddressInfo).port;
    await new Promise((r) => fakeServer.close(r));
    fakeServer.closeAllConnections();
    const down = await admin.post("/api/v1/admin/payouts", { sawyerId: sawyer.account.id, currency: "USD", dueKey: due!.dueKey });
    fakeServer = fake.listen(port, "127.0.0.1");
    payments.server = fakeServer;
    await new Promise((r) => fakeServer.once("listening", r));
    expect(down.status).toBe(503);
    expect(down.body.error.message).toMatch(/not answering/);
    const [open] = (await ctx.dataSource.query("SELECT id, status FROM payout WHERE due_key = ?", [due!.dueKey])) as {
      id: string;
      status: string;
    }[];
    expect(open!.status).toBe("sending");
    expect(await balanceOf(sawyer)).toMatchObject({ availableMinor: 0, paidMinor: netOf(70_000) }); // on its way
    // Suppose the first call had reached the provider and only its answer was lost: the same key was used.
    const accountId = await providerAccountOf(sawyer.account.id);
    await createPayments(ctx.config.payments).transfer({
      amountMinor: netOf(70_000),
      currency: "USD",
      accountId,
      payoutId: open!.id,
      sawyerId: sawyer.account.id,
      idempotencyKey: `payout-${open!.id}`,
    });
    const again = await admin.post("/api/v1/admin/payouts", { sawyerId: sawyer.account.id, currency: "USD", dueKey: due!.dueKey });
    expect(again.body.payout).toMatchObject({ id: open!.id, status: "sent" });
    expect(transfersTo(accountId)).toHaveLength(1);
  });

  it("a failed transfer leaves the balance intact and shows why; once the account is fixed the admin tries again and it goes out", async () => {
    const { sawyer, admin, buyer } = await people();
    await onboard(sawyer);
    await handedOverSale(sawyer, admin, buyer, 80_000);
    clock.advance(8 * DAY);
    // The provider restricts the account (say, a bank detail needs checking) but its update has not reached us.
    const accountId = await providerAccountOf(sawyer.account.id);
    const remote = fake.store.get(accountId, "account")!;
    fake.store.put({ ...remote, payouts_enabled: false });
    const [due] = await dueFor(admin, sawyer.account.id);
    const failed = await admin.post("/api/v1/admin/payouts", { sawyerId: sawyer.account.id, currency: "USD", dueKey: due!.dueKey });
    expect(failed.status).toBe(200);
    expect(failed.body.payout.status).toBe("failed");
    expect(failed.body.payout.failureReason).toMatch(/not finished onboarding/);
    expect(transfersTo(accountId)).toHaveLength(0);
    expect(await balanceOf(sawyer)).toMatchObject({ availableMinor: netOf(80_000), paidMinor: 0 });
    const [still] = await dueFor(admin, sawyer.account.id);
    expect(still).toMatchObject({ dueKey: due!.dueKey, lastFailure: failed.body.payout.failureReason });

    fake.store.put({ ...remote, payouts_enabled: true });
    const retried = await admin.post("/api/v1/admin/payouts", { sawyerId: sawyer.account.id, currency: "USD", dueKey: due!.dueKey });
    expect(retried.body.payout).toMatchObject({ status: "sent", amountMinor: netOf(80_000) });
    expect(retried.body.payout.id).not.toBe(failed.body.payout.id);
    expect(transfersTo(accountId)).toHaveLength(1);
    const listed = await admin.get("/api/v1/admin/payouts?status=failed");
    expect(listed.body.payouts.map((p: { id: string }) => p.id)).toContain(failed.body.payout.id);
    expect((await admin.get("/api/v1/admin/payouts?status=lost")).status).toBe(422);
  });

  it("a batch approves several sawyers; a sale still in its hold is left for later", async () => {
    const a = await people();
    const b = await people();
    await onboard(a.sawyer);
    await onboard(b.sawyer);
    await handedOverSale(a.sawyer, a.admin, a.buyer, 40_000);
    await handedOverSale(b.sawyer, b.admin, b.buyer, 60_000);
    clock.advance(8 * DAY);
    await handedOverSale(a.sawyer, a.admin, a.buyer, 30_000); // handed over just now: pending
    const due = [...(await dueFor(a.admin, a.sawyer.account.id)), ...(await dueFor(a.admin, b.sawyer.account.id))];
    expect(due.map((d) => d.amountMinor)).toEqual([netOf(40_000), netOf(60_000)]);
    const batch = await a.admin.post("/api/v1/admin/payouts/batch", {
      payouts: due.map((d) => ({ sawyerId: d.sawyerId, currency: d.currency, dueKey: d.dueKey })),
    });
    expect(batch.status).toBe(200);
    expect(batch.body.results.map((r: { payout: { status: string } }) => r.payout.status)).toEqual(["sent", "sent"]);
    expect(await balanceOf(a.sawyer)).toEqual({
      currency: "USD",
      pendingMinor: netOf(30_000),
      availableMinor: 0,
      paidMinor: netOf(40_000),
    });
    expect((await a.admin.post("/api/v1/admin/payouts/batch", { payouts: [] })).status).toBe(422);
  });
});

describe("dispute refunds", () => {
  it("a partial refund after a payout is split across tax, fees and the sawyer's share; the sawyer's next payout takes it back", async () => {
    const cast = await people();
    let { sawyer, admin } = cast;
    const { buyer } = cast;
    await onboard(sawyer);
    const first = await handedOverSale(sawyer, admin, buyer, 100_000);
    clock.advance(8 * DAY);
    const [due] = await dueFor(admin, sawyer.account.id);
    expect(
      (await admin.post("/api/v1/admin/payouts", { sawyerId: sawyer.account.id, currency: "USD", dueKey: due!.dueKey })).body.payout.status,
    ).toBe("sent");

    // What the admin's refund form starts from: nothing refunded yet, the whole total left.
    expect((await admin.get(`/api/v1/admin/orders/${first}/refund`)).body).toEqual({
      orderId: first,
      currency: "USD",
      totalMinor: 100_000,
      refundedMinor: 0,
      refundableMinor: 100_000,
      canRefund: true,
      refunds: [],
    });
    expect((await buyer.get(`/api/v1/admin/orders/${first}/refund`)).status).toBe(403);

    // Bad input first: nothing changes.
    expect((await admin.post(`/api/v1/admin/orders/${first}/refund`, { amountMinor: 0, reason: "Crack not shown" })).status).toBe(422);
    expect((await admin.post(`/api/v1/admin/orders/${first}/refund`, { amountMinor: 2_000, reason: "" })).status).toBe(422);
    const tooMuch = await admin.post(`/api/v1/admin/orders/${first}/refund`, { amountMinor: 100_001, reason: "Crack not shown in photos" });
    expect(tooMuch.status).toBe(422);
    expect(tooMuch.body.error.fields.amountMinor).toMatch(/More than is left/);
    expect(
      (await buyer.post(`/api/v1/admin/orders/${first}/refund`, { amountMinor: 10_000, reason: "Crack not shown in photos" })).status,
    ).toBe(403);

    // 20 % back: the sawyer's share of it is 20 % of their net (largest-remainder split, slab-math refundShares).
    const refund = await admin.post(`/api/v1/admin/orders/${first}/refund`, {
      amountMinor: 20_000,
      reason: "A check at one end was not shown in the photos.",
    });
    expect(refund.status).toBe(200);
    expect(refund.body).toEqual({ refundedMinor: 20_000, refundableMinor: 80_000 });
    expect((await admin.get(`/api/v1/admin/orders/${first}/refund`)).body).toMatchObject({
      refundedMinor: 20_000,
      refundableMinor: 80_000,
      canRefund: true,
      refunds: [{ amountMinor: 20_000, reason: "A check at one end was not shown in the photos." }],
    });
    const sawyerShare = Math.round(netOf(100_000) * 0.2); // net 87 070 × 0.2 = 17 414 exactly (no remainder to place)
    expect(sawyerShare).toBe(17_414);
    const refunds = fake.store.all("refund").filter((r) => r.amount === 20_000);
    expect(refunds).toHaveLength(1);
    for (const address of [buyer.account.email, sawyer.account.email]) {
      await until(async () =>
        (await mailTo(address)).some(
          (m) => /^Partial refund on/.test(m.subject) && m.text.includes("A check at one end was not shown in the photos."),
        ),
      );
    }
    expect((await orderOf(first)).status).not.toBe("refunded");
    // Already paid out, so the sawyer now owes that share back…
    expect(await balanceOf(sawyer)).toMatchObject({ availableMinor: -sawyerShare, paidMinor: netOf(100_000) });

    // …and it comes off the next payout as a negative line.
    const second = await handedOverSale(sawyer, admin, buyer, 50_000);
    clock.advance(8 * DAY);
    [sawyer, admin] = await Promise.all([sawyer, admin].map(signInAgain));
    const [next] = await dueFor(admin, sawyer.account.id);
    expect(next!.amountMinor).toBe(netOf(50_000) - sawyerShare);
    expect(next!.lines).toEqual(
      expect.arrayContaining([
        expect.objectContaining({ orderId: first, amountMinor: -sawyerShare }),
        expect.objectContaining({ orderId: second, amountMinor: netOf(50_000) }),
      ]),
    );
    const sent = await admin.post("/api/v1/admin/payouts", { sawyerId: sawyer.account.id, currency: "USD", dueKey: next!.dueKey });
    expect(sent.body.payout).toMatchObject({ status: "sent", amountMinor: netOf(50_000) - sawyerShare });
    expect(await balanceOf(sawyer)).toMatchObject({ pendingMinor: 0, availableMinor: 0 });

    // The rest of the order refunded: it is refunded in full now, and cannot be refunded again.
    expect(
      (await admin.post(`/api/v1/admin/orders/${first}/refund`, { amountMinor: 80_000, reason: "The buyer returned the slab." })).body,
    ).toEqual({ refundedMinor: 100_000, refundableMinor: 0 });
    expect((await orderOf(first)).status).toBe("refunded");
    expect((await admin.post(`/api/v1/admin/orders/${first}/refund`, { amountMinor: 1, reason: "Once more" })).status).toBe(409);
    expect((await admin.get(`/api/v1/admin/orders/${first}/refund`)).body).toMatchObject({
      refundedMinor: 100_000,
      refundableMinor: 0,
      canRefund: false,
    });
  });

  it("a refund before hand-over (the sale still pending) lowers what will be paid", async () => {
    const { sawyer, admin, buyer } = await people();
    const orderId = await handedOverSale(sawyer, admin, buyer, 100_000, false);
    await admin.post(`/api/v1/admin/orders/${orderId}/refund`, {
      amountMinor: 50_000,
      reason: "Half back: the slab arrived with a split.",
    });
    expect(await balanceOf(sawyer)).toMatchObject({ pendingMinor: netOf(100_000) - netOf(100_000) / 2, availableMinor: 0 });
  });
});
