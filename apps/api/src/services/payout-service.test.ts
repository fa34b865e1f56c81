import { afterAll, afterEach, beforeAll, describe, expect, it } from "vitest";
import { AuditEntryEntity, LedgerEntryEntity, OrderRefundEntity, PayoutEntity } from "../entities/index.ts";
import { Invalid, ServiceUnavailable } from "../errors.ts";
import type { Actor } from "./actor.ts";
import { createServiceHarness, type ServiceHarness } from "../test-support/service-harness.ts";

/*
 * Paying sawyers through the payout and refund services, with the payments port and the mailer in
 * memory (fast), on a throwaway MariaDB schema; routes/payouts.test.ts runs the same journeys
 * against the payments fake through the official SDK.
 */
let h: ServiceHarness;
const DAY = 24 * 3_600_000;
type Person = Extract<Actor, { kind: "account" }> & { email: string };

beforeAll(async () => {
  h = await createServiceHarness({ holdDays: 7 });
}, 60_000);
afterEach(async () => h.ledgerBalanced());
afterAll(async () => h?.close());

/** A paid freight order, shipped and handed over now. */
async function handedOver(sawyer: Person, buyer: Person, priceMinor: number) {
  const order = await h.paidOrder(buyer, await h.liveListing(sawyer, priceMinor), "freight");
  await h.orders.markShipped(sawyer, order.id, { carrier: "Lakeshore Freight", trackingReference: `LFL-${order.id.slice(0, 5)}` });
  await h.orders.markHandedOver(sawyer, order.id);
  return h.orderOf(order.id);
}

/** The sawyer sets up a payout account; the provider's event marks it ready. */
async function onboard(sawyer: Person): Promise<string> {
  const { url } = await h.payouts.onboardingLink(sawyer);
  const accountId = new URL(url).pathname.split("/").at(-1)!;
  expect(await h.checkout.handleEvent(h.payments.finishOnboarding(accountId))).toBe("handled");
  return accountId;
}

async function later<T>(days: number, work: () => Promise<T>): Promise<T> {
  h.clock.advance(days * DAY);
  try {
    return await work();
  } finally {
    h.clock.advance(-days * DAY);
  }
}

describe("payout accounts", () => {
  it("set-up makes one account at the provider (however often it starts), ready once the provider says so", async () => {
    const sawyer = await h.person("sawyer");
    expect((await h.payouts.mine(sawyer)).account.state).toBe("none");
    const first = await h.payouts.onboardingLink(sawyer);
    const again = await h.payouts.onboardingLink(sawyer);
    expect(new URL(again.url).pathname).toBe(new URL(first.url).pathname);
    expect([...h.payments.accounts.values()].filter((a) => a.sawyerId === sawyer.accountId)).toHaveLength(1);
    expect((await h.payouts.mine(sawyer)).account.state).toBe("unfinished");
    // The sawyer comes back from the hosted page before the provider's event: a fresh read settles it.
    const accountId = new URL(first.url).pathname.split("/").at(-1)!;
    h.payments.finishOnboarding(accountId);
    expect((await h.payouts.refreshAccount(sawyer)).account.state).toBe("ready");
  });

  it("the provider down during set-up: a clear 503, nothing half-made", async () => {
    const sawyer = await h.person("sawyer");
    h.payments.down = true;
    try {
      await expect(h.payouts.onboardingLink(sawyer)).rejects.toBeInstanceOf(ServiceUnavailable);
    } finally {
      h.payments.down = false;
    }
    expect((await h.payouts.mine(sawyer)).account.state).toBe("none");
  });
});

