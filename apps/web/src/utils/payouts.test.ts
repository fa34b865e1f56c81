import { describe, expect, it } from "vitest";
import type { PayoutBatchResult, PayoutDue } from "@grainyard/contracts";
import { ApiRequestError } from "../api/errors.ts";
import {
  accountCard,
  balanceIsEmpty,
  balanceSegments,
  batchRows,
  canApprove,
  checkRefund,
  deskBlockedReason,
  holdExplanation,
  isStaleDue,
  recipientLabel,
  refundPrefill,
  totalsLabel,
} from "./payouts.ts";

const due = (over: Partial<PayoutDue> = {}): PayoutDue => ({
  sawyerId: "6f1c1d7e-0000-4000-8000-000000000001",
  sawyerName: "Mara Lindqvist",
  yardName: "Northshore Kiln Co-op",
  currency: "USD",
  amountMinor: 226_200,
  dueKey: "key-1",
  accountState: "ready",
  blockedReason: null,
  lines: [{ orderId: "o1", listingTitle: "Bookmatched walnut pair", handedOverAt: "2026-12-01T10:00:00.000Z", amountMinor: 226_200 }],
  lastFailure: null,
  ...over,
});

describe("payout account card", () => {
  it("offers the hosted set-up when there is no account, a continue when unfinished, nothing when ready", () => {
    expect(accountCard("none")).toMatchObject({ action: "Set up payouts", tone: "todo" });
    expect(accountCard("unfinished")).toMatchObject({ action: "Continue set-up", tone: "todo" });
    expect(accountCard("ready")).toMatchObject({ action: null, tone: "ready" });
  });

  it("explains the hold with the configured days", () => {
    expect(holdExplanation(7)).toContain("for 7 days more");
    expect(holdExplanation(1)).toContain("for 1 day more");
  });
});

describe("balance split", () => {
  it("gives each figure its share of the bar and formats it in the currency (Intl)", () => {
    const segments = balanceSegments({ currency: "USD", pendingMinor: 10_000, availableMinor: 30_000, paidMinor: 60_000 });
    expect(segments.map((s) => [s.key, s.text, s.share])).toEqual([
      ["pending", "$100.00", 0.1],
      ["available", "$300.00", 0.3],
      ["paid", "$600.00", 0.6],
    ]);
    expect(balanceSegments({ currency: "EUR", pendingMinor: 0, availableMinor: 1_250, paidMinor: 0 })[1]!.text).toBe("€12.50");
  });

  it("keeps a negative available (a refund after a payout) out of the bar but in the words", () => {
    const segments = balanceSegments({ currency: "USD", pendingMinor: 0, availableMinor: -17_414, paidMinor: 87_070 });
    expect(segments[1]).toMatchObject({ text: "−$174.14", share: 0 });
    expect(segments[2]!.share).toBe(1);
  });

  it("knows an untouched balance", () => {
    expect(balanceIsEmpty({ currency: "USD", pendingMinor: 0, availableMinor: 0, paidMinor: 0 })).toBe(true);
    expect(balanceIsEmpty({ currency: "USD", pendingMinor: 1, availableMinor: 0, paidMinor: 0 })).toBe(false);
  });
});

