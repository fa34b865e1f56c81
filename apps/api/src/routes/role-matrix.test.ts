import { randomUUID } from "node:crypto";
import sharp from "sharp";
import { everyEndpoint, mayCall, pathOf, type EndpointKey, type EndpointSpec, type Role } from "@grainyard/contracts";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { OrderEntity, OrderReviewEntity, OutboxEmailEntity } from "../entities/index.ts";
import { unsubscribeToken } from "../services/saved-search-service.ts";
import { createTestContext, type BrowserClient, type TestContext } from "../test-support/test-context.ts";

/**
 * Who may do what, endpoint by endpoint, generated from the endpoint table in packages/contracts:
 * `samples` must hold one call for every row (the type checker refuses a row without one), and each
 * actor's expected status comes from the row itself — 401 for anonymous and 403 for a role the row
 * does not allow — or, for the actors it allows, from the sample (ownership and state decide those:
 * "sawyer" owns the things in `ids`, "otherSawyer" does not). Samples run in the order written.
 */
type ActorName = "anonymous" | "buyer" | "otherBuyer" | "sawyer" | "otherSawyer" | "admin";
/**
 * Sawyer runs last, so a sample that ends something (a delete, a withdrawal) is seen by the others first.
 * "otherBuyer" (a buyer who owns none of the things in `ids`) runs only for samples that name it in `allowed`:
 * the rows where ownership between buyers decides.
 */
const ACTOR_ORDER: ActorName[] = ["anonymous", "buyer", "otherBuyer", "otherSawyer", "admin", "sawyer"];
const ROLE_OF: Record<ActorName, Role | undefined> = {
  anonymous: undefined,
  buyer: "buyer",
  otherBuyer: "buyer",
  sawyer: "sawyer",
  otherSawyer: "sawyer",
  admin: "admin",
};

/** Things owned by "sawyer", made in beforeAll. */
interface Ids {
  sawyerId: string;
  logId: string;
  /** A log with no slabs, for the delete. */
  spareLogId: string;
  logPhotoId: string;
  spareLogPhotoId: string;
  slabId: string;
  spareSlabId: string;
  readingId: string;
  /** A draft listing of slabId with two photos (photoId, sparePhotoId). */
  listingId: string;
  photoId: string;
  sparePhotoId: string;
  photoUrl: string;
  /** A draft listing with no photo. */
  bareListingId: string;
  /** A buyer nobody signs in as: the admin suspends and restores it. */
  spareBuyerId: string;
  /** A live listing of "sawyer", a thread "buyer" started on it, two saved searches of "buyer". */
  liveListingId: string;
  threadId: string;
  savedSearchId: string;
  spareSavedSearchId: string;
  unsubscribeToken: string;
  /** Two paid pickup orders of "buyer" for "sawyer"'s draft listing. */
  pickupOrderId: string;
  orderToCancelId: string;
  /** A completed pickup order of "buyer" from "sawyer" (reviews). */
  completedOrderId: string;
  windowStart: string;
  windowEnd: string;
  /** An e-mail the outbox gave up on, for the desk's resend. */
  failedEmailId: string;
  /** A second live listing of "sawyer"; both welcome offers. */
  offerListingId: string;
  /** "buyer"'s offer on the live listing (countered, offered again, withdrawn by the samples). */
  offerId: string;
  /** "otherBuyer"'s offer on the live listing (declined by "sawyer"). */
  declineOfferId: string;
  /** "buyer"'s offer on the second live listing (accepted by "sawyer"). */
  acceptOfferId: string;
}

interface Sample {
  call: (client: BrowserClient, ids: Ids) => Promise<{ status: number }>;
  /** The status of each actor the row allows; a number for all of them; the row's success status when not given. */
  allowed?: number | Partial<Record<ActorName, number>>;
  /** Calls with a freshly signed-in client of the actor's role (signing out must not end the others' sessions). */
  freshClient?: true;
}

const none = "00000000-0000-4000-8000-000000000000";
const reviewBody = { rating: 5, matchedListing: true, handoverWentWell: true, body: "Matrix review." };
/** The completed order's review (written by "buyer" in its sample). */
const reviewIdOf = async (ids: Ids) =>
  (await ctx.dataSource.getRepository(OrderReviewEntity).findOneByOrFail({ orderId: ids.completedOrderId })).id;
const phonePhoto = () =>
  sharp({ create: { width: 640, height: 480, channels: 3, background: "#8a5a32" } })
    .jpeg()
    .toBuffer();
const sendPhoto = async (c: BrowserClient, path: string) =>
  c.agent
    .post(path)
    .set("x-csrf-token", c.csrfToken)
    .set("content-type", "image/jpeg")
    .send(await phonePhoto());
const slabBody = (logId: string, sequenceInLog: number) => ({
  logId,
  sequenceInLog,
  speciesSlug: "northern-red-oak",
  lengthMm: 2000,
  thicknessMm: 50,
  widthStationsMm: [500, 480],
  liveEdge: "one",
  surfacing: "rough_sawn",
  dryingMethod: "air",
});

