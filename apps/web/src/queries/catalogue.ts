/**
 * The public catalogue's data: searches (paged with the API's cursor), one slab page, slabs like a
 * sold one, live slabs per species, the towns for "pickup near" and the marketplace fees. The same queries run in the
 * server's render (their answers travel with the page) and in the browser, which then has them
 * already: nothing is asked twice on the first visit.
 */
import { computed, toValue, type MaybeRefOrGetter } from "vue";
import { useInfiniteQuery, useQuery } from "@pinia/colada";
import {
  catalogueEndpoints,
  type CatalogueCard,
  type CatalogueDetail,
  type CatalogueResult,
  type Place,
  type SpeciesCounts,
} from "@grainyard/contracts";
import { toApiRequestError, type ApiRequestError } from "../api/errors.ts";
import { searchQuery, type CatalogueFilters } from "../utils/catalogue-filters.ts";
import { useClient } from "./api.ts";
import { queryKeys } from "./keys.ts";

/** A catalogue search in the API's words (mm, minor units, comma lists), as the URL carries it. */
export type CatalogueQuery = Record<string, string>;

const CATALOGUE_PAGE_SIZE = 24;

/** How long a search answer is used before it is asked again (the API keeps its own for 5 s). */
const SEARCH_FRESH_MS = 30_000;

/**
 * One catalogue search and its pages: the first page for the filters, then `showMore` appends
 * the next with the API's cursor (keyset paging). A cursor the API no longer accepts starts the
 * search again from the top. The filters may change; each set is its own cache entry.
 */
export function useCatalogueSearch(filters: MaybeRefOrGetter<CatalogueFilters>, pageSize = CATALOGUE_PAGE_SIZE) {
  const client = useClient(catalogueEndpoints);
  const query = computed<CatalogueQuery>(() => searchQuery(toValue(filters), null, pageSize));

  const search = useInfiniteQuery<CatalogueResult, ApiRequestError, string | null>({
    key: () => queryKeys.catalogue.search(query.value),
    query: ({ pageParam, signal }) =>
      client
        .searchCatalogue({ query: pageParam ? { ...query.value, cursor: pageParam } : query.value }, { signal })
        .catch((error: unknown) => {
          throw toApiRequestError(error);
        }),
    initialPageParam: null,
    getNextPageParam: (lastPage) => lastPage.nextCursor,
    staleTime: SEARCH_FRESH_MS,
  });

  const pages = computed(() => search.data.value?.pages ?? []);
  /** The newest page: the count, the town and the fit top come with every page. */
  const answer = computed<CatalogueResult | null>(() => pages.value.at(-1) ?? null);
  const results = computed<CatalogueCard[]>(() => {
    const seen = new Set<string>();
    return pages.value.flatMap((page) => page.results.filter((card) => !seen.has(card.listingId) && seen.add(card.listingId)));
  });
  /** The first page is on its way (nothing to show yet). */
  const loading = computed(() => pages.value.length === 0 && search.error.value === null);
  /** A page after the first is on its way. */
  const loadingMore = computed(() => pages.value.length > 0 && search.isLoading.value);
  /** The search itself failed (no page to show). */
  const error = computed(() => (pages.value.length === 0 ? search.error.value : null));
  /** "Show more" failed; the pages already shown stay. */
  const moreError = computed(() => (pages.value.length > 0 ? search.error.value : null));

  async function showMore(): Promise<void> {
    if (!answer.value?.nextCursor || search.isLoading.value) return;
    await search.loadNextPage();
    if (search.error.value?.code === "bad_cursor") await search.refetch();
  }

  return {
    results,
    answer,
    loading,
    loadingMore,
    error,
    moreError,
    showMore,
    retry: () => search.refetch(),
  };
}

/** Everything a buyer sees on a slab page. A 404 answer is kept as the page's error (not found). */
export function useSlabListing(listingId: MaybeRefOrGetter<string>) {
  const client = useClient(catalogueEndpoints);
  return useQuery<CatalogueDetail, ApiRequestError>({
    key: () => queryKeys.catalogue.listing(toValue(listingId)),
    query: ({ signal }) =>
      client.getCatalogueListing({ listingId: toValue(listingId) }, { signal }).catch((error: unknown) => {
        throw toApiRequestError(error);
      }),
  });
}

/** A few live slabs of the same species (under a sold slab). Runs only while `enabled` says so. */
export function useSimilarSlabs(speciesSlug: MaybeRefOrGetter<string | null>, excludeListingId: MaybeRefOrGetter<string>) {
  const client = useClient(catalogueEndpoints);
  const query = useQuery<CatalogueResult, ApiRequestError>({
    key: () => queryKeys.catalogue.similar(toValue(speciesSlug) ?? ""),
    query: ({ signal }) => client.searchCatalogue({ query: { species: toValue(speciesSlug) ?? "", limit: "5" } }, { signal }),
    enabled: () => Boolean(toValue(speciesSlug)),
  });
  const cards = computed(() =>
    (query.data.value?.results ?? []).filter((card) => card.listingId !== toValue(excludeListingId)).slice(0, 4),
  );
  return { cards, loading: query.isLoading };
}

/** How many live slabs each species has (absent: none), for the browse filter. The answer is public and the same for everyone. */
export function useSpeciesCounts() {
  const client = useClient(catalogueEndpoints);
  const query = useQuery<SpeciesCounts, ApiRequestError>({
    key: queryKeys.catalogue.speciesCounts,
    query: ({ signal }) =>
      client
        .speciesCounts(undefined, { signal })
        .then((answer) => answer.species)
        .catch((error: unknown) => {
          throw toApiRequestError(error);
        }),
    staleTime: SEARCH_FRESH_MS,
  });
  return {
    /** Live slabs by species slug; null until the counts have arrived (or when they could not be read). */
    counts: computed<Map<string, number> | null>(() =>
      query.data.value ? new Map(query.data.value.map((entry) => [entry.slug, entry.liveSlabs])) : null,
    ),
  };
}

/** Towns whose name starts with the text (two letters or more), for "pickup near". */
export function usePlaceSearch(text: MaybeRefOrGetter<string>) {
  const client = useClient(catalogueEndpoints);
  const query = useQuery<{ places: Place[] }, ApiRequestError>({
    key: () => queryKeys.catalogue.places(toValue(text)),
    query: ({ signal }) =>
      client.findPlaces({ query: { query: toValue(text) } }, { signal }).catch((error: unknown) => {
        throw toApiRequestError(error);
      }),
    enabled: () => toValue(text).trim().length >= 2,
    staleTime: 10 * 60_000,
  });
  return {
    places: computed<Place[]>(() => (toValue(text).trim().length >= 2 ? (query.data.value?.places ?? []) : [])),
    looking: query.isLoading,
    error: query.error,
  };
}
