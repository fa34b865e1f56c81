/**
 * The logic behind the payouts screens, kept out of the templates so it can be tested: the
 * account card's words, the balance split for the bar, batch results per row, the stale-list
 * answer, and the dispute refund form's checks. Every figure shown comes from the API (the
 * ledger); this file only arranges and words it.
 */
import {
  payoutAccountStateLabels,
  payoutStatusLabels,
  type DisputeRefundState,
  type PayoutAccountState,
  type PayoutBatchResult,
  type PayoutDue,
  type PayoutStatus,
  type SawyerBalance,
  countOf,
} from "@grainyard/contracts";
import { formatMoney, minorToInput, parseMoneyInput } from "@grainyard/slab-math";
import { hasErrorCode } from "../api/errors.ts";

export { payoutAccountStateLabels, payoutStatusLabels };

export interface AccountCard {
  title: string;
  text: string;
  /** The button that goes to the provider's hosted set-up; none once the account is ready. */
  action: string | null;
  tone: "todo" | "ready";
}

export function accountCard(state: PayoutAccountState): AccountCard {
  switch (state) {
    case "none":
      return {
        title: "Payouts are not set up yet",
        text: "Grainyard sends your earnings to a payout account held by our payment provider. Setting it up takes a few minutes.",
        action: "Set up payouts",
        tone: "todo",
      };
    case "unfinished":
      return {
        title: "Set-up not finished",
        text: "The payment provider still needs a few details from you. Pick up where you left off.",
        action: "Continue set-up",
        tone: "todo",
      };
    case "ready":
      return {
        title: "All set",
        text: "Your payout account is set up. When a payout is approved, the money is sent to it.",
        action: null,
        tone: "ready",
      };
  }
}

/** How long money waits after hand-over, in plain words. */
export function holdExplanation(holdDays: number): string {
  const days = countOf(holdDays, "day", "days");
  return `Money from a sale stays pending until the slab is handed over to the buyer, then for ${days} more, in case something went wrong on the way. After that it is available, and a Grainyard admin approves the payout.`;
}

export interface BalanceSegment {
  key: "paid" | "available" | "pending";
  label: string;
  minor: number;
  text: string;
  /** Share of the bar, 0–1 (negative amounts take no room; they are shown in words). */
  share: number;
}

/** The three figures of one currency's balance, in the order money moves (pending → available → paid). */
export function balanceSegments(balance: SawyerBalance): BalanceSegment[] {
  const rows: Omit<BalanceSegment, "share" | "text">[] = [
    { key: "pending", label: "Pending", minor: balance.pendingMinor },
    { key: "available", label: "Available", minor: balance.availableMinor },
    { key: "paid", label: "Paid to you", minor: balance.paidMinor },
  ];
  const whole = rows.reduce((sum, row) => sum + Math.max(0, row.minor), 0);
  return rows.map((row) => ({
    ...row,
    text: formatMoney(row.minor, balance.currency),
    share: whole > 0 ? Math.max(0, row.minor) / whole : 0,
  }));
}

/** True when a balance has nothing in it at all (a new sawyer): the page shows the empty state instead. */
export function balanceIsEmpty(balance: SawyerBalance): boolean {
  return balance.pendingMinor === 0 && balance.availableMinor === 0 && balance.paidMinor === 0;
}

/** The key that names one payout due on the desk (one per sawyer and currency). */
export const dueId = (due: Pick<PayoutDue, "sawyerId" | "currency">) => `${due.sawyerId}:${due.currency}`;

/** Whether the desk may send this payout now (the sawyer's account is ready and the amount is above zero). */
export function canApprove(due: PayoutDue): boolean {
  return due.accountState === "ready" && due.amountMinor > 0;
}

/** Why the desk cannot send a payout yet, in the admin's words (the API's blockedReason speaks to the sawyer). */
export function deskBlockedReason(due: Pick<PayoutDue, "accountState">): string | null {
  if (due.accountState === "none")
    return "This sawyer has not set up a payout account yet, so nothing can be sent. Their payouts page asks them to.";
  if (due.accountState === "unfinished")
    return "This sawyer started the payout account set-up but has not finished it, so nothing can be sent yet.";
  return null;
}

