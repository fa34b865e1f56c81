/**
 * The admin desk's data: the dashboard, the audit log, payouts due, reports, the people search, the review desk,
 * buyers' reviews, the e-mail outbox and the marketplace settings. Each decision is a mutation that marks what it changed as stale,
 * so every list that shows it asks again.
 */
import { computed, toValue, type MaybeRefOrGetter } from "vue";
import { useInfiniteQuery, useMutation, useQuery, useQueryCache } from "@pinia/colada";
import {
  adminEndpoints,
  orderReviewEndpoints,
  payoutEndpoints,
  reviewEndpoints,
  type AdminUser,
  type Answer,
  type AuditPage,
  type AuditSearchInput,
  type Dashboard,
  type MarketplaceSettings,
  type OrderReview,
  type OutboxPage,
  type OutboxQuery,
  type OrderProblemCase,
  type ProblemResolution,
  type Report,
  type orderProblemStatuses,
  type ReviewDeskItem,
  type reportResolutions,
  type reportStatuses,
} from "@grainyard/contracts";
import type { ApiRequestError } from "../api/errors.ts";
import { rethrow, useClient, markStale } from "./api.ts";
import { queryKeys } from "./keys.ts";

export function useDashboard() {
  const client = useClient(adminEndpoints);
  return useQuery<Dashboard, ApiRequestError>({
    key: queryKeys.admin.dashboard,
    query: ({ signal }) =>
      client
        .getDashboard(undefined, { signal })
        .then((answer) => answer.dashboard)
        .catch(rethrow),
  });
}

/** The audit log's filters as the desk sends them (empty ones left out). */
export type AuditFilters = Omit<AuditSearchInput, "cursor" | "limit">;
const AUDIT_PAGE = 50;

/**
 * The audit log, newest first, a page of 50 at a time for the filters given (asked again when they
 * change); `loadMore` appends older entries with the API's cursor. `csvUrl` downloads the same filters.
 */
export function useAuditLog(filters: MaybeRefOrGetter<AuditFilters>) {
  const client = useClient(adminEndpoints);
  const query = useInfiniteQuery<AuditPage, ApiRequestError, string | null>({
    key: () => queryKeys.admin.audit({ ...toValue(filters) }),
    query: ({ pageParam, signal }) =>
      client.searchAudit({ query: { ...toValue(filters), cursor: pageParam ?? undefined, limit: AUDIT_PAGE } }, { signal }).catch(rethrow),
    initialPageParam: null,
    getNextPageParam: (lastPage) => lastPage.nextCursor,
    // A new entry is written with every admin action: the log asks again on each visit.
    staleTime: 0,
  });
  const pages = computed(() => query.data.value?.pages ?? []);
  return {
    entries: computed(() => pages.value.flatMap((page) => page.entries)),
    loading: computed(() => pages.value.length === 0 && query.error.value === null),
    busy: query.isLoading,
    error: query.error,
    hasMore: computed(() => pages.value.at(-1)?.nextCursor != null),
    loadMore: () => query.loadNextPage(),
    retry: () => query.refetch(),
    csvUrl: computed(() => client.exportAuditCsv({ query: toValue(filters) })),
  };
}

export function usePayoutsDue() {
  const client = useClient(payoutEndpoints);
  return useQuery<Answer<typeof payoutEndpoints.payoutsDue>, ApiRequestError>({
    key: queryKeys.payouts.due,
    query: ({ signal }) => client.payoutsDue(undefined, { signal }).catch(rethrow),
  });
}

export type ReportStatus = (typeof reportStatuses)[number];

export function useReports(status: MaybeRefOrGetter<ReportStatus>) {
  const client = useClient(adminEndpoints);
  return useQuery<Report[], ApiRequestError>({
    key: () => queryKeys.admin.reports(toValue(status)),
    query: ({ signal }) =>
      client
        .listReports({ query: { status: toValue(status) } }, { signal })
        .then((answer) => answer.reports)
        .catch(rethrow),
  });
}

