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
    /** A yard's public page (its live slabs are catalogue cards, so it lives with the catalogue). */
    yard: (slug: string) => ["catalogue", "yard", slug] as const,
    places: (text: string) => ["catalogue", "places", text.trim().toLowerCase()] as const,
    /** Live slabs per species (the browse filter). */
    speciesCounts: ["catalogue", "species-counts"] as const,
    /** The marketplace's fees in force. */
    fees: ["catalogue", "fees"] as const,
  },
  /** The signed-in sawyer's own yard (private: forgotten when the account changes). */
  yard: {
    all: ["yard"] as const,
    profile: ["yard", "profile"] as const,
    logs: ["yard", "logs"] as const,
    slabs: ["yard", "slabs"] as const,
    listings: ["yard", "listings"] as const,
    log: (logId: string) => ["yard", "log", logId] as const,
    slab: (slabId: string) => ["yard", "slab", slabId] as const,
    listing: (listingId: string) => ["yard", "listing", listingId] as const,
  },
  messages: {
    all: ["messages"] as const,
    /** The reader's conversations (the account is part of the key: another person never sees them). */
    threads: (accountId: string) => ["messages", "threads", accountId] as const,
    thread: (threadId: string) => ["messages", "thread", threadId] as const,
  },
  buyer: {
    all: ["buyer"] as const,
    savedSearches: ["buyer", "saved-searches"] as const,
  },
  admin: {
    all: ["admin"] as const,
    dashboard: ["admin", "dashboard"] as const,
    settings: ["admin", "settings"] as const,
    audit: (filters: Record<string, string | undefined>) => ["admin", "audit", filters] as const,
    reports: (status: string) => ["admin", "reports", status] as const,
    /** Problems buyers reported after hand-over, by status. */
    problems: (status: string) => ["admin", "problems", status] as const,
    users: (filters: Record<string, string | undefined>) => ["admin", "users", filters] as const,
    reviewDesk: ["admin", "review-desk"] as const,
    buyerReviewsAll: ["admin", "buyer-reviews"] as const,
    buyerReviews: (hidden: string) => ["admin", "buyer-reviews", hidden] as const,
    outboxAll: ["admin", "outbox"] as const,
    outbox: (status: string) => ["admin", "outbox", status] as const,
  },
  secondFactor: {
    /** Whether the signed-in account's second factor is on (the account is part of the key). */
    status: (accountId: string) => ["second-factor", accountId] as const,
  },
  payouts: {
    all: ["payouts"] as const,
    due: ["payouts", "due"] as const,
    /** The desk's payouts sent and tried, filtered by status ("" for all). */
    list: (status: string) => ["payouts", "list", status] as const,
  },
  offers: {
    all: ["offers"] as const,
    /** The reader's offers (a buyer's own, or those on a sawyer's listings; the account is part of the key). */
    list: (accountId: string, listingId: string | null) => ["offers", "list", accountId, listingId ?? "all"] as const,
    /** A sawyer's offer settings of one listing. */
    settings: (listingId: string) => ["offers", "settings", listingId] as const,
  },
  checkout: {
    /** The price with tax for one listing (the same for everyone). */
    quote: (listingId: string) => ["checkout", "quote", listingId] as const,
  },
  orders: {
    all: ["orders"] as const,
    /** The reader's orders: a buyer's, a sawyer's sales, or every order for an admin (the account is part of the key). */
    list: (accountId: string) => ["orders", "list", accountId] as const,
    /** The desk's order search (a list too: marking the lists stale after a step covers it). */
    desk: (words: string, pageSize: number) => ["orders", "list", "desk", words, pageSize] as const,
    /** One order as its reader sees it (the order page and its receipt share it). */
    order: (orderId: string) => ["orders", "order", orderId] as const,
    /** An admin's view of a paid order's dispute refunds. */
    disputeRefund: (orderId: string) => ["orders", "dispute-refund", orderId] as const,
  },
  reviews: {
    all: ["reviews"] as const,
    /** A completed order's review and what the reader may do with it. */
    order: (orderId: string) => ["reviews", "order", orderId] as const,
    /** A yard's visible reviews, newest first, in keyset pages. */
    yard: (sawyerId: string, pageSize: number) => ["reviews", "yard", sawyerId, pageSize] as const,
  },
} as const;

/** Domains whose answers are the same for everyone; every other answer belongs to the signed-in person. */
const PUBLIC_DOMAINS: readonly string[] = ["catalogue", "checkout"];

/** True for a key whose answer is someone's own (their yard, orders, messages, the admin desk). */
export function isPersonalKey(key: readonly unknown[]): boolean {
  return !PUBLIC_DOMAINS.includes(String(key[0]));
}