describe("payouts", () => {
  it("a sale is pending during the hold, due after it, and one approval sends one transfer, however often it is approved", async () => {
    const sawyer = await h.person("sawyer");
    const admin = await h.person("admin");
    await handedOver(sawyer, await h.person("buyer"), 120_000);
    const accountId = await onboard(sawyer);
    expect((await h.payouts.mine(sawyer)).balances).toEqual([
      { currency: "USD", pendingMinor: h.netOf(120_000), availableMinor: 0, paidMinor: 0 },
    ]);
    expect((await h.payouts.due(admin)).due.filter((d) => d.sawyerId === sawyer.accountId)).toEqual([]);

    const [due] = await later(8, async () => (await h.payouts.due(admin)).due.filter((d) => d.sawyerId === sawyer.accountId));
    expect(due).toMatchObject({ amountMinor: h.netOf(120_000), accountState: "ready" });
    const approval = { sawyerId: sawyer.accountId, currency: "USD", dueKey: due!.dueKey };
    const payout = await later(8, () => h.payouts.approve(admin, approval));
    expect(payout).toMatchObject({ status: "sent", amountMinor: h.netOf(120_000) });
    expect(await later(8, () => h.payouts.approve(admin, approval))).toMatchObject({ id: payout.id, status: "sent" });
    expect(h.payments.transfers.filter((t) => t.accountId === accountId)).toEqual([
      expect.objectContaining({ amountMinor: h.netOf(120_000), currency: "USD", idempotencyKey: `payout-${payout.id}` }),
    ]);
    expect(await later(8, async () => (await h.payouts.mine(sawyer)).balances)).toEqual([
      { currency: "USD", pendingMinor: 0, availableMinor: 0, paidMinor: h.netOf(120_000) },
    ]);
    expect((await h.mailsTo(sawyer.email)).some((m) => m.subject.startsWith("Grainyard sent you"))).toBe(true);
  });

  it("the provider down: the payout stays open (503); approving again sends it with the same key, once", async () => {
    const sawyer = await h.person("sawyer");
    const admin = await h.person("admin");
    await handedOver(sawyer, await h.person("buyer"), 70_000);
    const accountId = await onboard(sawyer);
    const [due] = await later(8, async () => (await h.payouts.due(admin)).due.filter((d) => d.sawyerId === sawyer.accountId));
    const approval = { sawyerId: sawyer.accountId, currency: "USD", dueKey: due!.dueKey };
    h.payments.failNext("transfer", "unavailable");
    await expect(later(8, () => h.payouts.approve(admin, approval))).rejects.toBeInstanceOf(ServiceUnavailable);
    const [open] = await h.dataSource.getRepository(PayoutEntity).findBy({ dueKey: due!.dueKey });
    expect(open!.status).toBe("sending");
    expect(await h.dataSource.getRepository(LedgerEntryEntity).countBy({ kind: "payout", account: `sawyer:${sawyer.accountId}` })).toBe(0);
    const sent = await later(8, () => h.payouts.approve(admin, approval));
    expect(sent).toMatchObject({ id: open!.id, status: "sent" });
    expect(h.payments.transfers.filter((t) => t.accountId === accountId)).toHaveLength(1);
  });

  it("a refused transfer fails with the provider's reason and leaves the balance; once the account is fixed a new attempt goes out", async () => {
    const sawyer = await h.person("sawyer");
    const admin = await h.person("admin");
    await handedOver(sawyer, await h.person("buyer"), 80_000);
    const accountId = await onboard(sawyer);
    h.payments.restrict(accountId);
    const [due] = await later(8, async () => (await h.payouts.due(admin)).due.filter((d) => d.sawyerId === sawyer.accountId));
    const approval = { sawyerId: sawyer.accountId, currency: "USD", dueKey: due!.dueKey };
    const failed = await later(8, () => h.payouts.approve(admin, approval));
    expect(failed).toMatchObject({ status: "failed", failureReason: expect.stringMatching(/not finished onboarding/) });
    expect(await later(8, async () => (await h.payouts.mine(sawyer)).balances[0])).toMatchObject({
      availableMinor: h.netOf(80_000),
      paidMinor: 0,
    });
    h.payments.finishOnboarding(accountId);
    const retried = await later(8, () => h.payouts.approve(admin, approval));
    expect(retried).toMatchObject({ status: "sent" });
    expect(retried.id).not.toBe(failed.id);
    expect(h.payments.transfers.filter((t) => t.accountId === accountId)).toHaveLength(1);
  });
});

