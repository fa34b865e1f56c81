/**
 * Reviews of completed orders: an order's review with what the reader may do with it (write,
 * change, answer), and a yard's visible reviews in keyset pages. Writing, changing or answering
 * answers the review as it is now, which goes straight into the cache; the yard's pages that show
 * it are marked stale. (An admin hides or shows a review through useHideOrShowReview in admin.ts.)
 */
import { computed, toValue, type MaybeRefOrGetter } from "vue";
import { useInfiniteQuery, useMutation, useQuery, useQueryCache } from "@pinia/colada";
import { orderReviewEndpoints, type OrderReviewState, type ReviewInput, type YardReviews } from "@grainyard/contracts";
import type { ApiRequestError } from "../api/errors.ts";
import { rethrow, useClient, markStale } from "./api.ts";
import { queryKeys } from "./keys.ts";

/** A completed order's review (or none yet) and what the reader may do with it. */
export function useOrderReview(orderId: MaybeRefOrGetter<string>) {
  const client = useClient(orderReviewEndpoints);
  return useQuery<OrderReviewState, ApiRequestError>({
    key: () => queryKeys.reviews.order(toValue(orderId)),
    query: ({ signal }) => client.getOrderReview({ orderId: toValue(orderId) }, { signal }).catch(rethrow),
    staleTime: 0,
  });
}

/** The buyer writes or changes the review; the sawyer answers it. */
export type ReviewStep = { step: "write"; input: ReviewInput } | { step: "edit"; input: ReviewInput } | { step: "answer"; body: string };

export function useReviewStep(orderId: MaybeRefOrGetter<string>) {
  const client = useClient(orderReviewEndpoints);
  const cache = useQueryCache();
  return useMutation<OrderReviewState, ReviewStep, ApiRequestError>({
    mutation: (input) => {
      const id = toValue(orderId);
      const call =
        input.step === "write"
          ? client.writeReview({ orderId: id, body: input.input })
          : input.step === "edit"
            ? client.editReview({ orderId: id, body: input.input })
            : client.answerReview({ orderId: id, body: { body: input.body } });
      return call.catch(rethrow);
    },
    onSuccess: (state) => {
      cache.setQueryData(queryKeys.reviews.order(toValue(orderId)), state);
      // The yard's pages show the review and its rating.
      void markStale(cache, { key: [...queryKeys.reviews.all, "yard"] });
      void markStale(cache, { key: ["catalogue", "yard"] });
    },
    onError: (error) => {
      // Someone else moved first (answered, hidden, the days ran out): ask for the review as it is now.
      if (error.status === 409) void markStale(cache, { key: queryKeys.reviews.order(toValue(orderId)) });
    },
  });
}

/**
 * A yard's visible reviews, newest first, `pageSize` at a time: `loadMore` appends the next page
 * with the API's cursor.
 */
export function useYardReviews(sawyerId: MaybeRefOrGetter<string>, pageSize: MaybeRefOrGetter<number>) {
  const client = useClient(orderReviewEndpoints);
  const query = useInfiniteQuery<YardReviews, ApiRequestError, string | null>({
    key: () => queryKeys.reviews.yard(toValue(sawyerId), toValue(pageSize)),
    query: ({ pageParam, signal }) =>
      client
        .yardReviews({ sawyerId: toValue(sawyerId), query: { limit: toValue(pageSize), cursor: pageParam ?? undefined } }, { signal })
        .catch(rethrow),
    initialPageParam: null,
    getNextPageParam: (lastPage) => lastPage.nextCursor,
  });
  const pages = computed(() => query.data.value?.pages ?? []);
  return {
    reviews: computed(() => pages.value.flatMap((page) => page.reviews)),
    /** The first page is on its way (nothing to show yet, nothing failed). */
    loading: computed(() => pages.value.length === 0 && query.error.value === null),
    /** A page is on its way. */
    busy: query.isLoading,
    error: query.error,
    hasMore: computed(() => pages.value.at(-1)?.nextCursor != null),
    loadMore: () => query.loadNextPage(),
    retry: () => query.refetch(),
  };
}