const samples: Record<EndpointKey, Sample> = {
  "health.health": { call: (c) => c.get("/api/health") },
  "health.serving": { call: (c) => c.get("/api/health/serving") },

  "accounts.getSession": { call: (c) => c.get("/api/v1/session") },
  "accounts.signIn": {
    call: (c) => c.post("/api/v1/session", { email: `nobody-${randomUUID()}@lakemont.test`, password: "not-the-password" }),
    allowed: 401,
  },
  "accounts.signOut": { call: (c) => c.delete("/api/v1/session"), freshClient: true },
  "accounts.signUp": {
    call: (c) =>
      c.post("/api/v1/accounts", {
        role: "buyer",
        email: `m-${randomUUID().slice(0, 8)}@lakemont.test`,
        password: "matrix-password-ok",
        displayName: "Matrix",
      }),
    allowed: { anonymous: 202, buyer: 409, sawyer: 409, otherSawyer: 409, admin: 409 },
  },
  "accounts.verifyEmail": { call: (c) => c.post("/api/v1/email-verification", { token: "a".repeat(43) }), allowed: 422 },
  // Every seeded test account is verified already.
  "accounts.resendVerification": { call: (c) => c.post("/api/v1/email-verification/resend"), allowed: 409 },
  "accounts.requestPasswordReset": {
    call: (c) => c.post("/api/v1/password-reset-requests", { email: `nobody-${randomUUID()}@lakemont.test` }),
  },
  "accounts.resetPassword": {
    call: (c) => c.post("/api/v1/password-resets", { token: "a".repeat(43), password: "matrix-new-password" }),
    allowed: 422,
  },
  "accounts.getOwnYard": { call: (c) => c.get("/api/v1/yard") },
  "accounts.updateYard": {
    call: (c, ids) => c.patch(`/api/v1/yards/${ids.sawyerId}`, { pickupTown: "Northshore" }),
    allowed: { sawyer: 200, otherSawyer: 403, admin: 200 },
  },

  // No password step came first: the code step has nothing to finish.
  "secondFactor.signInSecondStep": { call: (c) => c.post("/api/v1/session/second-factor", { code: "123456" }), allowed: 401 },
  "secondFactor.getSecondFactor": { call: (c) => c.get("/api/v1/account/second-factor") },
  // Test admins have theirs on already (test-support); the sawyers start one.
  "secondFactor.startSecondFactorSetUp": {
    call: (c) => c.post("/api/v1/account/second-factor/set-up"),
    allowed: { sawyer: 200, otherSawyer: 200, admin: 409 },
  },
  "secondFactor.confirmSecondFactor": {
    call: (c) => c.post("/api/v1/account/second-factor", { code: "000000" }),
    allowed: { sawyer: 422, otherSawyer: 422, admin: 409 },
  },
  "secondFactor.removeSecondFactor": {
    call: (c) => c.post("/api/v1/account/second-factor/removal", { password: "not-the-password", code: "000000" }),
    allowed: { sawyer: 409, otherSawyer: 409, admin: 422 },
  },

  "yard.listLogs": { call: (c) => c.get("/api/v1/yard/logs") },
  "yard.createLog": {
    call: (c) =>
      c.post("/api/v1/yard/logs", { speciesSlug: "white-oak", siteTown: "Lakemont", siteKind: "street", fellingReason: "pests" }),
  },
  "yard.getLog": { call: (c, ids) => c.get(`/api/v1/yard/logs/${ids.logId}`), allowed: { sawyer: 200, otherSawyer: 403 } },
  "yard.updateLog": {
    call: (c, ids) => c.patch(`/api/v1/yard/logs/${ids.logId}`, { notes: "Checked by the matrix" }),
    allowed: { sawyer: 200, otherSawyer: 403 },
  },
  "yard.deleteLog": { call: (c, ids) => c.delete(`/api/v1/yard/logs/${ids.spareLogId}`), allowed: { sawyer: 204, otherSawyer: 403 } },
  "yard.recordLogReadings": {
    call: (c, ids) =>
      c.post(`/api/v1/yard/logs/${ids.logId}/readings`, { readOn: "2025-06-01", moistureContentPct: 18, method: "pin_meter" }),
    allowed: { sawyer: 201, otherSawyer: 403 },
  },
  "yard.uploadLogPhoto": {
    call: (c, ids) => sendPhoto(c, `/api/v1/yard/logs/${ids.logId}/photos`),
    allowed: { sawyer: 201, otherSawyer: 403 },
  },
  // The log has a live slab, so its photos are public.
  "yard.logPhotoImage": { call: (c, ids) => c.get(`/api/v1/log-photos/${ids.logPhotoId}/small.webp`) },
  "yard.deleteLogPhoto": {
    call: (c, ids) => c.delete(`/api/v1/yard/logs/${ids.logId}/photos/${ids.spareLogPhotoId}`),
    allowed: { sawyer: 204, otherSawyer: 403 },
  },
  "yard.exportSlabsCsv": { call: (c) => c.get("/api/v1/yard/slabs.csv") },
  "yard.importSlabsCsv": {
    call: (c) => c.agent.post("/api/v1/yard/slabs/import").set("x-csrf-token", c.csrfToken).set("content-type", "text/csv").send(""),
    allowed: 422,
  },
  "yard.listSlabs": { call: (c) => c.get("/api/v1/yard/slabs") },
  "yard.createSlab": { call: (c, ids) => c.post("/api/v1/yard/slabs", slabBody(ids.logId, 9)), allowed: { sawyer: 201, otherSawyer: 403 } },
  "yard.getSlab": { call: (c, ids) => c.get(`/api/v1/yard/slabs/${ids.slabId}`), allowed: { sawyer: 200, otherSawyer: 403 } },
  "yard.updateSlab": {
    call: (c, ids) => c.patch(`/api/v1/yard/slabs/${ids.slabId}`, { notes: "Checked by the matrix" }),
    allowed: { sawyer: 200, otherSawyer: 403 },
  },
  "yard.addReading": {
    call: (c, ids) =>
      c.post(`/api/v1/yard/slabs/${ids.slabId}/readings`, { readOn: "2025-07-01", moistureContentPct: 15, method: "pin_meter" }),
    allowed: { sawyer: 201, otherSawyer: 403 },
  },
  "yard.deleteReading": {
    call: (c, ids) => c.delete(`/api/v1/yard/readings/${ids.readingId}`),
    allowed: { sawyer: 204, otherSawyer: 403 },
  },
  "yard.deleteSlab": { call: (c, ids) => c.delete(`/api/v1/yard/slabs/${ids.spareSlabId}`), allowed: { sawyer: 204, otherSawyer: 403 } },

  "listings.listOwnListings": { call: (c) => c.get("/api/v1/yard/listings") },
  "listings.createListing": { call: (c) => c.post("/api/v1/yard/listings", {}), allowed: 422 },
  "listings.getOwnListing": {
    call: (c, ids) => c.get(`/api/v1/yard/listings/${ids.listingId}`),
    allowed: { sawyer: 200, otherSawyer: 403, admin: 200 },
  },
  "listings.updateListing": {
    call: (c, ids) => c.patch(`/api/v1/yard/listings/${ids.listingId}`, { description: "Checked by the matrix" }),
    allowed: { sawyer: 200, otherSawyer: 403 },
  },
  "listings.submitListing": {
    call: (c, ids) => c.post(`/api/v1/yard/listings/${ids.bareListingId}/submit`),
    allowed: { sawyer: 422, otherSawyer: 403 },
  },
  "listings.setPhotoAltText": {
    call: (c, ids) => c.patch(`/api/v1/yard/listings/${ids.listingId}/photos/${ids.photoId}`, { altText: "The whole slab from above" }),
    allowed: { sawyer: 200, otherSawyer: 403 },
  },
  "listings.setPhotoOrder": {
    call: (c, ids) =>
      c.agent
        .put(`/api/v1/yard/listings/${ids.listingId}/photo-order`)
        .set("x-csrf-token", c.csrfToken)
        .send({ photoIds: [ids.sparePhotoId, ids.photoId] }),
    allowed: { sawyer: 200, otherSawyer: 403 },
  },
  "listings.deleteListingPhoto": {
    call: (c, ids) => c.delete(`/api/v1/yard/listings/${ids.listingId}/photos/${ids.sparePhotoId}`),
    allowed: { sawyer: 204, otherSawyer: 403 },
  },
  "listings.uploadListingPhoto": {
    call: (c, ids) => sendPhoto(c, `/api/v1/yard/listings/${ids.listingId}/photos`),
    allowed: { sawyer: 201, otherSawyer: 403 },
  },
  // The listing is a draft: its photos are for its sawyer and the admins.
  "listings.listingPhotoImage": {
    call: (c, ids) => c.get(ids.photoUrl),
    allowed: { anonymous: 404, buyer: 404, sawyer: 200, otherSawyer: 404, admin: 200 },
  },

  "review.reviewDesk": { call: (c) => c.get("/api/v1/admin/review-desk") },
  "review.reviewHistory": { call: (c, ids) => c.get(`/api/v1/admin/listings/${ids.listingId}/reviews`) },
  "review.approveListing": { call: (c, ids) => c.post(`/api/v1/admin/listings/${ids.listingId}/approve`), allowed: 409 },
  "review.sendBackListing": {
    call: (c, ids) => c.post(`/api/v1/admin/listings/${ids.listingId}/send-back`, { reason: "Matrix asks for a photo of the end grain." }),
    allowed: 409,
  },
  "review.rejectListing": {
    call: (c, ids) => c.post(`/api/v1/admin/listings/${ids.listingId}/reject`, { reason: "Matrix says no." }),
    allowed: 409,
  },

  "catalogue.searchCatalogue": { call: (c) => c.get("/api/v1/catalogue?species=northern-red-oak") },
  "catalogue.getCatalogueListing": { call: (c, ids) => c.get(`/api/v1/catalogue/${ids.liveListingId}`) },
  "catalogue.speciesCounts": { call: (c) => c.get("/api/v1/species-counts") },
  "catalogue.findPlaces": { call: (c) => c.get("/api/v1/places?query=Lake") },
  "catalogue.getMarketplaceFees": { call: (c) => c.get("/api/v1/marketplace/fees") },

  "buyer.listSavedSearches": { call: (c) => c.get("/api/v1/saved-searches") },
  "buyer.saveSearch": { call: (c) => c.post("/api/v1/saved-searches", { name: "Matrix walnut", query: "species=black-walnut" }) },
  "buyer.updateSavedSearch": {
    call: (c, ids) => c.patch(`/api/v1/saved-searches/${ids.savedSearchId}`, { name: "Renamed by the matrix" }),
  },
  "buyer.deleteSavedSearch": { call: (c, ids) => c.delete(`/api/v1/saved-searches/${ids.spareSavedSearchId}`) },
  "buyer.unsubscribeSavedSearch": {
    call: (c, ids) => c.get(`/api/v1/saved-searches/unsubscribe?token=${encodeURIComponent(ids.unsubscribeToken)}`),
  },
  "buyer.addFavourite": {
    call: (c, ids) => c.agent.put(`/api/v1/favourites/${ids.liveListingId}`).set("x-csrf-token", c.csrfToken),
  },
  "buyer.listFavourites": { call: (c) => c.get("/api/v1/favourites") },
  "buyer.removeFavourite": { call: (c, ids) => c.delete(`/api/v1/favourites/${ids.liveListingId}`) },

  "messages.askAboutListing": {
    call: (c, ids) => c.post(`/api/v1/listings/${ids.liveListingId}/messages`, { body: "Asked by the matrix" }),
    allowed: { buyer: 201, sawyer: 403, otherSawyer: 201 },
  },
  "messages.listThreads": { call: (c) => c.get("/api/v1/threads") },
  "messages.getThread": {
    call: (c, ids) => c.get(`/api/v1/threads/${ids.threadId}`),
    allowed: { buyer: 200, sawyer: 200, otherSawyer: 403, admin: 200 },
  },
  "messages.replyInThread": {
    call: (c, ids) => c.post(`/api/v1/threads/${ids.threadId}/messages`, { body: "Answered in the matrix" }),
    allowed: { buyer: 201, sawyer: 201, otherSawyer: 403 },
  },

  "reports.fileReport": {
    call: (c, ids) => c.post("/api/v1/reports", { targetKind: "listing", targetId: ids.liveListingId, reason: "Reported by the matrix." }),
    allowed: { buyer: 201, sawyer: 422, otherSawyer: 201, admin: 201 },
  },

  "admin.searchAudit": { call: (c) => c.get("/api/v1/admin/audit") },
  "admin.exportAuditCsv": { call: (c) => c.get("/api/v1/admin/audit.csv") },
  "admin.listReports": { call: (c) => c.get("/api/v1/admin/reports") },
  "admin.resolveReport": {
    call: (c) => c.post(`/api/v1/admin/reports/${none}/resolve`, { resolution: "dismiss", note: "Matrix resolves." }),
    allowed: 404,
  },
  "admin.listOrderProblems": { call: (c) => c.get("/api/v1/admin/order-problems") },
  "admin.resolveOrderProblem": {
    call: (c) => c.post(`/api/v1/admin/order-problems/${none}/resolve`, { resolution: "release", note: "Matrix releases." }),
    allowed: 404,
  },
  "admin.searchUsers": { call: (c) => c.get("/api/v1/admin/users") },
  "admin.getUser": { call: (c, ids) => c.get(`/api/v1/admin/users/${ids.sawyerId}`) },
  "admin.suspendUser": { call: (c, ids) => c.post(`/api/v1/admin/users/${ids.spareBuyerId}/suspend`, { reason: "Matrix suspends." }) },
  "admin.restoreUser": { call: (c, ids) => c.post(`/api/v1/admin/users/${ids.spareBuyerId}/restore`, { reason: "Matrix restores." }) },
  "admin.getSettings": { call: (c) => c.get("/api/v1/admin/settings") },
  "admin.updateSettings": { call: (c) => c.patch("/api/v1/admin/settings", { holdDays: 7, reason: "Matrix keeps seven days." }) },
  "admin.getDashboard": { call: (c) => c.get("/api/v1/admin/dashboard") },
  "admin.listOutbox": { call: (c) => c.get("/api/v1/admin/outbox?status=failed") },
  "admin.resendEmail": { call: (c, ids) => c.post(`/api/v1/admin/outbox/${ids.failedEmailId}/resend`) },

  "payouts.myPayouts": { call: (c) => c.get("/api/v1/yard/payouts") },
  "payouts.startPayoutSetup": { call: (c) => c.post("/api/v1/yard/payouts/account") },
  "payouts.refreshPayoutAccount": { call: (c) => c.post("/api/v1/yard/payouts/account/refresh") },
  "payouts.statementCsv": { call: (c) => c.get("/api/v1/yard/payouts/statement.csv") },
  "payouts.myPayout": { call: (c) => c.get(`/api/v1/yard/payouts/${randomUUID()}`), allowed: 404 },
  "payouts.payoutsDue": { call: (c) => c.get("/api/v1/admin/payouts/due") },
  // A sawyer with no payout account.
  "payouts.approvePayout": {
    call: (c) => c.post("/api/v1/admin/payouts", { sawyerId: randomUUID(), currency: "USD", dueKey: "matrix" }),
    allowed: 409,
  },
  "payouts.approvePayoutBatch": {
    call: (c) => c.post("/api/v1/admin/payouts/batch", { payouts: [{ sawyerId: randomUUID(), currency: "USD", dueKey: "matrix" }] }),
  },
  "payouts.listPayouts": { call: (c) => c.get("/api/v1/admin/payouts") },
  "payouts.getPayout": { call: (c) => c.get(`/api/v1/admin/payouts/${randomUUID()}`), allowed: 404 },
  "payouts.disputeRefundState": { call: (c) => c.get(`/api/v1/admin/orders/${randomUUID()}/refund`), allowed: 404 },
  "payouts.disputeRefund": {
    call: (c) => c.post(`/api/v1/admin/orders/${randomUUID()}/refund`, { amountMinor: 100, reason: "Matrix refunds." }),
    allowed: 404,
  },

  // Orders: the steps run in order (windows → choice → hand-over → completion); the second order is cancelled.
  "orders.getCheckoutQuote": { call: (c, ids) => c.get(`/api/v1/listings/${ids.liveListingId}/checkout-quote`) },
  "orders.checkout": { call: (c, ids) => c.post(`/api/v1/listings/${ids.listingId}/checkout`, { handover: "pickup" }), allowed: 409 },
  "orders.listOrders": { call: (c) => c.get("/api/v1/orders") },
  "orders.searchOrders": { call: (c) => c.get("/api/v1/admin/orders?q=matrix&limit=5") },
  "orders.getOrder": {
    call: (c, ids) => c.get(`/api/v1/orders/${ids.pickupOrderId}`),
    allowed: { buyer: 200, sawyer: 200, otherSawyer: 403, admin: 200 },
  },
  "orders.proposePickupWindows": {
    call: (c, ids) =>
      c.post(`/api/v1/orders/${ids.pickupOrderId}/pickup-windows`, {
        windows: [{ startsAt: ids.windowStart, endsAt: ids.windowEnd }],
        pickupAddress: "Matrix yard gate",
      }),
    allowed: { sawyer: 200, otherSawyer: 403 },
  },
  "orders.choosePickupWindow": {
    call: (c, ids) => c.post(`/api/v1/orders/${ids.pickupOrderId}/pickup-choice`, { startsAt: ids.windowStart }),
  },
  // A pickup order cannot be shipped: 409 for its own sawyer.
  "orders.markShipped": {
    call: (c, ids) => c.post(`/api/v1/orders/${ids.pickupOrderId}/shipment`, { carrier: "Matrix Freight", trackingReference: "MTX-1" }),
    allowed: { sawyer: 409, otherSawyer: 403 },
  },
  "orders.markHandedOver": {
    call: (c, ids) => c.post(`/api/v1/orders/${ids.pickupOrderId}/handed-over`, { reason: "Collected before the booked time." }),
    allowed: { sawyer: 200, otherSawyer: 403 },
  },
  "orders.confirmReceipt": { call: (c, ids) => c.post(`/api/v1/orders/${ids.pickupOrderId}/completion`) },
  // The buyer confirmed receipt just before, so the problem comes too late (409); order-problems.test.ts reports one.
  "orders.reportProblem": {
    call: (c, ids) =>
      c.post(`/api/v1/orders/${ids.pickupOrderId}/problem`, { kind: "not_as_described", comment: "Matrix says it is not as described." }),
    allowed: { buyer: 409 },
  },
  // The buyer cancels first (200); the sawyer then finds it cancelled already (409).
  "orders.cancelOrder": {
    call: (c, ids) => c.post(`/api/v1/orders/${ids.orderToCancelId}/cancellation`, { reason: "Matrix cancels" }),
    allowed: { buyer: 200, sawyer: 409, otherSawyer: 403 },
  },
  // Reviews of the completed order: "buyer" writes and edits it, "sawyer" answers, the admin hides and shows it.
  "orderReviews.getOrderReview": {
    call: (c, ids) => c.get(`/api/v1/orders/${ids.completedOrderId}/review`),
    allowed: { buyer: 200, otherBuyer: 403, sawyer: 200, otherSawyer: 403, admin: 200 },
  },
  "orderReviews.writeReview": {
    call: (c, ids) => c.post(`/api/v1/orders/${ids.completedOrderId}/review`, reviewBody),
    allowed: { buyer: 201, otherBuyer: 403 },
  },
  "orderReviews.editReview": {
    call: (c, ids) => c.patch(`/api/v1/orders/${ids.completedOrderId}/review`, { ...reviewBody, rating: 4 }),
    allowed: { buyer: 200, otherBuyer: 403 },
  },
  "orderReviews.answerReview": {
    call: (c, ids) => c.post(`/api/v1/orders/${ids.completedOrderId}/review/answer`, { body: "Matrix thanks you." }),
    allowed: { sawyer: 201, otherSawyer: 403 },
  },
  "orderReviews.yardReviews": { call: (c, ids) => c.get(`/api/v1/yards/${ids.sawyerId}/reviews`), allowed: { otherBuyer: 200 } },
  "yardPages.getYardPage": {
    call: async (c, ids) => {
      const [yard] = (await ctx.dataSource.query("SELECT yard_slug FROM account WHERE id = ?", [ids.sawyerId])) as { yard_slug: string }[];
      return c.get(`/api/v1/yard-pages/${yard!.yard_slug}`);
    },
    allowed: { otherBuyer: 200 },
  },
  "orderReviews.listReviews": { call: (c) => c.get("/api/v1/admin/order-reviews") },
  "orderReviews.hideReview": {
    call: async (c, ids) => c.post(`/api/v1/admin/order-reviews/${await reviewIdOf(ids)}/hide`, { reason: "Matrix hides it." }),
  },
  "orderReviews.showReview": {
    call: async (c, ids) => c.post(`/api/v1/admin/order-reviews/${await reviewIdOf(ids)}/show`, { reason: "Matrix shows it again." }),
  },

  // Offers: "sawyer"'s two live listings welcome them; "buyer" and "otherBuyer" made one each in beforeAll.
  "offers.getOfferSettings": {
    call: (c, ids) => c.get(`/api/v1/yard/listings/${ids.liveListingId}/offer-settings`),
    allowed: { sawyer: 200, otherSawyer: 403 },
  },
  "offers.setOfferSettings": {
    call: (c, ids) => c.put(`/api/v1/yard/listings/${ids.liveListingId}/offer-settings`, { offersWelcome: true, floorMinor: 1_000 }),
    allowed: { sawyer: 200, otherSawyer: 403 },
  },
  // "buyer" has an offer waiting on the second listing already; "otherBuyer" makes theirs.
  "offers.makeOffer": {
    call: (c, ids) => c.post(`/api/v1/listings/${ids.offerListingId}/offers`, { amountMinor: 15_000, handover: "pickup" }),
    allowed: { buyer: 409, otherBuyer: 201 },
  },
  "offers.listOffers": { call: (c) => c.get("/api/v1/offers"), allowed: { buyer: 200, otherBuyer: 200, sawyer: 200, otherSawyer: 200 } },
  "offers.getOffer": {
    call: (c, ids) => c.get(`/api/v1/offers/${ids.offerId}`),
    allowed: { buyer: 200, otherBuyer: 403, sawyer: 200, otherSawyer: 403 },
  },
  "offers.counterOffer": {
    call: (c, ids) => c.post(`/api/v1/offers/${ids.offerId}/counter`, { amountMinor: 18_000, message: "Meet me nearer." }),
    allowed: { sawyer: 200, otherSawyer: 403 },
  },
  "offers.offerAgain": {
    call: (c, ids) => c.post(`/api/v1/offers/${ids.offerId}/offer-again`, { amountMinor: 16_000 }),
    allowed: { buyer: 200, otherBuyer: 403 },
  },
  // Offered again, the offer waits on the sawyer: there is no counter to accept.
  "offers.acceptCounter": {
    call: (c, ids) => c.post(`/api/v1/offers/${ids.offerId}/accept-counter`),
    allowed: { buyer: 409, otherBuyer: 403 },
  },
  "offers.declineOffer": {
    call: (c, ids) => c.post(`/api/v1/offers/${ids.declineOfferId}/decline`, { message: "Not this time." }),
    allowed: { sawyer: 200, otherSawyer: 403 },
  },
  "offers.acceptOffer": {
    call: (c, ids) => c.post(`/api/v1/offers/${ids.acceptOfferId}/accept`),
    allowed: { sawyer: 200, otherSawyer: 403 },
  },
  "offers.withdrawOffer": {
    call: (c, ids) => c.post(`/api/v1/offers/${ids.offerId}/withdraw`),
    allowed: { buyer: 200, otherBuyer: 403 },
  },

  // No signature: refused whoever sends it.
  "orders.paymentWebhook": { call: (c) => c.post("/api/v1/payments/webhook", { id: "evt_matrix" }), allowed: 400 },

  // The yard's draft listing ends last.
  "listings.withdrawListing": {
    call: (c, ids) => c.post(`/api/v1/yard/listings/${ids.listingId}/withdraw`),
    allowed: { sawyer: 200, otherSawyer: 403 },
  },

  // The movable clock exists only on the end-to-end stack: not here.
  "testClock.getTestClock": { call: (c) => c.get("/api/_test/clock"), allowed: 404 },
  "testClock.moveTestClock": { call: (c) => c.post("/api/_test/clock", { advanceDays: 1 }), allowed: 404 },
};

