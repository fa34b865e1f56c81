import { z } from "zod";

/*
 * Paying sawyers: their payout account at the payment provider, balances from the ledger,
 * payouts an admin approves (sent as transfers), and refunds an admin gives for a dispute.
 */

/** Where a sawyer's payout account stands: none yet, started but unfinished, or ready for transfers. */
export const payoutAccountStates = ["none", "unfinished", "ready"] as const;
export type PayoutAccountState = (typeof payoutAccountStates)[number];
export const payoutAccountStateLabels: Record<PayoutAccountState, string> = {
  none: "Not set up",
  unfinished: "Set-up not finished",
  ready: "Ready to receive money",
};

export const payoutStatuses = ["sending", "sent", "failed"] as const;
export type PayoutStatus = (typeof payoutStatuses)[number];
export const payoutStatusLabels: Record<PayoutStatus, string> = {
  sending: "Being sent",
  sent: "Paid out",
  failed: "Not sent",
};

/** One order's part of a payout (negative when a refund after an earlier payout is taken back). */
export const payoutLineSchema = z.object({
  orderId: z.string(),
  listingTitle: z.string(),
  handedOverAt: z.string().nullable(),
  amountMinor: z.number().int(),
});
export type PayoutLine = z.infer<typeof payoutLineSchema>;

export const payoutSchema = z.object({
  id: z.string(),
  sawyerId: z.string(),
  sawyerName: z.string(),
  yardName: z.string().nullable(),
  currency: z.string(),
  amountMinor: z.number().int(),
  status: z.enum(payoutStatuses),
  /** Why the transfer did not go through (provider's words), when it failed. */
  failureReason: z.string().nullable(),
  transferId: z.string().nullable(),
  approvedBy: z.string().nullable(),
  createdAt: z.string(),
  sentAt: z.string().nullable(),
  /** The statement: the orders this payout covers. */
  lines: z.array(payoutLineSchema),
});
export type Payout = z.infer<typeof payoutSchema>;

/** Money owed to a sawyer in one currency, from the ledger. */
export const sawyerBalanceSchema = z.object({
  currency: z.string(),
  /** Sales not yet handed over, or still inside the hold after hand-over. */
  pendingMinor: z.number().int(),
  /** Ready to be paid out (after hand-over plus the hold, less refunds). */
  availableMinor: z.number().int(),
  /** Sent to the sawyer so far. */
  paidMinor: z.number().int(),
});
export type SawyerBalance = z.infer<typeof sawyerBalanceSchema>;

/** One sale's money still on hold, and when it becomes available. */
export const pendingSaleSchema = z.object({
  orderId: z.string(),
  listingTitle: z.string(),
  currency: z.string(),
  amountMinor: z.number().int(),
  /** When the hold ends (hand-over plus the hold days); null until the slab is handed over. */
  availableFrom: z.string().nullable(),
});
export type PendingSale = z.infer<typeof pendingSaleSchema>;

export const sawyerPayoutsSchema = z.object({
  account: z.object({ state: z.enum(payoutAccountStates), updatedAt: z.string().nullable() }),
  /** Plain words on why money cannot be sent yet, or null when nothing stands in the way. */
  blockedReason: z.string().nullable(),
  holdDays: z.number().int(),
  balances: z.array(sawyerBalanceSchema),
  /** The pending balance sale by sale, soonest available first (not yet handed over last). */
  pending: z.array(pendingSaleSchema),
  payouts: z.array(payoutSchema),
});
export type SawyerPayouts = z.infer<typeof sawyerPayoutsSchema>;

export const onboardingLinkSchema = z.object({ url: z.string() });

/** A payout an admin can approve now: what is available, and the orders it would cover. */
export const payoutDueSchema = z.object({
  sawyerId: z.string(),
  sawyerName: z.string(),
  yardName: z.string().nullable(),
  currency: z.string(),
  amountMinor: z.number().int(),
  /** Names exactly these lines and amounts: approving with a stale key is refused, approving twice sends once. */
  dueKey: z.string(),
  accountState: z.enum(payoutAccountStates),
  blockedReason: z.string().nullable(),
  lines: z.array(payoutLineSchema),
  /** A transfer of these same lines that failed before (the admin may try again). */
  lastFailure: z.string().nullable(),
});
export type PayoutDue = z.infer<typeof payoutDueSchema>;
export const payoutsDueSchema = z.object({ due: z.array(payoutDueSchema), holdDays: z.number().int() });
export type PayoutsDue = z.infer<typeof payoutsDueSchema>;

export const payoutApprovalSchema = z.object({
  sawyerId: z.string({ error: "Choose the sawyer to pay." }).uuid("Choose the sawyer to pay."),
  currency: z.string({ error: "Say the currency." }).length(3, "Say the currency."),
  dueKey: z.string({ error: "Approve from the list of payouts due." }).min(1, "Approve from the list of payouts due.").max(100),
});
export type PayoutApproval = z.infer<typeof payoutApprovalSchema>;

export const payoutBatchSchema = z.object({
  payouts: z
    .array(payoutApprovalSchema, { error: "Choose the payouts to approve." })
    .min(1, "Choose at least one payout.")
    .max(200, "Approve at most 200 at a time."),
});
export type PayoutBatch = z.infer<typeof payoutBatchSchema>;

export const payoutBatchResultSchema = z.object({
  results: z.array(z.object({ sawyerId: z.string(), currency: z.string(), payout: payoutSchema.nullable(), error: z.string().nullable() })),
});
export type PayoutBatchResult = z.infer<typeof payoutBatchResultSchema>;

export const payoutListQuerySchema = z.object({
  status: z.enum(payoutStatuses, { error: "Unknown payout status." }).optional(),
  sawyerId: z.string().uuid("Not a sawyer id.").optional(),
});

/** An admin's refund on a disputed order: all or part of what the buyer paid, with the reason both parties are sent. */
export const disputeRefundSchema = z.object({
  amountMinor: z.number({ error: "Give the amount to refund." }).int("Whole cents only.").positive("The refund must be more than zero."),
  reason: z
    .string({ error: "Give the reason both parties will read." })
    .trim()
    .min(5, "Give the reason both parties will read.")
    .max(1000, "Keep the reason under 1000 characters."),
});
export type DisputeRefund = z.infer<typeof disputeRefundSchema>;

/** What an admin's dispute refund answers: refunded so far and what is left to refund. */
export const disputeRefundResultSchema = z.object({ refundedMinor: z.number().int(), refundableMinor: z.number().int() });
export type DisputeRefundResult = z.infer<typeof disputeRefundResultSchema>;

/** Where an order stands for a dispute refund: what was refunded (and why), what is left, whether it can be refunded now. */
export const disputeRefundStateSchema = z.object({
  orderId: z.string(),
  currency: z.string(),
  totalMinor: z.number().int(),
  refundedMinor: z.number().int(),
  refundableMinor: z.number().int(),
  /** False for orders that are not paid (awaiting payment, cancelled, refunded in full). */
  canRefund: z.boolean(),
  refunds: z.array(z.object({ amountMinor: z.number().int(), reason: z.string(), createdAt: z.string() })),
});
export type DisputeRefundState = z.infer<typeof disputeRefundStateSchema>;
