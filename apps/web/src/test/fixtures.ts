import type { CatalogueCard, SavedSearch, ThreadSummary } from "@grainyard/contracts";

/** Accounts and answers for the buyer tools' unit tests (invented Lakemont people). */
export const buyerAccount = {
  id: "acc_buyer",
  email: "ana.theo@lakemont-home.test",
  displayName: "Ana and Theo Brandt",
  role: "buyer",
  emailVerified: true,
  yardName: null,
  yardSlug: null,
  yardStory: null,
  pickupTown: null,
  createdAt: "2026-02-01T12:00:00.000Z",
};

export const sawyerAccount = {
  ...buyerAccount,
  id: "acc_sawyer",
  email: "yard@ridgeback-timber.test",
  displayName: "Oskar Lindqvist",
  role: "sawyer",
  yardName: "Ridgeback Urban Timber",
  yardSlug: "ridgeback-urban-timber",
  pickupTown: "Lakemont",
};

export const oakCard: CatalogueCard = {
  listingId: "lst_oak",
  title: "Wide red oak dining slab, seats eight",
  speciesSlug: "northern-red-oak",
  setKind: "single",
  slabCount: 1,
  lengthMm: 2950,
  averageWidthMm: 986,
  minWidthMm: 960,
  thicknessMm: 64,
  boardFeet: 78.9,
  volumeM3: 0.186,
  weightKg: 125.2,
  totalWeightHighKg: 137.7,
  heaviestSlabHighKg: 137.7,
  moisturePct: 8,
  ready: true,
  priceMinor: 114418,
  pricePerBoardFootMinor: 1450,
  currency: "USD",
  liveEdge: "both",
  features: ["figure"],
  freight: true,
  pickup: true,
  town: "East Lakemont",
  yardName: "Cobble Lane Slabworks",
  yardSlug: "cobble-lane-slabworks",
  yardRating: { average: 4.7, count: 6 },
  distanceKm: null,
  fit: null,
  photoUrl: null,
  photoMediumUrl: null,
  photoAlt: null,
  publishedAt: "2026-12-02T07:53:11.220Z",
};

export function savedSearch(extra: Partial<SavedSearch> = {}): SavedSearch {
  return {
    id: "ss_1",
    name: "Table for 8",
    query: "seats=8",
    alerts: true,
    lastAlertAt: null,
    pendingMatches: 0,
    createdAt: "2026-11-20T10:00:00.000Z",
    ...extra,
  };
}

export function threadSummary(extra: Partial<ThreadSummary> = {}): ThreadSummary {
  return {
    id: "thr_1",
    listingId: "lst_oak",
    listingTitle: "Wide red oak dining slab, seats eight",
    myRole: "buyer",
    buyer: { id: "acc_buyer", displayName: "Ana and Theo Brandt" },
    sawyer: { id: "acc_sawyer", displayName: "Oskar Lindqvist", yardName: "Ridgeback Urban Timber" },
    otherParty: { id: "acc_sawyer", displayName: "Oskar Lindqvist" },
    lastMessage: { authorId: "acc_buyer", fromMe: true, excerpt: "Is it flat enough?", createdAt: "2026-12-02T09:00:00.000Z" },
    unreadCount: 0,
    lastMessageAt: "2026-12-02T09:00:00.000Z",
    createdAt: "2026-12-02T09:00:00.000Z",
    ...extra,
  };
}
