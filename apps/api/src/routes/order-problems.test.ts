import type { Server } from "node:http";
import { afterAll, afterEach, beforeAll, describe, expect, it } from "vitest";
import type { PaymentsFakeApp } from "@grainyard/payments-fake";
import { AuditEntryEntity, LedgerEntryEntity, OrderEntity, OrderProblemEntity, OrderRefundEntity } from "../entities/index.ts";
import {
  expectLedgerBalanced,
  listenForWebhooks,
  startPaymentsFake,
  until,
  type TestPaymentsFake,
} from "../test-support/payments-harness.ts";
import { createTestContext, mailTo, testClock, type BrowserClient, type TestContext } from "../test-support/test-context.ts";
import { payOnHostedPage } from "../test-support/hosted-payment.ts";
import { liveListing } from "../test-support/live-listing.ts";

/*
 * A problem the buyer reports after hand-over instead of confirming receipt: who may report it and
 * when (only the order's buyer, only between hand-over and completion, once), the completion sweep
 * leaving it alone, and the desk settling it either way — a refund through the refund service or
 * the sale released to the sawyer — with the ledger, the refunds, the audit log and the e-mails
 * checked. Real MariaDB, real SMTP sink, the official SDK against a payments fake of this test's own.
 */
const WEBHOOK_SECRET = "whsec_order_problems_test";
const DAY = 86_400_000;
let payments: TestPaymentsFake;
let fake: PaymentsFakeApp;
let apiServer: Server;
let ctx: TestContext;
const clock = testClock();
type Signed = BrowserClient & { account: { id: string; email: string } };
let sawyer: Signed;
let admin: Signed;
const app = () => ctx.app as unknown as { orders: { completeDueOrders(): Promise<number> } };

const orderOf = async (id: string) => ctx.dataSource.getRepository(OrderEntity).findOneByOrFail({ id });
const mailed = (address: string, subject: RegExp) => until(async () => (await mailTo(address)).some((m) => subject.test(m.subject)));

/** Bought with the test card by a new buyer (freight), paid; shipped and handed over unless told otherwise. */
async function order(priceMinor = 100_000, handOver = true) {
  const listingId = await liveListing(sawyer, admin, {
    title: `Walnut top ${Math.random().toString(36).slice(2, 6)}`,
    speciesSlug: "black-walnut",
    rateMinor: priceMinor,
  });
  const buyer = (await ctx.signedInClient("buyer")) as Signed;
  const res = await buyer.post(`/api/v1/listings/${listingId}/checkout`, {
    handover: "freight",
    deliveryAddress: "7 Heron Walk, Lakemont",
  });
  expect(res.status).toBe(201);
  const paid = await payOnHostedPage(res.body.checkoutUrl);
  expect(paid.status).toBe(303);
  const orderId = res.body.order.id as string;
  await until(async () => (await orderOf(orderId)).status === "paid");
  if (handOver) {
    expect(
      (await sawyer.post(`/api/v1/orders/${orderId}/shipment`, { carrier: "Lakeshore Freight Lines", trackingReference: "LFL-PRB-1" }))
        .status,
    ).toBe(200);
    expect((await sawyer.post(`/api/v1/orders/${orderId}/handed-over`)).status).toBe(200);
  }
  return { buyer, orderId };
}

const problem = { kind: "not_as_described", comment: "A long check runs through the middle that the photos did not show." };
const report = (client: BrowserClient, orderId: string, body: object = problem) => client.post(`/api/v1/orders/${orderId}/problem`, body);

/** The ledger's sum per account for one order. */
async function ledgerOf(orderId: string): Promise<Record<string, number>> {
  const rows = await ctx.dataSource.getRepository(LedgerEntryEntity).findBy({ orderId });
  const sums: Record<string, number> = {};
  for (const row of rows) sums[row.account] = (sums[row.account] ?? 0) + Number(row.amountMinor);
  return sums;
}
const kindsOf = async (orderId: string) =>
  (await ctx.dataSource.getRepository(LedgerEntryEntity).findBy({ orderId })).map((r) => r.kind).sort();