/** The recipient as the confirmation says it: "Northshore Kiln Co-op (Mara Lindqvist)". */
export function recipientLabel(due: Pick<PayoutDue, "sawyerName" | "yardName">): string {
  return due.yardName ? `${due.yardName} (${due.sawyerName})` : due.sawyerName;
}

/** Several payouts in one currency or more: "$1,200.00 + €80.00". */
export function totalsLabel(dues: Pick<PayoutDue, "amountMinor" | "currency">[]): string {
  const byCurrency = new Map<string, number>();
  for (const due of dues) byCurrency.set(due.currency, (byCurrency.get(due.currency) ?? 0) + due.amountMinor);
  return [...byCurrency.entries()]
    .sort(([a], [b]) => a.localeCompare(b))
    .map(([currency, minor]) => formatMoney(minor, currency))
    .join(" + ");
}

export interface BatchRow {
  id: string;
  recipient: string;
  amount: string;
  outcome: "sent" | "sending" | "failed" | "refused";
  message: string;
}

/** One line per approved payout after a batch: what happened to each (a refusal does not stop the others). */
export function batchRows(result: PayoutBatchResult, dues: PayoutDue[]): BatchRow[] {
  return result.results.map((entry) => {
    const due = dues.find((d) => d.sawyerId === entry.sawyerId && d.currency === entry.currency);
    const recipient = due ? recipientLabel(due) : entry.payout ? recipientLabel(entry.payout) : entry.sawyerId;
    const amount = entry.payout
      ? formatMoney(entry.payout.amountMinor, entry.payout.currency)
      : due
        ? formatMoney(due.amountMinor, due.currency)
        : "";
    if (!entry.payout)
      return { id: `${entry.sawyerId}:${entry.currency}`, recipient, amount, outcome: "refused", message: entry.error ?? "Not approved." };
    const status: PayoutStatus = entry.payout.status;
    const message =
      status === "sent"
        ? "Sent."
        : status === "sending"
          ? "Being sent."
          : `Not sent: ${entry.payout.failureReason ?? "the payment provider refused it."}`;
    return { id: `${entry.sawyerId}:${entry.currency}`, recipient, amount, outcome: status, message };
  });
}

/** A payout answered 409 payout_changed: the list is stale and must be loaded again before approving. */
export function isStaleDue(error: unknown): boolean {
  return hasErrorCode(error, "payout_changed");
}

export const STALE_MESSAGE =
  "That payout changed since the list was loaded (a sale or refund moved), so nothing was sent. The list is fresh again: check the amount and approve once more.";

export const payoutStatusFilters: { value: PayoutStatus | ""; label: string }[] = [
  { value: "", label: "All" },
  { value: "sent", label: payoutStatusLabels.sent },
  { value: "failed", label: payoutStatusLabels.failed },
  { value: "sending", label: payoutStatusLabels.sending },
];

/** The dispute refund form starts with what is left to refund. */
export function refundPrefill(state: Pick<DisputeRefundState, "refundableMinor">): string {
  return state.refundableMinor > 0 ? minorToInput(state.refundableMinor) : "";
}

export type RefundCheck =
  { ok: true; amountMinor: number; reason: string; partial: boolean } | { ok: false; fields: { amountMinor?: string; reason?: string } };

/** Checks the form before the confirmation: an amount above zero and no more than is left, and a reason both parties can read. */
export function checkRefund(
  amountText: string,
  reasonText: string,
  state: Pick<DisputeRefundState, "refundableMinor" | "currency">,
): RefundCheck {
  const fields: { amountMinor?: string; reason?: string } = {};
  const parsed = parseMoneyInput(amountText);
  let amountMinor = 0;
  if (!parsed.ok) fields.amountMinor = parsed.message === "Give the price." ? "Give the amount to refund." : "Type the amount like 120.50.";
  else if (parsed.minor <= 0) fields.amountMinor = "The refund must be more than zero.";
  else if (parsed.minor > state.refundableMinor)
    fields.amountMinor = `At most ${formatMoney(state.refundableMinor, state.currency)} is left to refund.`;
  else amountMinor = parsed.minor;
  const reason = reasonText.trim();
  if (reason.length < 5) fields.reason = "Give the reason both parties will read.";
  else if (reason.length > 1000) fields.reason = "Keep the reason under 1000 characters.";
  if (fields.amountMinor || fields.reason) return { ok: false, fields };
  return { ok: true, amountMinor, reason, partial: amountMinor < state.refundableMinor };
}
