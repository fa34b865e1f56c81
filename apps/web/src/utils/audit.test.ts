import { describe, expect, it } from "vitest";
import type { AuditEntry } from "@grainyard/contracts";
import { auditActionLabels, auditChanges, auditSentence } from "./audit.ts";

const WREN = "acc-wren-0000-0000-0000-000000000001";
function entry(action: string, over: Partial<AuditEntry> = {}): AuditEntry {
  return {
    id: "1",
    actorId: WREN,
    actorLabel: "wren@grainyard.test",
    actorName: "Wren",
    subject: { name: null, owner: null, currency: null },
    action,
    targetKind: action.split(".")[0]!,
    targetId: "target-1",
    before: null,
    after: null,
    reason: null,
    createdAt: "2026-12-03T10:00:00.000Z",
    ...over,
  };
}
const maple = { name: "Silver maple slab 3", owner: "Ridgeback Urban Timber", currency: null };

/** One entry of every action the API records (apps/api/src/services: recordAudit calls), with its sentence. */
const cases: [string, Partial<AuditEntry>, string][] = [
  ["listing.approve", { subject: maple }, "Wren approved ‘Silver maple slab 3’ by Ridgeback Urban Timber"],
  ["listing.send_back", { subject: maple }, "Wren sent ‘Silver maple slab 3’ by Ridgeback Urban Timber back for changes"],
  ["listing.reject", { subject: maple }, "Wren rejected ‘Silver maple slab 3’ by Ridgeback Urban Timber"],
  ["listing.take_down", { subject: maple }, "Wren took down ‘Silver maple slab 3’ by Ridgeback Urban Timber"],
  ["report.dismiss", { subject: maple }, "Wren dismissed a report on ‘Silver maple slab 3’ by Ridgeback Urban Timber"],
  ["report.take_down", { subject: maple }, "Wren took down ‘Silver maple slab 3’ by Ridgeback Urban Timber after a report"],
  [
    "report.suspend",
    { subject: { name: null, owner: "Cobble Lane Slabworks", currency: null } },
    "Wren suspended Cobble Lane Slabworks after a report",
  ],
  [
    "report.hide_review",
    { subject: { name: null, owner: "Ada Lindqvist", currency: null } },
    "Wren hid a review about Ada Lindqvist after a report",
  ],
  [
    "review.hide",
    { subject: { name: "Walnut bench slab 1", owner: "Ada Lindqvist", currency: null } },
    "Wren hid Ada Lindqvist’s review of ‘Walnut bench slab 1’",
  ],
  [
    "review.show",
    { subject: { name: "Walnut bench slab 1", owner: "Ada Lindqvist", currency: null } },
    "Wren showed Ada Lindqvist’s review of ‘Walnut bench slab 1’ again",
  ],
  ["account.suspend", { subject: { name: "Cobble Lane Slabworks", owner: null, currency: null } }, "Wren suspended Cobble Lane Slabworks"],
  ["account.restore", { subject: { name: "Cobble Lane Slabworks", owner: null, currency: null } }, "Wren restored Cobble Lane Slabworks"],
  [
    "account.promote",
    { actorId: null, actorName: "The command line", subject: { name: "Mirela Sand", owner: null, currency: null } },
    "The command line made Mirela Sand an admin",
  ],
  [
    "account.create_admin",
    { actorId: null, actorName: "The command line", after: { role: "admin", email: "new@grainyard.test" } },
    "The command line created the admin account new@grainyard.test",
  ],
  [
    "second_factor.on",
    { targetId: WREN, subject: { name: "Wren", owner: null, currency: null } },
    "Wren turned on the second sign-in factor for their own account",
  ],
  [
    "second_factor.off",
    { subject: { name: "Mirela Sand", owner: null, currency: null } },
    "Wren turned off the second sign-in factor for Mirela Sand",
  ],
  ["second_factor.recovery_code_used", { targetId: WREN, after: { left: 9 } }, "Wren signed in with a recovery code (9 left)"],
  [
    "yard.update",
    { targetKind: "account", subject: { name: "Northshore Kiln Co-op", owner: null, currency: null } },
    "Wren changed the yard details of Northshore Kiln Co-op",
  ],
  ["settings.update", { targetKind: "settings", targetId: "marketplace" }, "Wren changed the marketplace settings"],
  [
    "payout.approve",
    {
      targetKind: "account",
      subject: { name: "Ridgeback Urban Timber", owner: null, currency: null },
      after: { payoutId: "p1", currency: "USD", amountMinor: 123_450, orders: 2, attempt: 1 },
    },
    "Wren approved a payout of $1,234.50 to Ridgeback Urban Timber",
  ],
  [
    "order.dispute_refund",
    {
      subject: { name: "Silver maple slab 3", owner: "Ada Lindqvist", currency: "USD" },
      before: { refundedMinor: 0 },
      after: { refundedMinor: 25_000, refundId: "re_1", shares: {} },
    },
    "Wren refunded $250.00 of the order for ‘Silver maple slab 3’ to Ada Lindqvist for a dispute",
  ],
  [
    "email.resend",
    { subject: { name: "Your order is ready for pickup", owner: "ada@fernhill-studio.test", currency: null } },
    "Wren sent the e-mail ‘Your order is ready for pickup’ to ada@fernhill-studio.test again",
  ],
];