const specOf = new Map(everyEndpoint().map(({ key, spec }) => [key, spec]));
/** Whether an actor runs for a sample: everyone but "otherBuyer", who runs only where the sample names them. */
const runsFor = (sample: Sample, actor: ActorName) =>
  actor !== "otherBuyer" || (typeof sample.allowed === "object" && sample.allowed.otherBuyer !== undefined);

/** The status `actor` must get from the row `spec` with this sample. */
function expectedStatus(spec: EndpointSpec, sample: Sample, actor: ActorName): number {
  const role = ROLE_OF[actor];
  if (!mayCall(spec.access, role)) return role ? 403 : 401;
  const allowed = typeof sample.allowed === "number" ? sample.allowed : sample.allowed?.[actor];
  return allowed ?? spec.status ?? 200;
}

let ctx: TestContext;
const clients = {} as Record<ActorName, BrowserClient>;
const ids = {} as Ids;

async function freshClientFor(actor: ActorName): Promise<BrowserClient> {
  const role = ROLE_OF[actor];
  return role ? ctx.signedInClient(role) : ctx.client();
}

beforeAll(async () => {
  ctx = await createTestContext({ environment: { SIGN_IN_LIMIT_PER_IP: "1000", RESET_LIMIT_PER_IP: "1000" } });
  clients.anonymous = await ctx.client();
  clients.buyer = await ctx.signedInClient("buyer");
  clients.otherBuyer = await ctx.signedInClient("buyer");
  const sawyer = await ctx.signedInClient("sawyer");
  clients.sawyer = sawyer;
  ids.sawyerId = sawyer.account.id;
  clients.otherSawyer = await ctx.signedInClient("sawyer");
  clients.admin = await ctx.signedInClient("admin");
  ids.spareBuyerId = (await ctx.createAccount("buyer")).id;
  const log = { speciesSlug: "northern-red-oak", siteTown: "Lakemont", siteKind: "street", fellingReason: "pests" };
  ids.logId = (await sawyer.post("/api/v1/yard/logs", log)).body.log.id;
  ids.spareLogId = (await sawyer.post("/api/v1/yard/logs", log)).body.log.id;
  ids.logPhotoId = (await sendPhoto(sawyer, `/api/v1/yard/logs/${ids.logId}/photos`)).body.photo.id;
  ids.spareLogPhotoId = (await sendPhoto(sawyer, `/api/v1/yard/logs/${ids.logId}/photos`)).body.photo.id;
  ids.slabId = (await sawyer.post("/api/v1/yard/slabs", slabBody(ids.logId, 1))).body.slab.id;
  ids.spareSlabId = (await sawyer.post("/api/v1/yard/slabs", slabBody(ids.logId, 3))).body.slab.id;
  ids.readingId = (
    await sawyer.post(`/api/v1/yard/slabs/${ids.slabId}/readings`, { readOn: "2025-05-01", moistureContentPct: 22, method: "pin_meter" })
  ).body.reading.id;
  ids.listingId = (
    await sawyer.post("/api/v1/yard/listings", { title: "Matrix oak", slabIds: [ids.slabId], priceMode: "fixed", rateMinor: 20_000 })
  ).body.listing.id;
  const uploaded = await sendPhoto(sawyer, `/api/v1/yard/listings/${ids.listingId}/photos`);
  ids.photoId = uploaded.body.photo.id;
  ids.photoUrl = uploaded.body.photo.smallUrl;
  ids.sparePhotoId = (await sendPhoto(sawyer, `/api/v1/yard/listings/${ids.listingId}/photos`)).body.photo.id;
  const bareSlab = (await sawyer.post("/api/v1/yard/slabs", slabBody(ids.logId, 4))).body.slab.id;
  ids.bareListingId = (
    await sawyer.post("/api/v1/yard/listings", { title: "Matrix bare oak", slabIds: [bareSlab], priceMode: "fixed", rateMinor: 20_000 })
  ).body.listing.id;

  // A second slab listed, submitted and approved, so it is live.
  const liveSlab = (await sawyer.post("/api/v1/yard/slabs", slabBody(ids.logId, 2))).body.slab.id;
  ids.liveListingId = (
    await sawyer.post("/api/v1/yard/listings", { title: "Matrix live oak", slabIds: [liveSlab], priceMode: "fixed", rateMinor: 20_000 })
  ).body.listing.id;
  await sendPhoto(sawyer, `/api/v1/yard/listings/${ids.liveListingId}/photos`);
  await sawyer.post(`/api/v1/yard/listings/${ids.liveListingId}/submit`);
  if ((await clients.admin.post(`/api/v1/admin/listings/${ids.liveListingId}/approve`)).status !== 200)
    throw new Error("matrix: the live listing was not approved");
  ids.threadId = (await clients.buyer.post(`/api/v1/listings/${ids.liveListingId}/messages`, { body: "Matrix question" })).body.thread.id;
  ids.savedSearchId = (
    await clients.buyer.post("/api/v1/saved-searches", { name: "Matrix oak", query: "species=northern-red-oak" })
  ).body.savedSearch.id;
  ids.spareSavedSearchId = (
    await clients.buyer.post("/api/v1/saved-searches", { name: "Matrix spare", query: "species=white-oak" })
  ).body.savedSearch.id;
  ids.unsubscribeToken = unsubscribeToken(ctx.config.sessionSecret, ids.savedSearchId);

  // Two paid pickup orders of "buyer" for "sawyer"'s draft listing (the money side is checkout.test.ts's).
  const buyerId = ((await clients.buyer.get("/api/v1/session")).body.account as { id: string }).id;
  ids.pickupOrderId = randomUUID();
  ids.orderToCancelId = randomUUID();
  ids.completedOrderId = randomUUID();
  for (const id of [ids.pickupOrderId, ids.orderToCancelId, ids.completedOrderId]) {
    await ctx.dataSource.getRepository(OrderEntity).insert({
      id,
      buyerId,
      sawyerId: ids.sawyerId,
      listingId: ids.listingId,
      status: "paid",
      title: "Matrix oak",
      slabSnapshot: [],
      currency: "USD",
      priceMinor: 20_000,
      platformFeeMinor: 2_000,
      processingFeeMinor: 610,
      sawyerNetMinor: 17_390,
      taxMinor: 0,
      totalMinor: 20_000,
      handover: "pickup",
      deliveryAddress: null,
      checkoutSessionId: null,
      checkoutUrl: null,
      paymentIntentId: null,
      reservedUntil: new Date(),
      paidAt: new Date(),
      ...(id === ids.completedOrderId
        ? { status: "completed" as const, handedOverAt: new Date(), completedAt: new Date(), completedBy: "buyer" as const }
        : {}),
    });
  }
  ids.windowStart = new Date(Date.now() + 2 * 86_400_000).toISOString();
  ids.windowEnd = new Date(Date.now() + 2 * 86_400_000 + 7_200_000).toISOString();
  const failed = await ctx.dataSource.getRepository(OutboxEmailEntity).insert({
    kind: "message_notice",
    recipient: "nobody@lakemont.test",
    subject: "Matrix notice",
    textBody: "Matrix",
    htmlBody: null,
    status: "failed",
    attempts: 8,
    nextAttemptAt: new Date(),
    lastError: "The mail server could not be reached.",
  });
  ids.failedEmailId = String(failed.identifiers[0]!.id);

  // Offers: a second live listing; both welcome offers; "buyer" offers on each, "otherBuyer" on the first.
  const offerSlab = (await sawyer.post("/api/v1/yard/slabs", slabBody(ids.logId, 5))).body.slab.id;
  ids.offerListingId = (
    await sawyer.post("/api/v1/yard/listings", { title: "Matrix offer oak", slabIds: [offerSlab], priceMode: "fixed", rateMinor: 20_000 })
  ).body.listing.id;
  await sendPhoto(sawyer, `/api/v1/yard/listings/${ids.offerListingId}/photos`);
  await sawyer.post(`/api/v1/yard/listings/${ids.offerListingId}/submit`);
  if ((await clients.admin.post(`/api/v1/admin/listings/${ids.offerListingId}/approve`)).status !== 200)
    throw new Error("matrix: the offer listing was not approved");
  for (const listingId of [ids.liveListingId, ids.offerListingId])
    await sawyer.put(`/api/v1/yard/listings/${listingId}/offer-settings`, { offersWelcome: true });
  const offer = async (client: BrowserClient, listingId: string) => {
    const made = await client.post(`/api/v1/listings/${listingId}/offers`, { amountMinor: 14_000, handover: "pickup" });
    if (made.status !== 201) throw new Error(`matrix: offer not made: ${JSON.stringify(made.body)}`);
    return made.body.offer.id as string;
  };
  ids.offerId = await offer(clients.buyer, ids.liveListingId);
  ids.declineOfferId = await offer(clients.otherBuyer, ids.liveListingId);
  ids.acceptOfferId = await offer(clients.buyer, ids.offerListingId);
}, 60_000);
afterAll(async () => ctx?.close());

