import type { payoutEndpoints } from "@grainyard/contracts";
import type { Handlers } from "../http/endpoints.ts";
import type { PayoutService } from "../services/payout-service.ts";

/** Paying sawyers: their payout account, balance and statement; the admin's payouts and dispute refunds. */
export function payoutHandlers(payouts: PayoutService): Handlers<typeof payoutEndpoints> {
  return {
    myPayouts: ({ actor }) => payouts.mine(actor),
    startPayoutSetup: ({ actor }) => payouts.onboardingLink(actor),
    refreshPayoutAccount: ({ actor }) => payouts.refreshAccount(actor),
    statementCsv: async ({ actor }) => ({
      body: await payouts.statementCsv(actor),
      contentType: "text/csv; charset=utf-8",
      filename: "grainyard-statement.csv",
    }),
    myPayout: async ({ actor, params }) => ({ payout: await payouts.one(actor, params.payoutId, "yard") }),
    payoutsDue: ({ actor }) => payouts.due(actor),
    approvePayoutBatch: ({ actor, body }) => payouts.approveBatch(actor, body),
    approvePayout: async ({ actor, body }) => ({ payout: await payouts.approve(actor, body) }),
    listPayouts: async ({ actor, query }) => ({ payouts: await payouts.list(actor, query) }),
    getPayout: async ({ actor, params }) => ({ payout: await payouts.one(actor, params.payoutId, "desk") }),
    disputeRefundState: ({ actor, params }) => payouts.refundState(actor, params.orderId),
    disputeRefund: ({ actor, params, body }) => payouts.disputeRefund(actor, params.orderId, body),
  };
}