describe("auditSentence", () => {
  it.each(cases)("%s reads as a sentence", (action, over, sentence) => {
    expect(auditSentence(entry(action, over))).toBe(sentence);
  });

  it("covers every action the filter offers (and so every action the API records)", () => {
    expect(cases.map(([action]) => action).sort()).toEqual(Object.keys(auditActionLabels).sort());
  });

  it("still reads when the thing is gone (no name) and for an action it does not know", () => {
    expect(auditSentence(entry("listing.approve"))).toBe("Wren approved a listing");
    expect(auditSentence(entry("report.dismiss"))).toBe("Wren dismissed a report");
    expect(auditSentence(entry("yard.teleport", { targetKind: "account", targetId: "a-1" }))).toBe("Wren: yard.teleport (account a-1)");
  });
});

describe("auditChanges", () => {
  it("lists each field either side has, with readable names and values", () => {
    const settings = entry("settings.update", {
      before: { platformFeeBps: 1000, holdDays: 7, processingFixedMinor: 30 },
      after: { platformFeeBps: 1200, holdDays: 1, processingFixedMinor: 45 },
    });
    // Settings amounts carry no currency of their own: they read as cents.
    expect(auditChanges(settings)).toEqual([
      { field: "platformFeeBps", label: "Platform fee", before: "10 %", after: "12 %" },
      { field: "holdDays", label: "Hold after hand-over", before: "7 days", after: "1 day" },
      { field: "processingFixedMinor", label: "Card processing, per order", before: "30 ¢", after: "45 ¢" },
    ]);
  });

  it("shows missing sides as a dash, states and yes/no in words, money in the order's currency, and hides bookkeeping ids", () => {
    expect(auditChanges(entry("listing.approve", { before: { status: "in_review" }, after: { status: "live" } }))).toEqual([
      { field: "status", label: "State", before: "in review", after: "live" },
    ]);
    expect(
      auditChanges(
        entry("account.suspend", {
          before: { suspended: false },
          after: { suspended: true, sessionsRevoked: 2, listingsHidden: 3, ordersExpired: 0 },
        }),
      ),
    ).toEqual([
      { field: "suspended", label: "Suspended", before: "no", after: "yes" },
      { field: "sessionsRevoked", label: "Sessions ended", before: "—", after: "2" },
      { field: "listingsHidden", label: "Listings hidden", before: "—", after: "3" },
      { field: "ordersExpired", label: "Held orders released", before: "—", after: "0" },
    ]);
    const refund = entry("order.dispute_refund", {
      subject: { name: "Silver maple slab 3", owner: "Ada Lindqvist", currency: "USD" },
      before: { refundedMinor: 0 },
      after: { refundedMinor: 25_000, refundId: "re_1", shares: { sawyerMinor: 20_000 } },
    });
    expect(auditChanges(refund)).toEqual([{ field: "refundedMinor", label: "Refunded in all", before: "$0.00", after: "$250.00" }]);
    expect(auditChanges(entry("second_factor.on"))).toEqual([]);
  });
});
