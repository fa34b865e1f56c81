import { z } from "zod";
import { endpoint } from "../endpoint.ts";
import {
  disputeRefundResultSchema,
  disputeRefundSchema,
  disputeRefundStateSchema,
  onboardingLinkSchema,
  payoutApprovalSchema,
  payoutBatchResultSchema,
  payoutBatchSchema,
  payoutListQuerySchema,
  payoutSchema,
  payoutsDueSchema,
  sawyerPayoutsSchema,
} from "../payouts.ts";
import { API_PREFIX } from "./prefix.ts";

const sawyerOnly = ["sawyer"] as const;
const adminOnly = ["admin"] as const;
const payoutEnvelope = z.object({ payout: payoutSchema });

/** Paying sawyers: their side under /yard, the admin's desk and dispute refunds under /admin. */
export const payoutEndpoints = {
  myPayouts: endpoint({
    method: "GET",
    path: `${API_PREFIX}/yard/payouts`,
    summary: "The sawyer's payout account state, balances and payouts.",
    access: sawyerOnly,
    answer: sawyerPayoutsSchema,
  }),
  startPayoutSetup: endpoint({
    method: "POST",
    path: `${API_PREFIX}/yard/payouts/account`,
    summary: "The address of the provider's hosted payout set-up page.",
    access: sawyerOnly,
    answer: onboardingLinkSchema,
    errors: ["payments_unavailable"],
  }),
  refreshPayoutAccount: endpoint({
    method: "POST",
    path: `${API_PREFIX}/yard/payouts/account/refresh`,
    summary: "Ask the provider where the payout account stands; answers the whole payouts page.",
    access: sawyerOnly,
    answer: sawyerPayoutsSchema,
    errors: ["payments_unavailable"],
  }),
  statementCsv: endpoint({
    method: "GET",
    path: `${API_PREFIX}/yard/payouts/statement.csv`,
    summary: "The sawyer's statement (sales, fees, refunds, payouts) as a CSV file.",
    access: sawyerOnly,
    answer: { file: "csv" },
  }),
  myPayout: endpoint({
    method: "GET",
    path: `${API_PREFIX}/yard/payouts/:payoutId`,
    summary: "One of the sawyer's payouts with the orders it covers.",
    access: sawyerOnly,
    answer: payoutEnvelope,
  }),
  payoutsDue: endpoint({
    method: "GET",
    path: `${API_PREFIX}/admin/payouts/due`,
    summary: "What each sawyer may be paid now, and what is still held.",
    access: adminOnly,
    answer: payoutsDueSchema,
  }),
  approvePayoutBatch: endpoint({
    method: "POST",
    path: `${API_PREFIX}/admin/payouts/batch`,
    summary: "Approve several payouts at once; each succeeds or fails on its own.",
    access: adminOnly,
    body: payoutBatchSchema,
    answer: payoutBatchResultSchema,
  }),
  approvePayout: endpoint({
    method: "POST",
    path: `${API_PREFIX}/admin/payouts`,
    summary: "Approve one payout: a transfer to the sawyer's payout account.",
    access: adminOnly,
    body: payoutApprovalSchema,
    answer: payoutEnvelope,
    errors: ["payout_account_missing", "payout_account_unfinished", "payout_changed", "payments_unavailable"],
  }),
  listPayouts: endpoint({
    method: "GET",
    path: `${API_PREFIX}/admin/payouts`,
    summary: "Payouts sent or tried, optionally by status.",
    access: adminOnly,
    query: payoutListQuerySchema,
    answer: z.object({ payouts: z.array(payoutSchema) }),
  }),
  getPayout: endpoint({
    method: "GET",
    path: `${API_PREFIX}/admin/payouts/:payoutId`,
    summary: "One payout as the desk sees it.",
    access: adminOnly,
    answer: payoutEnvelope,
  }),
  disputeRefundState: endpoint({
    method: "GET",
    path: `${API_PREFIX}/admin/orders/:orderId/refund`,
    summary: "How much of an order is refunded and how much may still be.",
    access: adminOnly,
    answer: disputeRefundStateSchema,
  }),
  disputeRefund: endpoint({
    method: "POST",
    path: `${API_PREFIX}/admin/orders/:orderId/refund`,
    summary: "Refund all or part of an order after a dispute, split across tax, fees and the sawyer's share.",
    access: adminOnly,
    body: disputeRefundSchema,
    answer: disputeRefundResultSchema,
    errors: ["order_not_refundable", "refund_refused", "payments_unavailable"],
  }),
} as const;