describe("role and ownership matrix, from the endpoint table", () => {
  it("has a sample for every row and no sample without a row", () => {
    expect(new Set(Object.keys(samples))).toEqual(new Set(specOf.keys()));
  });

  for (const [key, sample] of Object.entries(samples) as [EndpointKey, Sample][]) {
    const spec = specOf.get(key)!;
    for (const actor of ACTOR_ORDER.filter((name) => runsFor(sample, name))) {
      const status = expectedStatus(spec, sample, actor);
      it(`${key} (${spec.method} ${spec.path}) as ${actor} → ${status}`, async () => {
        const client = sample.freshClient ? await freshClientFor(actor) : clients[actor];
        const res = await sample.call(client, ids);
        expect(res.status).toBe(status);
      });
    }
  }

  it("a sawyer's change to their own yard is saved; another sawyer's attempt changes nothing", async () => {
    const own = await clients.sawyer.patch(`/api/v1/yards/${ids.sawyerId}`, { yardName: "Renamed Yard" });
    expect(own.body.account.yardName).toBe("Renamed Yard");
    await clients.otherSawyer.patch(`/api/v1/yards/${ids.sawyerId}`, { yardName: "Hijacked" });
    expect((await clients.sawyer.get("/api/v1/yard")).body.account.yardName).toBe("Renamed Yard");
  });

  it("the desk's people search finds a sawyer by yard name and filters by role", async () => {
    const res = await clients.admin.get("/api/v1/admin/users?query=Renamed&role=sawyer");
    expect(res.status).toBe(200);
    expect(res.body.users.map((u: { account: { id: string } }) => u.account.id)).toEqual([ids.sawyerId]);
    expect((await clients.admin.get("/api/v1/admin/users?role=wizard")).status).toBe(422);
  });

  it("every route the app answers is a row of the table, and every row's path fills in", () => {
    const registered = registeredRoutes(ctx.app);
    const rows = new Set(everyEndpoint().map(({ spec }) => `${spec.method} ${spec.path}`));
    const outside = registered.filter((r) => r.path.startsWith("/api") && !rows.has(`${r.method} ${r.path}`));
    expect(outside).toEqual([]);
    // Outside the end-to-end stack, every row but the test clock's is mounted.
    const mounted = new Set(registered.map((r) => `${r.method} ${r.path}`));
    const missing = everyEndpoint().filter(({ spec }) => !spec.testOnly && !mounted.has(`${spec.method} ${spec.path}`));
    expect(missing).toEqual([]);
    expect(pathOf(specOf.get("listings.setPhotoAltText")!, { listingId: "a b", photoId: "c/d" })).toBe(
      "/api/v1/yard/listings/a%20b/photos/c%2Fd",
    );
  });
});