export function useResolveReport() {
  const client = useClient(adminEndpoints);
  const cache = useQueryCache();
  return useMutation({
    mutation: (input: { reportId: string; resolution: (typeof reportResolutions)[number]; note: string }) =>
      client.resolveReport({ reportId: input.reportId, body: { resolution: input.resolution, note: input.note } }).catch(rethrow),
    // A take-down or suspension changes the dashboard, the people list and the catalogue too.
    onSettled: () => markStale(cache, { key: queryKeys.admin.all }),
  });
}

export type OrderProblemStatus = (typeof orderProblemStatuses)[number];

/** Problems buyers reported after hand-over: open ones oldest first, or settled ones. */
export function useOrderProblems(status: MaybeRefOrGetter<OrderProblemStatus>) {
  const client = useClient(adminEndpoints);
  return useQuery<OrderProblemCase[], ApiRequestError>({
    key: () => queryKeys.admin.problems(toValue(status)),
    query: ({ signal }) =>
      client
        .listOrderProblems({ query: { status: toValue(status) } }, { signal })
        .then((answer) => answer.problems)
        .catch(rethrow),
    staleTime: 0,
  });
}

/** Settles a reported problem: a refund (all or part) or the sale released. The order, its refunds, the desk and the payouts change. */
export function useResolveOrderProblem(orderId: MaybeRefOrGetter<string>) {
  const client = useClient(adminEndpoints);
  const cache = useQueryCache();
  return useMutation({
    mutation: (input: { problemId: string; body: ProblemResolution }) =>
      client.resolveOrderProblem({ problemId: input.problemId, body: input.body }).catch(rethrow),
    onSettled: () =>
      Promise.all([
        markStale(cache, { key: queryKeys.orders.order(toValue(orderId)) }),
        markStale(cache, { key: queryKeys.orders.disputeRefund(toValue(orderId)) }),
        markStale(cache, { key: [...queryKeys.orders.all, "list"] }),
        markStale(cache, { key: queryKeys.admin.all }),
        markStale(cache, { key: queryKeys.payouts.all }),
      ]),
  });
}

export interface UserFilters {
  query?: string;
  role?: "buyer" | "sawyer" | "admin";
  suspended?: "yes" | "no";
}

export function useUserSearch(filters: MaybeRefOrGetter<UserFilters>) {
  const client = useClient(adminEndpoints);
  return useQuery<AdminUser[], ApiRequestError>({
    key: () => queryKeys.admin.users({ ...toValue(filters) }),
    query: ({ signal }) =>
      client
        .searchUsers({ query: toValue(filters) }, { signal })
        .then((list) => list.users)
        .catch(rethrow),
    // The last list stays (marked as updating) while a new search is on its way.
    placeholderData: (previous) => previous,
  });
}

export function useSuspendOrRestore() {
  const client = useClient(adminEndpoints);
  const cache = useQueryCache();
  return useMutation({
    mutation: (input: { accountId: string; action: "suspend" | "restore"; reason: string }) =>
      (input.action === "suspend"
        ? client.suspendUser({ accountId: input.accountId, body: { reason: input.reason } })
        : client.restoreUser({ accountId: input.accountId, body: { reason: input.reason } })
      ).catch(rethrow),
    onSettled: () => markStale(cache, { key: queryKeys.admin.dashboard }),
  });
}

export function useReviewDesk() {
  const client = useClient(reviewEndpoints);
  return useQuery<ReviewDeskItem[], ApiRequestError>({
    key: queryKeys.admin.reviewDesk,
    query: ({ signal }) =>
      client
        .reviewDesk(undefined, { signal })
        .then((answer) => answer.items)
        .catch(rethrow),
  });
}

