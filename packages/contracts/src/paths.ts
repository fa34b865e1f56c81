/**
 * Every API path, in one place, so web and api cannot drift apart.
 * All live under /api/v1 except health.
 */
export const API_PREFIX = "/api/v1";

export const apiPaths = {
  health: "/api/health",
  session: `${API_PREFIX}/session`,
  accounts: `${API_PREFIX}/accounts`,
  emailVerification: `${API_PREFIX}/email-verification`,
  emailVerificationResend: `${API_PREFIX}/email-verification/resend`,
  passwordResetRequests: `${API_PREFIX}/password-reset-requests`,
  passwordResets: `${API_PREFIX}/password-resets`,
  yard: `${API_PREFIX}/yard`,
  yardById: (sawyerId: string) => `${API_PREFIX}/yards/${encodeURIComponent(sawyerId)}`,
  adminAccounts: `${API_PREFIX}/admin/accounts`,
} as const;

export const yardPaths = {
  logs: `${API_PREFIX}/yard/logs`,
  log: (logId: string) => `${API_PREFIX}/yard/logs/${encodeURIComponent(logId)}`,
  logReadings: (logId: string) => `${API_PREFIX}/yard/logs/${encodeURIComponent(logId)}/readings`,
  logPhotos: (logId: string) => `${API_PREFIX}/yard/logs/${encodeURIComponent(logId)}/photos`,
  logPhoto: (logId: string, photoId: string) =>
    `${API_PREFIX}/yard/logs/${encodeURIComponent(logId)}/photos/${encodeURIComponent(photoId)}`,
  logPhotoImage: (photoId: string, size: "small" | "medium" | "large") =>
    `${API_PREFIX}/log-photos/${encodeURIComponent(photoId)}/${size}.webp`,
  slabs: `${API_PREFIX}/yard/slabs`,
  slab: (slabId: string) => `${API_PREFIX}/yard/slabs/${encodeURIComponent(slabId)}`,
  slabReadings: (slabId: string) => `${API_PREFIX}/yard/slabs/${encodeURIComponent(slabId)}/readings`,
  reading: (readingId: string) => `${API_PREFIX}/yard/readings/${encodeURIComponent(readingId)}`,
  slabsCsv: `${API_PREFIX}/yard/slabs.csv`,
  slabsImport: `${API_PREFIX}/yard/slabs/import`,
  listings: `${API_PREFIX}/yard/listings`,
  listing: (listingId: string) => `${API_PREFIX}/yard/listings/${encodeURIComponent(listingId)}`,
  listingSubmit: (listingId: string) => `${API_PREFIX}/yard/listings/${encodeURIComponent(listingId)}/submit`,
  listingWithdraw: (listingId: string) => `${API_PREFIX}/yard/listings/${encodeURIComponent(listingId)}/withdraw`,
  listingPhotos: (listingId: string) => `${API_PREFIX}/yard/listings/${encodeURIComponent(listingId)}/photos`,
  listingPhotoOrder: (listingId: string) => `${API_PREFIX}/yard/listings/${encodeURIComponent(listingId)}/photo-order`,
  listingPhoto: (listingId: string, photoId: string) =>
    `${API_PREFIX}/yard/listings/${encodeURIComponent(listingId)}/photos/${encodeURIComponent(photoId)}`,
  photoImage: (photoId: string, size: "small" | "medium" | "large") => `${API_PREFIX}/photos/${encodeURIComponent(photoId)}/${size}.webp`,
  reviewQueue: `${API_PREFIX}/admin/listings`,
  reviewApprove: (listingId: string) => `${API_PREFIX}/admin/listings/${encodeURIComponent(listingId)}/approve`,
  reviewSendBack: (listingId: string) => `${API_PREFIX}/admin/listings/${encodeURIComponent(listingId)}/send-back`,
} as const;

export const cataloguePaths = {
  search: `${API_PREFIX}/catalogue`,
  detail: (listingId: string) => `${API_PREFIX}/catalogue/${encodeURIComponent(listingId)}`,
  places: `${API_PREFIX}/places`,
  /** The fees in force (public). */
  fees: `${API_PREFIX}/marketplace/fees`,
} as const;

export const orderPaths = {
  checkout: (listingId: string) => `${API_PREFIX}/listings/${encodeURIComponent(listingId)}/checkout`,
  orders: `${API_PREFIX}/orders`,
  order: (orderId: string) => `${API_PREFIX}/orders/${encodeURIComponent(orderId)}`,
  webhook: `${API_PREFIX}/payments/webhook`,
  quote: (listingId: string) => `${API_PREFIX}/listings/${encodeURIComponent(listingId)}/checkout-quote`,
  pickupWindows: (orderId: string) => `${API_PREFIX}/orders/${encodeURIComponent(orderId)}/pickup-windows`,
  pickupChoice: (orderId: string) => `${API_PREFIX}/orders/${encodeURIComponent(orderId)}/pickup-choice`,
  shipment: (orderId: string) => `${API_PREFIX}/orders/${encodeURIComponent(orderId)}/shipment`,
  handedOver: (orderId: string) => `${API_PREFIX}/orders/${encodeURIComponent(orderId)}/handed-over`,
  completion: (orderId: string) => `${API_PREFIX}/orders/${encodeURIComponent(orderId)}/completion`,
  cancellation: (orderId: string) => `${API_PREFIX}/orders/${encodeURIComponent(orderId)}/cancellation`,
} as const;

export const buyerPaths = {
  savedSearches: `${API_PREFIX}/saved-searches`,
  savedSearch: (savedSearchId: string) => `${API_PREFIX}/saved-searches/${encodeURIComponent(savedSearchId)}`,
  /** Linked from alert e-mails; works without signing in and answers a small HTML page. */
  savedSearchUnsubscribe: `${API_PREFIX}/saved-searches/unsubscribe`,
  favourites: `${API_PREFIX}/favourites`,
  favourite: (listingId: string) => `${API_PREFIX}/favourites/${encodeURIComponent(listingId)}`,
  listingMessages: (listingId: string) => `${API_PREFIX}/listings/${encodeURIComponent(listingId)}/messages`,
  threads: `${API_PREFIX}/threads`,
  thread: (threadId: string) => `${API_PREFIX}/threads/${encodeURIComponent(threadId)}`,
  threadMessages: (threadId: string) => `${API_PREFIX}/threads/${encodeURIComponent(threadId)}/messages`,
} as const;

/** Filing a report (anyone signed in). The admin desk's own paths live in admin.ts, beside its schemas. */
export const reportPaths = { reports: `${API_PREFIX}/reports` } as const;

/** Paying sawyers: their side under /yard, the admin's under /admin. */
export const payoutPaths = {
  mine: `${API_PREFIX}/yard/payouts`,
  onboarding: `${API_PREFIX}/yard/payouts/account`,
  refreshAccount: `${API_PREFIX}/yard/payouts/account/refresh`,
  statement: `${API_PREFIX}/yard/payouts/statement.csv`,
  due: `${API_PREFIX}/admin/payouts/due`,
  approve: `${API_PREFIX}/admin/payouts`,
  batch: `${API_PREFIX}/admin/payouts/batch`,
  list: `${API_PREFIX}/admin/payouts`,
  one: (payoutId: string) => `${API_PREFIX}/admin/payouts/${encodeURIComponent(payoutId)}`,
  disputeRefund: (orderId: string) => `${API_PREFIX}/admin/orders/${encodeURIComponent(orderId)}/refund`,
} as const;