/**
 * Who is asking is checked before what they sent: a caller the row does not allow gets 401/403
 * even with input that fails the row's schemas, so field names and rules never reach them. Each
 * row with a JSON body or a query schema gets input that fails it (a JSON array for the body, every
 * query field given twice); an actor the row allows gets 422 for the same input, which shows the
 * input really is invalid.
 */
describe("the role check comes before validation, on every row with input", () => {
  const invalidCall = (spec: EndpointSpec) => {
    const path = pathOf(spec, Object.fromEntries((spec.path.match(/:(\w+)/g) ?? []).map((name) => [name.slice(1), none])));
    const shape = spec.query ? ((spec.query as unknown as { shape?: Record<string, unknown> }).shape ?? {}) : null;
    const query = shape
      ? Object.keys(shape)
          .flatMap((key) => [`${key}=%00`, `${key}=%00`])
          .join("&")
      : "";
    const method = spec.method.toLowerCase() as "get" | "post" | "patch" | "put" | "delete";
    return (client: BrowserClient) => {
      const req = client.agent[method](query ? `${path}?${query}` : path).set("x-csrf-token", client.csrfToken);
      return typeof spec.body === "object" ? req.send([]) : req;
    };
  };
  const rows = everyEndpoint().filter(
    ({ spec }) => spec.access !== "anyone" && !spec.testOnly && (typeof spec.body === "object" || spec.query !== undefined),
  );

  it("covers every admin row that takes input", () => {
    const adminRows = rows.filter(({ spec }) => Array.isArray(spec.access) && spec.access.length === 1 && spec.access[0] === "admin");
    expect(adminRows.map(({ key }) => key)).toEqual(
      expect.arrayContaining([
        "admin.resolveReport",
        "admin.suspendUser",
        "admin.restoreUser",
        "admin.updateSettings",
        "admin.searchAudit",
      ]),
    );
  });

  for (const { key, spec } of rows) {
    const call = invalidCall(spec);
    const refused = ACTOR_ORDER.filter((actor) => !mayCall(spec.access, ROLE_OF[actor]));
    const allowed = ACTOR_ORDER.find((actor) => mayCall(spec.access, ROLE_OF[actor]))!;
    it(`${key}: ${refused.join(", ")} → 401/403 with invalid input; ${allowed} → 422`, async () => {
      for (const actor of refused) {
        const res = await call(clients[actor]);
        expect(res.status, actor).toBe(ROLE_OF[actor] ? 403 : 401);
        expect(res.body.error.fields, actor).toBeUndefined();
      }
      const res = await call(clients[allowed]);
      expect(res.status, `${allowed} with the same input`).toBe(422);
    });
  }
});

/** Every method + path the Express app answers (nested routers included). */
function registeredRoutes(app: unknown): { method: string; path: string }[] {
  const found: { method: string; path: string }[] = [];
  const walk = (stack: unknown[]) => {
    for (const layer of stack as {
      route?: { path: string | string[]; methods: Record<string, boolean> };
      handle?: { stack?: unknown[] };
    }[]) {
      if (layer.route) {
        for (const path of ([] as string[]).concat(layer.route.path)) {
          for (const method of Object.keys(layer.route.methods)) found.push({ method: method.toUpperCase(), path });
        }
      } else if (layer.handle?.stack) walk(layer.handle.stack);
    }
  };
  walk((app as { router: { stack: unknown[] } }).router.stack);
  return found;
}
