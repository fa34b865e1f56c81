/**
 * The sawyer's own yard: the yard profile, logs, slabs, their moisture readings and the sawyer's
 * listings. Private answers (never rendered on the server); the session forgets them on sign-out.
 * Every change is a mutation that marks the whole yard stale, so each list and page that shows
 * it asks again (only the ones on screen ask at once).
 */
import { toValue, type MaybeRefOrGetter } from "vue";
import { useMutation, useQuery, useQueryCache } from "@pinia/colada";
import {
  accountEndpoints,
  catalogueEndpoints,
  listingEndpoints,
  yardEndpoints,
  type Account,
  type Answer,
  type Listing,
  type Log,
  type LogInput,
  type MarketplaceFees,
  type MoistureReadingInput,
  type Slab,
  type SlabInput,
  type YardProfileUpdateInput,
} from "@grainyard/contracts";
import type { ApiRequestError } from "../api/errors.ts";
import { rethrow, useClient, markStale } from "./api.ts";
import { queryKeys } from "./keys.ts";

type LogDetail = Answer<typeof yardEndpoints.getLog>;
type SlabDetail = Answer<typeof yardEndpoints.getSlab>;

/** After any change in the yard: every yard answer is stale (the ones on screen ask again now). */
export function useYardChanged() {
  const cache = useQueryCache();
  return () => markStale(cache, { key: queryKeys.yard.all });
}

/** The signed-in sawyer's own account with the yard profile (fresher than the session's copy). */
export function useOwnYard() {
  const client = useClient(accountEndpoints);
  return useQuery<Account, ApiRequestError>({
    key: queryKeys.yard.profile,
    query: ({ signal }) =>
      client
        .getOwnYard(undefined, { signal })
        .then((answer) => answer.account)
        .catch(rethrow),
  });
}

export function useUpdateYard() {
  const client = useClient(accountEndpoints);
  const changed = useYardChanged();
  const cache = useQueryCache();
  return useMutation({
    mutation: (input: { sawyerId: string; body: YardProfileUpdateInput }) =>
      client
        .updateYard({ sawyerId: input.sawyerId, body: input.body })
        .then((answer) => answer.account)
        .catch(rethrow),
    onSettled: () => {
      void changed();
      // The yard's public page and the cards' yard names follow.
      void markStale(cache, { key: queryKeys.catalogue.all }, false);
    },
  });
}

export function useYardLogs() {
  const client = useClient(yardEndpoints);
  return useQuery<Log[], ApiRequestError>({
    key: queryKeys.yard.logs,
    query: ({ signal }) =>
      client
        .listLogs(undefined, { signal })
        .then((answer) => answer.logs)
        .catch(rethrow),
  });
}

export function useYardSlabs() {
  const client = useClient(yardEndpoints);
  return useQuery<Slab[], ApiRequestError>({
    key: queryKeys.yard.slabs,
    query: ({ signal }) =>
      client
        .listSlabs(undefined, { signal })
        .then((answer) => answer.slabs)
        .catch(rethrow),
  });
}

export function useOwnListings() {
  const client = useClient(listingEndpoints);
  return useQuery<Listing[], ApiRequestError>({
    key: queryKeys.yard.listings,
    query: ({ signal }) =>
      client
        .listOwnListings(undefined, { signal })
        .then((answer) => answer.listings)
        .catch(rethrow),
  });
}

/** One log with its slabs; asks nothing while there is no id (a new log). */
export function useYardLog(logId: MaybeRefOrGetter<string | null>) {
  const client = useClient(yardEndpoints);
  return useQuery<LogDetail, ApiRequestError>({
    key: () => queryKeys.yard.log(toValue(logId) ?? ""),
    query: ({ signal }) => client.getLog({ logId: toValue(logId)! }, { signal }).catch(rethrow),
    enabled: () => Boolean(toValue(logId)),
  });
}

/** One slab with its readings and drying projection; asks nothing while there is no id. */
export function useYardSlab(slabId: MaybeRefOrGetter<string | null>) {
  const client = useClient(yardEndpoints);
  return useQuery<SlabDetail, ApiRequestError>({
    key: () => queryKeys.yard.slab(toValue(slabId) ?? ""),
    query: ({ signal }) => client.getSlab({ slabId: toValue(slabId)! }, { signal }).catch(rethrow),
    enabled: () => Boolean(toValue(slabId)),
  });
}

