/**
 * A buyer's tools: a question to the sawyer about a listing, saving the catalogue search being
 * looked at (with e-mail alerts), and the saved searches page (rename, alerts, delete).
 */
import { computed, toValue, type MaybeRefOrGetter } from "vue";
import { useMutation, useQuery, useQueryCache } from "@pinia/colada";
import {
  buyerEndpoints,
  catalogueEndpoints,
  messageEndpoints,
  type MessagePosted,
  type SavedSearch,
  type SavedSearchInput,
} from "@grainyard/contracts";
import { toApiRequestError, type ApiRequestError } from "../api/errors.ts";
import { rethrow, useClient, markStale } from "./api.ts";
import { queryKeys } from "./keys.ts";

export function useAskAboutListing(listingId: MaybeRefOrGetter<string>) {
  const client = useClient(messageEndpoints);
  return useMutation<MessagePosted, string, ApiRequestError>({
    mutation: (body) =>
      client.askAboutListing({ listingId: toValue(listingId), body: { body } }).catch((error: unknown) => {
        throw toApiRequestError(error);
      }),
  });
}

export function useSaveSearch() {
  const client = useClient(buyerEndpoints);
  const cache = useQueryCache();
  return useMutation<SavedSearch, SavedSearchInput, ApiRequestError>({
    onSettled: () => markStale(cache, { key: queryKeys.buyer.savedSearches }),
    mutation: (input) =>
      client
        .saveSearch({ body: input })
        .then((answer) => answer.savedSearch)
        .catch((error: unknown) => {
          throw toApiRequestError(error);
        }),
  });
}

/** The buyer's saved searches, newest first as the API sends them. */
export function useSavedSearches() {
  const client = useClient(buyerEndpoints);
  return useQuery<SavedSearch[], ApiRequestError>({
    key: queryKeys.buyer.savedSearches,
    query: ({ signal }) =>
      client
        .listSavedSearches(undefined, { signal })
        .then((answer) => answer.savedSearches)
        .catch(rethrow),
  });
}

/** Puts one saved search (or its removal) into the cached list. */
function useSavedSearchWriter() {
  const cache = useQueryCache();
  return (change: { replace: SavedSearch } | { remove: string }) => {
    const list = cache.getQueryData<SavedSearch[]>(queryKeys.buyer.savedSearches);
    if (!list) return;
    cache.setQueryData(
      queryKeys.buyer.savedSearches,
      "replace" in change
        ? list.map((search) => (search.id === change.replace.id ? change.replace : search))
        : list.filter((search) => search.id !== change.remove),
    );
  };
}

/** Rename or turn alerts on/off. The change shows at once and is taken back if the API says no. */
export function useUpdateSavedSearch() {
  const client = useClient(buyerEndpoints);
  const write = useSavedSearchWriter();
  return useMutation<
    SavedSearch,
    { search: SavedSearch; change: { name?: string; alerts?: boolean } },
    ApiRequestError,
    { before: SavedSearch }
  >({
    mutation: ({ search, change }) =>
      client
        .updateSavedSearch({ savedSearchId: search.id, body: change })
        .then((answer) => answer.savedSearch)
        .catch(rethrow),
    onMutate: ({ search, change }) => {
      write({ replace: { ...search, ...change } });
      return { before: search };
    },
    onSuccess: (saved) => write({ replace: saved }),
    onError: (_error, _input, context) => {
      if (context?.before) write({ replace: context.before });
    },
  });
}

/** Deletes a saved search; one already gone (404) leaves the list too. */
export function useDeleteSavedSearch() {
  const client = useClient(buyerEndpoints);
  const write = useSavedSearchWriter();
  return useMutation<void, SavedSearch, ApiRequestError>({
    mutation: (search) =>
      client.deleteSavedSearch({ savedSearchId: search.id }).catch((error: unknown) => {
        const failure = toApiRequestError(error);
        if (failure.status !== 404) throw failure;
      }),
    onSuccess: (_nothing, search) => write({ remove: search.id }),
  });
}

/**
 * Town names for the "near" ids of saved searches (the query holds the id; a one-card catalogue
 * search names the town). A town that cannot be named is left out; the words then say "the chosen town".
 */
export function useTownNames(ids: MaybeRefOrGetter<string[]>) {
  const client = useClient(catalogueEndpoints);
  const sorted = computed(() => [...new Set(toValue(ids))].sort());
  const query = useQuery<Record<string, string>, ApiRequestError>({
    key: () => [...queryKeys.catalogue.all, "town-names", sorted.value.join(",")],
    query: async ({ signal }) => {
      const named = await Promise.all(
        sorted.value.map((near) =>
          client
            .searchCatalogue({ query: { near, limit: "1" } }, { signal })
            .then((answer) => (answer.near ? ([near, answer.near.name] as const) : null))
            .catch(() => null),
        ),
      );
      return Object.fromEntries(named.filter((entry) => entry !== null));
    },
    enabled: () => sorted.value.length > 0,
    staleTime: 10 * 60_000,
  });
  return computed(() => query.data.value ?? {});
}