describe("the payouts desk", () => {
  it("approves only payouts whose account is ready", () => {
    expect(canApprove(due())).toBe(true);
    expect(canApprove(due({ accountState: "unfinished" }))).toBe(false);
    expect(canApprove(due({ accountState: "none" }))).toBe(false);
  });

  it("says in the admin's words why a payout cannot be sent yet", () => {
    expect(deskBlockedReason(due())).toBeNull();
    expect(deskBlockedReason(due({ accountState: "none" }))).toMatch(/has not set up a payout account/);
    expect(deskBlockedReason(due({ accountState: "unfinished" }))).toMatch(/not finished it/);
  });

  it("names the recipient by yard and person, and adds totals per currency", () => {
    expect(recipientLabel(due())).toBe("Northshore Kiln Co-op (Mara Lindqvist)");
    expect(recipientLabel(due({ yardName: null }))).toBe("Mara Lindqvist");
    expect(totalsLabel([due(), due({ amountMinor: 1_800 }), due({ currency: "EUR", amountMinor: 8_000 })])).toBe("€80.00 + $2,280.00");
  });

  it("lists each batch outcome: sent, not sent with the provider's reason, refused with the API's message", () => {
    const first = due();
    const second = due({
      sawyerId: "6f1c1d7e-0000-4000-8000-000000000002",
      sawyerName: "Iris Okafor",
      yardName: "Cobble Lane Slabworks",
      amountMinor: 50_000,
    });
    const third = due({ sawyerId: "6f1c1d7e-0000-4000-8000-000000000003", sawyerName: "Tom Reyes", yardName: null, amountMinor: 9_900 });
    const payout = (d: PayoutDue, status: "sent" | "failed", failureReason: string | null = null) => ({
      id: `p-${d.sawyerId}`,
      sawyerId: d.sawyerId,
      sawyerName: d.sawyerName,
      yardName: d.yardName,
      currency: d.currency,
      amountMinor: d.amountMinor,
      status,
      failureReason,
      transferId: null,
      approvedBy: null,
      createdAt: "2026-12-09T10:00:00.000Z",
      sentAt: null,
      lines: d.lines,
    });
    const result: PayoutBatchResult = {
      results: [
        { sawyerId: first.sawyerId, currency: "USD", payout: payout(first, "sent"), error: null },
        {
          sawyerId: second.sawyerId,
          currency: "USD",
          payout: payout(second, "failed", "The destination account cannot receive transfers."),
          error: null,
        },
        { sawyerId: third.sawyerId, currency: "USD", payout: null, error: "This payout changed since the list was loaded." },
      ],
    };
    expect(batchRows(result, [first, second, third]).map((r) => [r.recipient, r.amount, r.outcome, r.message])).toEqual([
      ["Northshore Kiln Co-op (Mara Lindqvist)", "$2,262.00", "sent", "Sent."],
      ["Cobble Lane Slabworks (Iris Okafor)", "$500.00", "failed", "Not sent: The destination account cannot receive transfers."],
      ["Tom Reyes", "$99.00", "refused", "This payout changed since the list was loaded."],
    ]);
  });

  it("recognises the stale-list answer (409 payout_changed) and nothing else", () => {
    expect(isStaleDue(new ApiRequestError(409, "payout_changed", "changed"))).toBe(true);
    expect(isStaleDue(new ApiRequestError(409, "payout_account_unfinished", "unfinished"))).toBe(false);
    expect(isStaleDue(new Error("payout_changed"))).toBe(false);
  });
});

describe("dispute refund form", () => {
  const state = { refundableMinor: 80_000, currency: "USD" };

  it("starts with what is left to refund", () => {
    expect(refundPrefill({ refundableMinor: 80_000 })).toBe("800.00");
    expect(refundPrefill({ refundableMinor: 12_345 })).toBe("123.45");
    expect(refundPrefill({ refundableMinor: 0 })).toBe("");
  });

  it("accepts all that is left, or a part, with a reason", () => {
    expect(checkRefund("800.00", "The buyer returned the slab.", state)).toEqual({
      ok: true,
      amountMinor: 80_000,
      reason: "The buyer returned the slab.",
      partial: false,
    });
    expect(checkRefund("120,5", "  A check at one end was not shown.  ", state)).toEqual({
      ok: true,
      amountMinor: 12_050,
      reason: "A check at one end was not shown.",
      partial: true,
    });
  });

  it("refuses zero, more than is left, unreadable amounts and a missing reason, with field messages", () => {
    expect(checkRefund("0", "Reason enough", state)).toEqual({ ok: false, fields: { amountMinor: "The refund must be more than zero." } });
    expect(checkRefund("800.01", "Reason enough", state)).toEqual({
      ok: false,
      fields: { amountMinor: "At most $800.00 is left to refund." },
    });
    expect(checkRefund("12.345", "Reason enough", state)).toEqual({ ok: false, fields: { amountMinor: "Type the amount like 120.50." } });
    expect(checkRefund("", "no", state)).toEqual({
      ok: false,
      fields: { amountMinor: "Give the amount to refund.", reason: "Give the reason both parties will read." },
    });
  });
});