describe("dispute refunds", () => {
  it("a part, then the rest: split across the ledger in proportion, audited, mailed, and the order refunded when nothing is left", async () => {
    const sawyer = await h.person("sawyer");
    const buyer = await h.person("buyer");
    const admin = await h.person("admin");
    const order = await handedOver(sawyer, buyer, 100_000); // total 1 050.00 with 5 % tax
    const partial = await h.payouts.disputeRefund(admin, order.id, { amountMinor: 30_000, reason: "A crack the photos did not show." });
    expect(partial).toEqual({ refundedMinor: 30_000, refundableMinor: 75_000 });
    expect((await h.orderOf(order.id)).status).toBe("handed_over");
    await expect(
      h.payouts.disputeRefund(admin, order.id, { amountMinor: 75_001, reason: "More than was paid, on purpose." }),
    ).rejects.toBeInstanceOf(Invalid);
    const rest = await h.payouts.disputeRefund(admin, order.id, { amountMinor: 75_000, reason: "Returned to the yard." });
    expect(rest).toEqual({ refundedMinor: 105_000, refundableMinor: 0 });
    expect((await h.orderOf(order.id)).status).toBe("refunded");

    const refunds = h.payments.refunds.filter((r) => r.orderId === order.id);
    expect(refunds.map((r) => [r.cause, r.amountMinor])).toEqual([
      ["dispute", 30_000],
      ["dispute", 75_000],
    ]);
    const rows = await h.dataSource.getRepository(OrderRefundEntity).find({ where: { orderId: order.id }, order: { createdAt: "ASC" } });
    expect(rows.map((r) => [r.kind, r.providerRefundId, r.createdBy])).toEqual([
      ["dispute", refunds[0]!.refundId, admin.accountId],
      ["dispute", refunds[1]!.refundId, admin.accountId],
    ]);
    // Everything given back: every account of this order is where it started.
    const entries = await h.dataSource.getRepository(LedgerEntryEntity).findBy({ orderId: order.id });
    const byAccount = new Map<string, number>();
    for (const e of entries) byAccount.set(e.account, (byAccount.get(e.account) ?? 0) + e.amountMinor);
    for (const total of byAccount.values()) expect(total).toBe(0);
    expect(await h.dataSource.getRepository(AuditEntryEntity).countBy({ action: "order.dispute_refund", targetId: order.id })).toBe(2);
    expect((await h.mailsTo(buyer.email)).filter((m) => /refund on/.test(m.subject))).toHaveLength(2);
    expect(await h.payouts.refundState(admin, order.id)).toMatchObject({ refundedMinor: 105_000, canRefund: false });
  });

  it("the provider refusing or not answering: nothing reserved, nothing in the ledger, the amount still refundable", async () => {
    const sawyer = await h.person("sawyer");
    const admin = await h.person("admin");
    const order = await h.paidOrder(await h.person("buyer"), await h.liveListing(sawyer, 50_000));
    h.payments.failNext("refund", "unavailable");
    await expect(
      h.payouts.disputeRefund(admin, order.id, { amountMinor: 10_000, reason: "The slab arrived a month late." }),
    ).rejects.toBeInstanceOf(ServiceUnavailable);
    h.payments.failNext("refund", "refused", "This payment is disputed at the card network.");
    await expect(
      h.payouts.disputeRefund(admin, order.id, { amountMinor: 10_000, reason: "The slab arrived a month late." }),
    ).rejects.toMatchObject({
      code: "refund_refused",
      message: expect.stringMatching(/disputed at the card network/),
    });
    expect(await h.dataSource.getRepository(OrderRefundEntity).countBy({ orderId: order.id })).toBe(0);
    expect(await h.dataSource.getRepository(LedgerEntryEntity).countBy({ orderId: order.id, kind: "dispute_refund" })).toBe(0);
    expect(await h.payouts.refundState(admin, order.id)).toMatchObject({ refundedMinor: 0, refundableMinor: 52_500, canRefund: true });
  });

  it("a refund after the sawyer was paid takes their share back at once (owed goes below zero)", async () => {
    const sawyer = await h.person("sawyer");
    const admin = await h.person("admin");
    const order = await handedOver(sawyer, await h.person("buyer"), 60_000);
    await onboard(sawyer);
    const [due] = await later(8, async () => (await h.payouts.due(admin)).due.filter((d) => d.sawyerId === sawyer.accountId));
    await later(8, () => h.payouts.approve(admin, { sawyerId: sawyer.accountId, currency: "USD", dueKey: due!.dueKey }));
    await h.payouts.disputeRefund(admin, order.id, { amountMinor: order.totalMinor, reason: "Never arrived." });
    const balance = (await later(8, () => h.payouts.mine(sawyer))).balances[0]!;
    expect(balance.availableMinor).toBe(-h.netOf(60_000));
    expect(balance.paidMinor).toBe(h.netOf(60_000));
  });
});