/** One of the sawyer's own listings, in any state; asks nothing while there is no id. */
export function useOwnListing(listingId: MaybeRefOrGetter<string | null>) {
  const client = useClient(listingEndpoints);
  return useQuery<Listing, ApiRequestError>({
    key: () => queryKeys.yard.listing(toValue(listingId) ?? ""),
    query: ({ signal }) =>
      client
        .getOwnListing({ listingId: toValue(listingId)! }, { signal })
        .then((answer) => answer.listing)
        .catch(rethrow),
    enabled: () => Boolean(toValue(listingId)),
  });
}

/** The marketplace's fees in force (the same for everyone), for a listing's price preview. */
export function useMarketplaceFees() {
  const client = useClient(catalogueEndpoints);
  return useQuery<MarketplaceFees, ApiRequestError>({
    key: queryKeys.catalogue.fees,
    query: ({ signal }) =>
      client
        .getMarketplaceFees(undefined, { signal })
        .then((answer) => answer.fees)
        .catch(rethrow),
  });
}

/** Creates a log, or changes the one with `logId`; answers the saved log. */
export function useSaveLog() {
  const client = useClient(yardEndpoints);
  const changed = useYardChanged();
  return useMutation({
    mutation: (input: { logId: string | null; body: LogInput }) =>
      (input.logId ? client.updateLog({ logId: input.logId, body: input.body }) : client.createLog({ body: input.body }))
        .then((answer) => answer.log)
        .catch(rethrow),
    onSettled: changed,
  });
}

export function useDeleteLog() {
  const client = useClient(yardEndpoints);
  const changed = useYardChanged();
  return useMutation({
    mutation: (logId: string) => client.deleteLog({ logId }).catch(rethrow),
    onSettled: changed,
  });
}

/** One reading for every slab of a log still drying; answers how many slabs got it. */
export function useRecordLogReadings() {
  const client = useClient(yardEndpoints);
  const changed = useYardChanged();
  return useMutation({
    mutation: (input: { logId: string; body: MoistureReadingInput }) =>
      client
        .recordLogReadings({ logId: input.logId, body: input.body })
        .then((answer) => answer.count)
        .catch(rethrow),
    onSettled: changed,
  });
}

/** Creates a slab, or changes the one with `slabId`; answers the saved slab. */
export function useSaveSlab() {
  const client = useClient(yardEndpoints);
  const changed = useYardChanged();
  return useMutation({
    mutation: (input: { slabId: string | null; body: SlabInput }) =>
      (input.slabId ? client.updateSlab({ slabId: input.slabId, body: input.body }) : client.createSlab({ body: input.body }))
        .then((answer) => answer.slab)
        .catch(rethrow),
    onSettled: changed,
  });
}

export function useDeleteSlab() {
  const client = useClient(yardEndpoints);
  const changed = useYardChanged();
  return useMutation({
    mutation: (slabId: string) => client.deleteSlab({ slabId }).catch(rethrow),
    onSettled: changed,
  });
}

export function useAddReading() {
  const client = useClient(yardEndpoints);
  const changed = useYardChanged();
  return useMutation({
    mutation: (input: { slabId: string; body: MoistureReadingInput }) =>
      client
        .addReading({ slabId: input.slabId, body: input.body })
        .then((answer) => answer.reading)
        .catch(rethrow),
    onSettled: changed,
  });
}

export function useDeleteReading() {
  const client = useClient(yardEndpoints);
  const changed = useYardChanged();
  return useMutation({
    mutation: (readingId: string) => client.deleteReading({ readingId }).catch(rethrow),
    onSettled: changed,
  });
}

/** Sends a listing to the review desk, or takes it off sale; answers the listing as it is now. */
export function useListingStep() {
  const client = useClient(listingEndpoints);
  const changed = useYardChanged();
  const cache = useQueryCache();
  return useMutation({
    mutation: (input: { listingId: string; step: "submit" | "withdraw" }) =>
      (input.step === "submit"
        ? client.submitListing({ listingId: input.listingId })
        : client.withdrawListing({ listingId: input.listingId })
      )
        .then((answer) => answer.listing)
        .catch(rethrow),
    onSettled: () => {
      void changed();
      // A withdrawn listing leaves the catalogue.
      void markStale(cache, { key: queryKeys.catalogue.all }, false);
    },
  });
}

/** A one-off read of a log and its slabs, for a form that fills itself from the chosen log. */
export function useLogLookup() {
  const client = useClient(yardEndpoints);
  return (logId: string): Promise<LogDetail> => client.getLog({ logId }).catch(rethrow);
}