/** Approve, send back or reject a listing. The desk keeps showing the decided row until it is asked again. */
export function useReviewDecision() {
  const client = useClient(reviewEndpoints);
  const cache = useQueryCache();
  return useMutation({
    mutation: (input: { listingId: string; decision: "approved" | "sent_back" | "rejected"; reason?: string }) => {
      const { listingId, reason = "" } = input;
      const call =
        input.decision === "approved"
          ? client.approveListing({ listingId })
          : input.decision === "sent_back"
            ? client.sendBackListing({ listingId, body: { reason } })
            : client.rejectListing({ listingId, body: { reason } });
      return call.then(() => undefined).catch(rethrow);
    },
    // An approval puts a slab in the catalogue. The open desk is only marked stale: its decided rows stay
    // on screen with their decision, and the next visit asks again.
    onSettled: () => {
      void markStale(cache, { key: queryKeys.admin.reviewDesk }, false);
      void markStale(cache, { key: queryKeys.admin.dashboard });
      void markStale(cache, { key: queryKeys.catalogue.all });
    },
  });
}

export function useMarketplaceSettings() {
  const client = useClient(adminEndpoints);
  return useQuery<Answer<typeof adminEndpoints.getSettings>, ApiRequestError>({
    key: queryKeys.admin.settings,
    query: ({ signal }) => client.getSettings(undefined, { signal }).catch(rethrow),
  });
}

export function useUpdateSettings() {
  const client = useClient(adminEndpoints);
  const cache = useQueryCache();
  return useMutation({
    mutation: (body: Partial<MarketplaceSettings> & { reason: string }) => client.updateSettings({ body }).catch(rethrow),
    onSettled: () => markStale(cache, { key: queryKeys.admin.settings }),
  });
}

/** Buyers' reviews for the desk: the visible ones ("no") or the hidden ones ("yes"). */
export function useBuyerReviews(hidden: MaybeRefOrGetter<"yes" | "no">) {
  const client = useClient(orderReviewEndpoints);
  return useQuery<OrderReview[], ApiRequestError>({
    key: () => queryKeys.admin.buyerReviews(toValue(hidden)),
    query: ({ signal }) =>
      client
        .listReviews({ query: { hidden: toValue(hidden) } }, { signal })
        .then((answer) => answer.reviews)
        .catch(rethrow),
  });
}

/** Hide a review, or show a hidden one again, for a stated reason. Both lists and the yard pages change. */
export function useHideOrShowReview() {
  const client = useClient(orderReviewEndpoints);
  const cache = useQueryCache();
  return useMutation({
    mutation: (input: { reviewId: string; action: "hide" | "show"; reason: string }) =>
      (input.action === "hide"
        ? client.hideReview({ reviewId: input.reviewId, body: { reason: input.reason } })
        : client.showReview({ reviewId: input.reviewId, body: { reason: input.reason } })
      ).catch(rethrow),
    onSettled: () => {
      void markStale(cache, { key: queryKeys.admin.buyerReviewsAll });
      // A yard's page shows its reviews and rating; an order shows its review.
      void markStale(cache, { key: ["catalogue", "yard"] });
      void markStale(cache, { key: ["reviews"] });
    },
  });
}

export type OutboxStatus = NonNullable<OutboxQuery["status"]>;

/** The e-mail outbox: waiting, failed or lately sent e-mails, with the counts of the first two. */
export function useOutbox(status: MaybeRefOrGetter<OutboxStatus>) {
  const client = useClient(adminEndpoints);
  return useQuery<OutboxPage, ApiRequestError>({
    key: () => queryKeys.admin.outbox(toValue(status)),
    query: ({ signal }) => client.listOutbox({ query: { status: toValue(status) } }, { signal }).catch(rethrow),
    // The counts stay on the chips while another list is on its way.
    placeholderData: (previous) => previous,
  });
}

/** Send a waiting or failed e-mail again now; every outbox list asks again afterwards. */
export function useResendEmail() {
  const client = useClient(adminEndpoints);
  const cache = useQueryCache();
  return useMutation({
    mutation: (emailId: string) =>
      client
        .resendEmail({ emailId })
        .then((answer) => answer.email)
        .catch(rethrow),
    onSettled: () => markStale(cache, { key: queryKeys.admin.outboxAll }),
  });
}