beforeAll(async () => {
  payments = await startPaymentsFake({ secretKey: "sk_test_problems", webhookSecret: WEBHOOK_SECRET });
  fake = payments.fake;
  ctx = await createTestContext({
    clock,
    environment: { ...payments.environment, TAX_RATE_BPS: "500", AUTO_COMPLETE_DAYS: "14", SIGN_IN_LIMIT_PER_IP: "1000" },
  });
  let webhookUrl: string;
  ({ server: apiServer, webhookUrl } = await listenForWebhooks(ctx.app));
  fake.webhooks.options.url = webhookUrl;
  sawyer = (await ctx.signedInClient("sawyer", { yardName: "Quarry Bend Slabs", pickupTown: "Lakemont" })) as Signed;
  admin = (await ctx.signedInClient("admin")) as Signed;
}, 60_000);
afterEach(async () => expectLedgerBalanced(ctx.dataSource));
afterAll(async () => {
  await new Promise((r) => apiServer.close(r));
  await payments.close();
  await ctx?.close();
});

describe("the buyer reports a problem", () => {
  it("only the order's buyer, only after hand-over and before completion, and once; the sawyer, the desk and the buyer are e-mailed", async () => {
    const { buyer, orderId } = await order(100_000, false);
    // Before hand-over: cancelling is the way, not a problem report.
    const early = await report(buyer, orderId);
    expect(early.status).toBe(409);
    expect(early.body.error.code).toBe("order_state");
    await sawyer.post(`/api/v1/orders/${orderId}/shipment`, { carrier: "Lakeshore Freight Lines", trackingReference: "LFL-PRB-2" });
    expect((await report(buyer, orderId)).status).toBe(409);
    // Handed over: the buyer may confirm receipt or report a problem.
    await sawyer.post(`/api/v1/orders/${orderId}/handed-over`);
    expect((await buyer.get(`/api/v1/orders/${orderId}`)).body.order.actions).toEqual(["confirm_receipt", "report_problem"]);
    expect((await sawyer.get(`/api/v1/orders/${orderId}`)).body.order.actions).toEqual([]);

    // Nobody else may: another buyer (not theirs), the sawyer and an admin (buyers only).
    const otherBuyer = await ctx.signedInClient("buyer");
    for (const client of [otherBuyer, sawyer, admin]) expect((await report(client, orderId)).status).toBe(403);
    // Bad input: a clear error per field, and nothing changes.
    const blank = await report(buyer, orderId, { kind: "too_heavy", comment: "bad" });
    expect(blank.status).toBe(422);
    expect(Object.keys(blank.body.error.fields).sort()).toEqual(["comment", "kind"]);
    expect((await orderOf(orderId)).status).toBe("handed_over");

    const reported = await report(buyer, orderId);
    expect(reported.status).toBe(201);
    expect(reported.body.order).toMatchObject({
      status: "problem_reported",
      autoCompleteAt: null,
      actions: [],
      problem: { kind: "not_as_described", comment: problem.comment, status: "open", resolutionNote: null, refundedMinor: null },
    });
    // Once: a second report, or confirming receipt now, is refused.
    expect((await report(buyer, orderId, { kind: "not_received", comment: "And now it has not arrived either." })).status).toBe(409);
    expect((await buyer.post(`/api/v1/orders/${orderId}/completion`)).status).toBe(409);
    expect(await ctx.dataSource.getRepository(OrderProblemEntity).countBy({ orderId })).toBe(1);
    // The sawyer reads the buyer's words on the order too.
    expect((await sawyer.get(`/api/v1/orders/${orderId}`)).body.order.problem).toMatchObject({ comment: problem.comment, status: "open" });

    await mailed(sawyer.account.email, /^The buyer reported a problem/);
    const toSawyer = (await mailTo(sawyer.account.email)).find((m) => /^The buyer reported a problem/.test(m.subject))!;
    expect(toSawyer.text).toContain(problem.comment);
    await mailed(admin.account.email, /^Problem reported on/);
    expect((await mailTo(admin.account.email)).find((m) => /^Problem reported on/.test(m.subject))!.text).toContain(problem.comment);
    await mailed(buyer.account.email, /^We have your problem report/);

    // On the desk: the case with the order, both parties and the buyer's words.
    const desk = await admin.get("/api/v1/admin/order-problems");
    expect(desk.status).toBe(200);
    expect(desk.body.problems.find((p: { orderId: string }) => p.orderId === orderId)).toMatchObject({
      kind: "not_as_described",
      comment: problem.comment,
      status: "open",
      orderStatus: "problem_reported",
      totalMinor: 105_000,
      buyer: { id: buyer.account.id, email: buyer.account.email },
      sawyer: { id: sawyer.account.id, yardName: "Quarry Bend Slabs" },
    });
    expect((await buyer.get("/api/v1/admin/order-problems")).status).toBe(403);
  });

  it("a completed order takes no report", async () => {
    const { buyer, orderId } = await order();
    expect((await buyer.post(`/api/v1/orders/${orderId}/completion`)).status).toBe(200);
    const late = await report(buyer, orderId);
    expect(late.status).toBe(409);
    expect(late.body.error.message).toBe("This order is completed, so it cannot have a problem reported now.");
  });

  it("the completion sweep skips an order with a reported problem and completes the others due", async () => {
    const quiet = await order();
    const disputed = await order();
    expect((await report(disputed.buyer, disputed.orderId)).status).toBe(201);
    clock.advance(15 * DAY);
    try {
      expect(await app().orders.completeDueOrders()).toBeGreaterThanOrEqual(1);
      expect((await orderOf(quiet.orderId)).status).toBe("completed");
      expect((await orderOf(disputed.orderId)).status).toBe("problem_reported");
      expect((await orderOf(disputed.orderId)).completedAt).toBeNull();
      // And again later: still waiting for the desk.
      clock.advance(30 * DAY);
      await app().orders.completeDueOrders();
      expect((await orderOf(disputed.orderId)).status).toBe("problem_reported");
    } finally {
      clock.advance(-45 * DAY);
    }
  });
});

