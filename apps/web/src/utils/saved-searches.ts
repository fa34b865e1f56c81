/**
 * Saved searches, seen from the web app: the catalogue URL's filters as the text the API stores
 * (no sort, cursor or limit: those say how to page, not what to find), the filters of a stored
 * search in plain words, and a first name for a search the buyer is about to save.
 */
import type { LocationQuery } from "vue-router";
import { savedSearchIgnoredKeys } from "@grainyard/contracts";
import type { UnitFormatter } from "../composables/useUnits.ts";
import { activeFilters, filtersFromQuery, queryFromFilters, type CatalogueFilters } from "./catalogue-filters.ts";

/** The longest name the API takes. */
export const SAVED_SEARCH_NAME_MAX = 80;

/** What to store for the catalogue's current filters, e.g. "species=black-walnut&seats=8". */
export function savedQueryText(filters: CatalogueFilters): string {
  const query = queryFromFilters(filters);
  for (const key of savedSearchIgnoredKeys) delete query[key];
  return new URLSearchParams(query).toString();
}

/** A stored query string read back as the catalogue page would read its URL. */
export function filtersFromSavedQuery(text: string): CatalogueFilters {
  const query: LocationQuery = {};
  for (const [key, value] of new URLSearchParams(text.replace(/^\?/, ""))) query[key] = value;
  return filtersFromQuery(query);
}

/**
 * The filters of a saved search in words, one per filter; empty when it asks for every slab.
 * The query holds a town's id: `placeName` is its name, when known.
 */
export function savedSearchWords(text: string, format: UnitFormatter, placeName: string | null = null): string[] {
  const filters = filtersFromSavedQuery(text);
  return activeFilters(filters, format, filters.near ? (placeName ?? "the chosen town") : null).map((filter) => filter.label);
}

/** The town id a saved search measures from, if any. */
export function savedSearchTown(text: string): string | null {
  return filtersFromSavedQuery(text).near;
}

/** The catalogue address that runs a saved search. */
export function savedSearchLink(text: string): string {
  return text ? `/browse?${text}` : "/browse";
}

/** A first name for the search: its filters in words, shortened to fit; "Every new slab" without filters. */
export function suggestedSearchName(filters: CatalogueFilters, format: UnitFormatter, placeName: string | null = null): string {
  const words = activeFilters(filters, format, placeName).map((filter) => filter.label);
  if (words.length === 0) return "Every new slab";
  const name = words.join(", ");
  return name.length <= SAVED_SEARCH_NAME_MAX ? name : `${name.slice(0, SAVED_SEARCH_NAME_MAX - 1).trimEnd()}…`;
}
