import { ref, shallowRef } from "vue";
import type { CatalogueCard, CatalogueResult } from "@grainyard/contracts";
import { searchQuery, type CatalogueFilters } from "../utils/catalogue-filters.ts";
import { toApiRequestError, type ApiRequestError } from "../api/errors.ts";
import { catalogueApi } from "../api/catalogue.ts";

const CATALOGUE_PAGE_SIZE = 24;

/**
 * One catalogue search and its pages: `search` loads the first page for the filters (an older
 * answer never overwrites a newer one), `showMore` appends the next page with the API's cursor
 * (keyset paging). A cursor the API no longer accepts starts the search again from the top.
 */
export function useCatalogueSearch(pageSize = CATALOGUE_PAGE_SIZE) {
  const results = shallowRef<CatalogueCard[]>([]);
  const answer = shallowRef<CatalogueResult | null>(null);
  const loading = ref(false);
  const loadingMore = ref(false);
  const error = ref<ApiRequestError | null>(null);
  const moreError = ref<ApiRequestError | null>(null);
  let controller: AbortController | null = null;
  let current: CatalogueFilters | null = null;

  async function search(filters: CatalogueFilters): Promise<void> {
    controller?.abort();
    const mine = new AbortController();
    controller = mine;
    current = filters;
    loading.value = true;
    loadingMore.value = false;
    error.value = null;
    moreError.value = null;
    try {
      const page = await catalogueApi.searchCatalogue({ query: searchQuery(filters, null, pageSize) }, { signal: mine.signal });
      if (controller !== mine) return;
      answer.value = page;
      results.value = page.results;
    } catch (caught) {
      if (mine.signal.aborted) return;
      error.value = toApiRequestError(caught);
      answer.value = null;
      results.value = [];
    } finally {
      if (controller === mine) loading.value = false;
    }
  }

  async function showMore(): Promise<void> {
    const cursor = answer.value?.nextCursor;
    if (!cursor || !current || loadingMore.value) return;
    const mine = new AbortController();
    controller = mine;
    loadingMore.value = true;
    moreError.value = null;
    try {
      const page = await catalogueApi.searchCatalogue({ query: searchQuery(current, cursor, pageSize) }, { signal: mine.signal });
      if (controller !== mine) return;
      // The count and the town come with every page; keep the newest.
      answer.value = page;
      const seen = new Set(results.value.map((card) => card.listingId));
      results.value = [...results.value, ...page.results.filter((card) => !seen.has(card.listingId))];
    } catch (caught) {
      if (mine.signal.aborted) return;
      const failure = toApiRequestError(caught);
      if (failure.is("bad_cursor")) {
        await search(current);
        return;
      }
      moreError.value = failure;
    } finally {
      if (controller === mine) loadingMore.value = false;
    }
  }

  return { results, answer, loading, loadingMore, error, moreError, search, showMore };
}