describe("the desk settles a problem", () => {
  const resolve = (client: BrowserClient, problemId: string, body: object) =>
    client.post(`/api/v1/admin/order-problems/${problemId}/resolve`, body);
  const problemIdOf = async (orderId: string) => (await ctx.dataSource.getRepository(OrderProblemEntity).findOneByOrFail({ orderId })).id;

  it("releases the sale to the sawyer: completed by the desk, the sale untouched in the ledger, audited, both told; once", async () => {
    const { buyer, orderId } = await order();
    await report(buyer, orderId, { kind: "not_received", comment: "The carrier says delivered but nothing came to the house." });
    const id = await problemIdOf(orderId);
    const ledgerBefore = await ledgerOf(orderId);

    expect((await resolve(sawyer, id, { resolution: "release", note: "Signed for." })).status).toBe(403);
    expect((await resolve(admin, id, { resolution: "release", note: "" })).status).toBe(422);
    // The order's own refund form refuses it while the desk has the case.
    expect((await admin.post(`/api/v1/admin/orders/${orderId}/refund`, { amountMinor: 1_000, reason: "Not here" })).status).toBe(409);

    const released = await resolve(admin, id, {
      resolution: "release",
      note: "The carrier's proof of delivery carries the buyer's signature.",
    });
    expect(released.status).toBe(200);
    expect(released.body.problem).toMatchObject({ status: "released", orderStatus: "completed", refundedMinor: null });
    const after = await orderOf(orderId);
    expect(after).toMatchObject({ status: "completed", completedBy: "desk" });
    // No money moved: the ledger holds exactly the sale, which is now the sawyer's after the hold.
    expect(await kindsOf(orderId)).toEqual(expect.arrayContaining(["payment"]));
    expect((await kindsOf(orderId)).every((k) => k === "payment")).toBe(true);
    expect(await ledgerOf(orderId)).toEqual(ledgerBefore);
    expect(await ctx.dataSource.getRepository(OrderRefundEntity).countBy({ orderId })).toBe(0);
    expect(await ctx.dataSource.getRepository(AuditEntryEntity).countBy({ targetId: orderId, action: "order.problem_release" })).toBe(1);

    expect((await resolve(admin, id, { resolution: "refund", note: "Changed my mind." })).body.error.code).toBe("problem_resolved");
    await mailed(buyer.account.email, /^Problem settled, order complete/);
    await mailed(sawyer.account.email, /^Problem settled, order complete/);
    expect((await mailTo(buyer.account.email)).find((m) => /^Problem settled/.test(m.subject))!.text).toContain("proof of delivery");
    // The buyer sees the outcome on the order.
    expect((await buyer.get(`/api/v1/orders/${orderId}`)).body.order.problem).toMatchObject({ status: "released" });
    expect((await admin.get("/api/v1/admin/order-problems?status=released")).body.problems.map((p: { id: string }) => p.id)).toContain(id);
  });

  it("refunds everything through the refund service: refunded, the sale reversed account by account, once at the provider", async () => {
    const { buyer, orderId } = await order(100_000);
    await report(buyer, orderId);
    const id = await problemIdOf(orderId);
    const sale = await ledgerOf(orderId);
    const settled = await resolve(admin, id, { resolution: "refund", note: "The check was not disclosed; full refund, slab goes back." });
    expect(settled.status).toBe(200);
    expect(settled.body.problem).toMatchObject({ status: "refunded", refundedMinor: 105_000, orderStatus: "refunded" });
    expect((await orderOf(orderId)).status).toBe("refunded");
    const refunds = await ctx.dataSource.getRepository(OrderRefundEntity).findBy({ orderId });
    expect(refunds.map((r) => [r.kind, r.amountMinor])).toEqual([["dispute", 105_000]]);
    const intent = (await orderOf(orderId)).paymentIntentId;
    expect(fake.store.all("refund").filter((r) => r.payment_intent === intent)).toHaveLength(1);
    // Every account's part of the sale came back in full: each sums to zero for this order.
    const afterRefund = await ledgerOf(orderId);
    for (const account of Object.keys(sale)) expect({ account, sum: afterRefund[account] }).toEqual({ account, sum: 0 });
    expect((await kindsOf(orderId)).filter((k) => k === "dispute_refund").length).toBeGreaterThan(0);
    expect(await ctx.dataSource.getRepository(AuditEntryEntity).countBy({ targetId: orderId, action: "order.problem_refund" })).toBe(1);
    await mailed(buyer.account.email, /^Problem settled with a refund of \$1,050\.00/);
    await mailed(sawyer.account.email, /^Problem settled with a refund of \$1,050\.00/);
    expect((await resolve(admin, id, { resolution: "refund", note: "Again" })).status).toBe(409);
  });

  it("refunds a part: the rest of the sale is the sawyer's and the order completes; the sawyer's share goes down in proportion", async () => {
    const { buyer, orderId } = await order(100_000);
    await report(buyer, orderId);
    const id = await problemIdOf(orderId);
    const sale = await ledgerOf(orderId);
    const tooMuch = await resolve(admin, id, { resolution: "refund", amountMinor: 105_001, note: "Too much" });
    expect(tooMuch.status).toBe(422);
    // A refused amount gives the case back: still open.
    expect((await ctx.dataSource.getRepository(OrderProblemEntity).findOneByOrFail({ id })).status).toBe("open");

    const part = await resolve(admin, id, { resolution: "refund", amountMinor: 21_000, note: "A fifth back for the undisclosed check." });
    expect(part.status).toBe(200);
    expect(part.body.problem).toMatchObject({ status: "refunded", refundedMinor: 21_000, orderStatus: "completed" });
    expect(await orderOf(orderId)).toMatchObject({ status: "completed", completedBy: "desk" });
    const after = await ledgerOf(orderId);
    const sawyerAccount = `sawyer:${sawyer.account.id}`;
    // 21 000 of 105 000 is a fifth: the sawyer keeps four fifths of their net (slab-math refundShares splits it exactly).
    expect(after.provider_clearing).toBe(sale.provider_clearing! - 21_000);
    expect(after[sawyerAccount]).toBe(Math.round(sale[sawyerAccount]! * 0.8));
    expect(after.tax_payable).toBe(sale.tax_payable! + 1_000);
  });
});
