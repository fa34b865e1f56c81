/**
 * The admin's payouts desk beyond what is due (see usePayoutsDue in admin.ts): the payouts sent
 * and tried, filtered by status, and the approvals. An approval marks every payout list stale
 * (what is due, what was sent, the dashboard's figure), also when it failed: a 409 payout_changed
 * means the list on screen was out of date.
 */
import { toValue, type MaybeRefOrGetter } from "vue";
import { useMutation, useQuery, useQueryCache } from "@pinia/colada";
import { payoutEndpoints, type Payout, type PayoutApproval, type PayoutBatchResult, type PayoutStatus } from "@grainyard/contracts";
import type { ApiRequestError } from "../api/errors.ts";
import { rethrow, useClient, markStale } from "./api.ts";
import { queryKeys } from "./keys.ts";

/** Payouts sent and tried, newest first; "" for every status. */
export function usePayoutList(status: MaybeRefOrGetter<PayoutStatus | "">) {
  const client = useClient(payoutEndpoints);
  return useQuery<Payout[], ApiRequestError>({
    key: () => queryKeys.payouts.list(toValue(status)),
    query: ({ signal }) =>
      client
        .listPayouts({ query: { status: toValue(status) || undefined } }, { signal })
        .then((answer) => answer.payouts)
        .catch(rethrow),
    // The last list stays while another status's list is on its way.
    placeholderData: (previous) => previous,
  });
}

function useInvalidatePayouts() {
  const cache = useQueryCache();
  // A list that fails to load again shows its own error.
  return () => Promise.all([markStale(cache, { key: queryKeys.payouts.all }), markStale(cache, { key: queryKeys.admin.dashboard })]);
}

/** Sends one sawyer's due payout now. */
export function useApprovePayout() {
  const client = useClient(payoutEndpoints);
  return useMutation<Payout, PayoutApproval, ApiRequestError>({
    mutation: (body) =>
      client
        .approvePayout({ body })
        .then((answer) => answer.payout)
        .catch(rethrow),
    onSettled: useInvalidatePayouts(),
  });
}

/** Sends several due payouts, each on its own: one that fails does not stop the others. */
export function useApprovePayoutBatch() {
  const client = useClient(payoutEndpoints);
  return useMutation<PayoutBatchResult, PayoutApproval[], ApiRequestError>({
    mutation: (payouts) => client.approvePayoutBatch({ body: { payouts } }).catch(rethrow),
    onSettled: useInvalidatePayouts(),
  });
}
