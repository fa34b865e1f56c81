/**
 * Paying sawyers: the sawyer's payout account, balances and statement; the admin's payouts desk
 * and dispute refunds. Built on the app's one client (same cookies, anti-forgery token and errors).
 */
import {
  disputeRefundResultSchema,
  disputeRefundStateSchema,
  onboardingLinkSchema,
  payoutBatchResultSchema,
  payoutPaths,
  payoutSchema,
  payoutsDueSchema,
  sawyerPayoutsSchema,
  type DisputeRefund,
  type DisputeRefundResult,
  type DisputeRefundState,
  type Payout,
  type PayoutApproval,
  type PayoutBatchResult,
  type PayoutStatus,
  type PayoutsDue,
  type SawyerPayouts,
} from "@grainyard/contracts";
import { api, envelope, type ApiClient, type ResponseParser } from "./client.ts";

const mine: ResponseParser<SawyerPayouts> = sawyerPayoutsSchema as ResponseParser<SawyerPayouts>;
const onboarding: ResponseParser<{ url: string }> = onboardingLinkSchema;
const due: ResponseParser<PayoutsDue> = payoutsDueSchema as ResponseParser<PayoutsDue>;
const payoutEnvelope = envelope("payout", payoutSchema as ResponseParser<Payout>);
const payoutList: ResponseParser<{ payouts: Payout[] }> = {
  safeParse(input) {
    const list = (input as { payouts?: unknown } | null)?.payouts;
    if (!Array.isArray(list)) return { success: false };
    const payouts: Payout[] = [];
    for (const item of list) {
      const parsed = payoutSchema.safeParse(item);
      if (!parsed.success) return { success: false };
      payouts.push(parsed.data);
    }
    return { success: true, data: { payouts } };
  },
};
const batchResult: ResponseParser<PayoutBatchResult> = payoutBatchResultSchema as ResponseParser<PayoutBatchResult>;
const refundState: ResponseParser<DisputeRefundState> = disputeRefundStateSchema;
const refundResult: ResponseParser<DisputeRefundResult> = disputeRefundResultSchema;

function createPayoutsApi(client: Pick<ApiClient, "request"> = api) {
  const { request } = client;
  return {
    // The sawyer's side.
    mine: (signal?: AbortSignal) => request("GET", payoutPaths.mine, { schema: mine, signal }),
    /** The address of the provider's hosted set-up page (it sends the sawyer back to /yard/payouts?setup=returned). */
    startSetup: () => request("POST", payoutPaths.onboarding, { body: {}, schema: onboarding }),
    /** Asks the provider where the account stands now; answers the whole page again. */
    refreshAccount: () => request("POST", payoutPaths.refreshAccount, { body: {}, schema: mine }),
    statementUrl: payoutPaths.statement,

    // The admin's desk.
    due: (signal?: AbortSignal) => request("GET", payoutPaths.due, { schema: due, signal }),
    approve: (approval: PayoutApproval) => request("POST", payoutPaths.approve, { body: approval, schema: payoutEnvelope }),
    approveBatch: (payouts: PayoutApproval[]) => request("POST", payoutPaths.batch, { body: { payouts }, schema: batchResult }),
    list: (status: PayoutStatus | undefined, signal?: AbortSignal) =>
      request("GET", payoutPaths.list, { query: { status }, schema: payoutList, signal }),
    one: (payoutId: string, signal?: AbortSignal) => request("GET", payoutPaths.one(payoutId), { schema: payoutEnvelope, signal }),

    // Dispute refunds (admins).
    refundState: (orderId: string, signal?: AbortSignal) =>
      request("GET", payoutPaths.disputeRefund(orderId), { schema: refundState, signal }),
    disputeRefund: (orderId: string, input: DisputeRefund) =>
      request("POST", payoutPaths.disputeRefund(orderId), { body: input, schema: refundResult }),
  };
}

export const payoutsApi = createPayoutsApi();
