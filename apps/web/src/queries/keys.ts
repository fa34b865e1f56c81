/**
 * Every query key of the app in one place. A key is the address of one answer in the query
 * cache: the same key on the server and in the browser is what lets a page hydrate without
 * asking again. Keys start with their domain, so a whole domain can be invalidated at once.
 */
import type { CatalogueQuery } from "./catalogue.ts";

export const queryKeys = {
  catalogue: {
    all: ["catalogue"] as const,
    /** One catalogue search (the API's own query text, without the page cursor). */
    search: (query: CatalogueQuery) => ["catalogue", "search", query] as const,
    /** A slab page: everything a buyer sees about one listing. */
    listing: (listingId: string) => ["catalogue", "listing", listingId] as const,
    /** A few live slabs like a sold one (same species). */
    similar: (speciesSlug: string) => ["catalogue", "similar", speciesSlug] as const,
    places: (text: string) => ["catalogue", "places", text.trim().toLowerCase()] as const,
  },
  checkout: {
    /** The price with tax for one listing (the same for everyone). */
    quote: (listingId: string) => ["checkout", "quote", listingId] as const,
  },
} as const;
