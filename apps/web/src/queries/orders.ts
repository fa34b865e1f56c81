/**
 * Orders: the reader's list, one order (the order page and its receipt share it), each step of an
 * order after payment, and an admin's dispute refunds. A step answers the order as it is now, which
 * goes straight into the cache; the lists that show the order are marked stale.
 */
import { computed, toValue, type MaybeRefOrGetter } from "vue";
import { useInfiniteQuery, useMutation, useQuery, useQueryCache } from "@pinia/colada";
import {
  orderEndpoints,
  payoutEndpoints,
  type DisputeRefund,
  type DisputeRefundResult,
  type DisputeRefundState,
  type Order,
  type OrderSearchPage,
  type PickupWindowsInput,
  type ProblemReportInput,
  type ShipmentInput,
} from "@grainyard/contracts";
import type { ApiRequestError } from "../api/errors.ts";
import { useSessionStore } from "../stores/session.ts";
import { rethrow, useClient, markStale } from "./api.ts";
import { queryKeys } from "./keys.ts";

/**
 * The reader's orders, newest first: a buyer's, a sawyer's sales, or the latest 100 for an admin.
 * `enabled` holds it back (a public page asks only in the browser, for a signed-in buyer).
 */
export function useOrders(options: { enabled?: () => boolean } = {}) {
  const client = useClient(orderEndpoints);
  const session = useSessionStore();
  return useQuery<Order[], ApiRequestError>({
    ...(options.enabled ? { enabled: options.enabled } : {}),
    key: () => queryKeys.orders.list(session.account?.id ?? ""),
    query: ({ signal }) =>
      client
        .listOrders(undefined, { signal })
        .then((answer) => answer.orders)
        .catch(rethrow),
  });
}

/**
 * The desk's order search: every order whose buyer, sawyer, yard, slab title or order number
 * holds the words (all of them with no words), newest first, `pageSize` at a time; `loadMore`
 * appends the next page with the API's cursor. The last answer stays on screen while another
 * search is on its way.
 */
export function useDeskOrders(words: MaybeRefOrGetter<string>, pageSize: MaybeRefOrGetter<number>) {
  const client = useClient(orderEndpoints);
  const query = useInfiniteQuery<OrderSearchPage, ApiRequestError, string | null>({
    key: () => queryKeys.orders.desk(toValue(words).trim(), toValue(pageSize)),
    query: ({ pageParam, signal }) =>
      client
        .searchOrders(
          { query: { q: toValue(words).trim() || undefined, limit: toValue(pageSize), cursor: pageParam ?? undefined } },
          { signal },
        )
        .catch(rethrow),
    initialPageParam: null,
    getNextPageParam: (lastPage) => lastPage.nextCursor,
    placeholderData: (previous) => previous,
  });
  const pages = computed(() => query.data.value?.pages ?? []);
  return {
    orders: computed(() => pages.value.flatMap((page) => page.orders)),
    /** Nothing to show yet: the first answer is on its way. */
    loading: computed(() => pages.value.length === 0 && query.error.value === null),
    /** An answer is on its way (a new search or the next page). */
    busy: query.isLoading,
    /** What is shown belongs to the search before (the new one is on its way). */
    stale: query.isPlaceholderData,
    error: query.error,
    hasMore: computed(() => pages.value.at(-1)?.nextCursor != null),
    loadMore: () => query.loadNextPage(),
    retry: () => query.refetch(),
  };
}

/** One order as the reader sees it (with what they may do now). */
export function useOrder(orderId: MaybeRefOrGetter<string>) {
  const client = useClient(orderEndpoints);
  return useQuery<Order, ApiRequestError>({
    key: () => queryKeys.orders.order(toValue(orderId)),
    query: ({ signal }) =>
      client
        .getOrder({ orderId: toValue(orderId) }, { signal })
        .then((answer) => answer.order)
        .catch(rethrow),
    // The other side moves the order too: every visit asks again.
    staleTime: 0,
  });
}

/** One step of an order after payment, by the buyer or the sawyer. */
export type OrderStep =
  | { step: "propose_pickup_windows"; body: PickupWindowsInput }
  | { step: "choose_pickup_window"; startsAt: string }
  | { step: "mark_shipped"; body: ShipmentInput }
  | { step: "mark_handed_over"; reason?: string }
  | { step: "confirm_receipt" }
  | { step: "report_problem"; body: ProblemReportInput }
  | { step: "cancel"; reason: string };

/** Puts an order's newest state in the cache and marks the lists stale (a failure there shows on the list). */
function useOrderWriter() {
  const cache = useQueryCache();
  return (order: Order) => {
    cache.setQueryData(queryKeys.orders.order(order.id), order);
    void markStale(cache, { key: [...queryKeys.orders.all, "list"] });
  };
}

/** Takes one step of an order; answers the order as it is afterwards (also in the cache). */
export function useOrderStep(orderId: MaybeRefOrGetter<string>) {
  const client = useClient(orderEndpoints);
  const write = useOrderWriter();
  return useMutation<Order, OrderStep, ApiRequestError>({
    mutation: (input) => {
      const id = toValue(orderId);
      const call =
        input.step === "propose_pickup_windows"
          ? client.proposePickupWindows({ orderId: id, body: input.body })
          : input.step === "choose_pickup_window"
            ? client.choosePickupWindow({ orderId: id, body: { startsAt: input.startsAt } })
            : input.step === "mark_shipped"
              ? client.markShipped({ orderId: id, body: input.body })
              : input.step === "mark_handed_over"
                ? client.markHandedOver({ orderId: id, body: input.reason === undefined ? {} : { reason: input.reason } })
                : input.step === "confirm_receipt"
                  ? client.confirmReceipt({ orderId: id })
                  : input.step === "report_problem"
                    ? client.reportProblem({ orderId: id, body: input.body })
                    : client.cancelOrder({ orderId: id, body: { reason: input.reason } });
      return call.then((answer) => answer.order).catch(rethrow);
    },
    onSuccess: write,
  });
}

/** An admin's view of a paid order's refunds: what was refunded and why, what is left. */
export function useDisputeRefundState(orderId: MaybeRefOrGetter<string>) {
  const client = useClient(payoutEndpoints);
  return useQuery<DisputeRefundState, ApiRequestError>({
    key: () => queryKeys.orders.disputeRefund(toValue(orderId)),
    query: ({ signal }) => client.disputeRefundState({ orderId: toValue(orderId) }, { signal }).catch(rethrow),
    staleTime: 0,
  });
}

/** Refunds all or part of a paid order for a dispute. The order, its refunds and the payouts due change. */
export function useDisputeRefund(orderId: MaybeRefOrGetter<string>) {
  const client = useClient(payoutEndpoints);
  const cache = useQueryCache();
  return useMutation<DisputeRefundResult, DisputeRefund, ApiRequestError>({
    mutation: (body) => client.disputeRefund({ orderId: toValue(orderId), body }).catch(rethrow),
    onSettled: () =>
      Promise.all([
        markStale(cache, { key: queryKeys.orders.disputeRefund(toValue(orderId)) }),
        markStale(cache, { key: queryKeys.orders.order(toValue(orderId)) }),
        markStale(cache, { key: [...queryKeys.orders.all, "list"] }),
        markStale(cache, { key: queryKeys.payouts.all }),
      ]),
  });
}
