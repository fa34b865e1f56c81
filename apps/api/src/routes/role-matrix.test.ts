import { randomUUID } from "node:crypto";
import sharp from "sharp";
import { OrderEntity } from "../entities/index.ts";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { createTestContext, type BrowserClient, type TestContext } from "../test-support/test-context.ts";
import { unsubscribeToken } from "../services/saved-search-service.ts";

/**
 * Who may do what, route by route: anonymous, buyer, sawyer (acting on their own yard),
 * other sawyer (acting on someone else's), admin. Grow this table with every new route.
 */
type ActorName = "anonymous" | "buyer" | "sawyer" | "otherSawyer" | "admin";
/** Things owned by "sawyer": a log, a slab cut from it, a draft listing of that slab with one photo. */
interface Ids {
  sawyerId: string;
  logId: string;
  slabId: string;
  listingId: string;
  photoUrl: string;
  /** A buyer nobody signs in as: the admin suspends and restores it. */
  spareBuyerId: string;
}

interface RouteCase {
  name: string;
  call: (client: BrowserClient, ids: Ids) => Promise<{ status: number }>;
  expected: Record<ActorName, number>;
}

/** An admin route: anonymous 401, every other non-admin 403, the admin gets `adminStatus`. */
function adminOnly(name: string, call: RouteCase["call"], adminStatus = 200): RouteCase[] {
  return [{ name, call, expected: { anonymous: 401, buyer: 403, sawyer: 403, otherSawyer: 403, admin: adminStatus } }];
}

const routes: RouteCase[] = [
  {
    name: "GET /api/v1/session",
    call: (c) => c.get("/api/v1/session"),
    expected: { anonymous: 200, buyer: 200, sawyer: 200, otherSawyer: 200, admin: 200 },
  },
  {
    name: "GET /api/v1/marketplace/fees (public)",
    call: (c) => c.get("/api/v1/marketplace/fees"),
    expected: { anonymous: 200, buyer: 200, sawyer: 200, otherSawyer: 200, admin: 200 },
  },
  {
    name: "GET /robots.txt (public)",
    call: (c) => c.get("/robots.txt"),
    expected: { anonymous: 200, buyer: 200, sawyer: 200, otherSawyer: 200, admin: 200 },
  },
  {
    name: "GET /sitemap.xml (public)",
    call: (c) => c.get("/sitemap.xml"),
    expected: { anonymous: 200, buyer: 200, sawyer: 200, otherSawyer: 200, admin: 200 },
  },
  {
    name: "GET /sitemaps/pages.xml (public)",
    call: (c) => c.get("/sitemaps/pages.xml"),
    expected: { anonymous: 200, buyer: 200, sawyer: 200, otherSawyer: 200, admin: 200 },
  },
  {
    name: "GET /api/v1/yard",
    call: (c) => c.get("/api/v1/yard"),
    expected: { anonymous: 401, buyer: 403, sawyer: 200, otherSawyer: 200, admin: 403 },
  },
  {
    name: "PATCH /api/v1/yards/:sawyerId",
    call: (c, ids) => c.patch(`/api/v1/yards/${ids.sawyerId}`, { pickupTown: "Northshore" }),
    expected: { anonymous: 401, buyer: 403, sawyer: 200, otherSawyer: 403, admin: 200 },
  },
  {
    name: "GET /api/v1/admin/accounts",
    call: (c) => c.get("/api/v1/admin/accounts"),
    expected: { anonymous: 401, buyer: 403, sawyer: 403, otherSawyer: 403, admin: 200 },
  },
  {
    name: "POST /api/v1/email-verification/resend",
    // Every seeded test account is verified already: signed-in people get 409, anonymous 401.
    call: (c) => c.post("/api/v1/email-verification/resend"),
    expected: { anonymous: 401, buyer: 409, sawyer: 409, otherSawyer: 409, admin: 409 },
  },
  {
    name: "POST /api/v1/accounts (while signed in)",
    call: (c) =>
      c.post("/api/v1/accounts", {
        role: "buyer",
        email: `m-${Math.random().toString(36).slice(2)}@lakemont.test`,
        password: "matrix-password-ok",
        displayName: "Matrix",
      }),
    expected: { anonymous: 201, buyer: 409, sawyer: 409, otherSawyer: 409, admin: 409 },
  },
  {
    name: "GET /api/v1/yard/logs",
    call: (c) => c.get("/api/v1/yard/logs"),
    expected: { anonymous: 401, buyer: 403, sawyer: 200, otherSawyer: 200, admin: 403 },
  },
  {
    name: "GET /api/v1/yard/logs/:logId",
    call: (c, ids) => c.get(`/api/v1/yard/logs/${ids.logId}`),
    expected: { anonymous: 401, buyer: 403, sawyer: 200, otherSawyer: 403, admin: 403 },
  },
  {
    name: "PATCH /api/v1/yard/logs/:logId",
    call: (c, ids) => c.patch(`/api/v1/yard/logs/${ids.logId}`, { notes: "Checked by the matrix" }),
    expected: { anonymous: 401, buyer: 403, sawyer: 200, otherSawyer: 403, admin: 403 },
  },
  {
    name: "POST /api/v1/yard/logs/:logId/readings",
    call: (c, ids) =>
      c.post(`/api/v1/yard/logs/${ids.logId}/readings`, { readOn: "2025-06-01", moistureContentPct: 18, method: "pin_meter" }),
    expected: { anonymous: 401, buyer: 403, sawyer: 201, otherSawyer: 403, admin: 403 },
  },
  {
    name: "GET /api/v1/yard/slabs/:slabId",
    call: (c, ids) => c.get(`/api/v1/yard/slabs/${ids.slabId}`),
    expected: { anonymous: 401, buyer: 403, sawyer: 200, otherSawyer: 403, admin: 403 },
  },
  {
    name: "PATCH /api/v1/yard/slabs/:slabId",
    call: (c, ids) => c.patch(`/api/v1/yard/slabs/${ids.slabId}`, { notes: "Checked by the matrix" }),
    expected: { anonymous: 401, buyer: 403, sawyer: 200, otherSawyer: 403, admin: 403 },
  },
  {
    name: "POST /api/v1/yard/slabs/:slabId/readings",
    call: (c, ids) =>
      c.post(`/api/v1/yard/slabs/${ids.slabId}/readings`, { readOn: "2025-07-01", moistureContentPct: 15, method: "pin_meter" }),
    expected: { anonymous: 401, buyer: 403, sawyer: 201, otherSawyer: 403, admin: 403 },
  },
  {
    name: "GET /api/v1/yard/slabs.csv",
    call: (c) => c.get("/api/v1/yard/slabs.csv"),
    expected: { anonymous: 401, buyer: 403, sawyer: 200, otherSawyer: 200, admin: 403 },
  },
  {
    name: "GET /api/v1/yard/listings/:listingId",
    call: (c, ids) => c.get(`/api/v1/yard/listings/${ids.listingId}`),
    expected: { anonymous: 401, buyer: 403, sawyer: 200, otherSawyer: 403, admin: 200 },
  },
  {
    name: "PATCH /api/v1/yard/listings/:listingId",
    call: (c, ids) => c.patch(`/api/v1/yard/listings/${ids.listingId}`, { description: "Checked by the matrix" }),
    expected: { anonymous: 401, buyer: 403, sawyer: 200, otherSawyer: 403, admin: 403 },
  },
  {
    name: "GET /api/v1/photos/:photoId/small.webp (listing not live)",
    call: (c, ids) => c.get(ids.photoUrl),
    expected: { anonymous: 404, buyer: 404, sawyer: 200, otherSawyer: 404, admin: 200 },
  },
  {
    name: "GET /api/v1/admin/listings",
    call: (c) => c.get("/api/v1/admin/listings"),
    expected: { anonymous: 401, buyer: 403, sawyer: 403, otherSawyer: 403, admin: 200 },
  },
  {
    name: "POST /api/v1/admin/listings/:listingId/approve (a draft)",
    call: (c, ids) => c.post(`/api/v1/admin/listings/${ids.listingId}/approve`),
    expected: { anonymous: 401, buyer: 403, sawyer: 403, otherSawyer: 403, admin: 409 },
  },
  // Operator desk (operator-desk.test.ts has the behaviour).
  ...adminOnly("GET /api/v1/admin/review-desk", (c) => c.get("/api/v1/admin/review-desk")),
  ...adminOnly("GET /api/v1/admin/listings/:listingId/reviews", (c, ids) => c.get(`/api/v1/admin/listings/${ids.listingId}/reviews`)),
  ...adminOnly(
    "POST /api/v1/admin/listings/:listingId/reject (a draft)",
    (c, ids) => c.post(`/api/v1/admin/listings/${ids.listingId}/reject`, { reason: "Matrix says no." }),
    409,
  ),
  ...adminOnly("GET /api/v1/admin/audit", (c) => c.get("/api/v1/admin/audit")),
  ...adminOnly("GET /api/v1/admin/audit.csv", (c) => c.get("/api/v1/admin/audit.csv")),
  ...adminOnly("GET /api/v1/admin/reports", (c) => c.get("/api/v1/admin/reports")),
  ...adminOnly(
    "POST /api/v1/admin/reports/:reportId/resolve (unknown report)",
    (c) =>
      c.post("/api/v1/admin/reports/00000000-0000-4000-8000-000000000000/resolve", { resolution: "dismiss", note: "Matrix resolves." }),
    404,
  ),
  ...adminOnly("GET /api/v1/admin/users", (c) => c.get("/api/v1/admin/users")),
  ...adminOnly("GET /api/v1/admin/users/:accountId", (c, ids) => c.get(`/api/v1/admin/users/${ids.sawyerId}`)),
  ...adminOnly("POST /api/v1/admin/users/:accountId/suspend (a spare buyer)", (c, ids) =>
    c.post(`/api/v1/admin/users/${ids.spareBuyerId}/suspend`, { reason: "Matrix suspends." }),
  ),
  ...adminOnly("POST /api/v1/admin/users/:accountId/restore (the spare buyer)", (c, ids) =>
    c.post(`/api/v1/admin/users/${ids.spareBuyerId}/restore`, { reason: "Matrix restores." }),
  ),
  ...adminOnly("GET /api/v1/admin/settings", (c) => c.get("/api/v1/admin/settings")),
  ...adminOnly("PATCH /api/v1/admin/settings", (c) =>
    c.patch("/api/v1/admin/settings", { holdDays: 7, reason: "Matrix keeps seven days." }),
  ),
  ...adminOnly("GET /api/v1/admin/dashboard", (c) => c.get("/api/v1/admin/dashboard")),
  // Payouts and dispute refunds (payouts.test.ts has the behaviour).
  {
    name: "GET /api/v1/yard/payouts",
    call: (c) => c.get("/api/v1/yard/payouts"),
    expected: { anonymous: 401, buyer: 403, sawyer: 200, otherSawyer: 200, admin: 403 },
  },
  {
    name: "POST /api/v1/yard/payouts/account",
    call: (c) => c.post("/api/v1/yard/payouts/account"),
    expected: { anonymous: 401, buyer: 403, sawyer: 200, otherSawyer: 200, admin: 403 },
  },
  {
    name: "POST /api/v1/yard/payouts/account/refresh",
    call: (c) => c.post("/api/v1/yard/payouts/account/refresh"),
    expected: { anonymous: 401, buyer: 403, sawyer: 200, otherSawyer: 200, admin: 403 },
  },
  {
    name: "GET /api/v1/yard/payouts/statement.csv",
    call: (c) => c.get("/api/v1/yard/payouts/statement.csv"),
    expected: { anonymous: 401, buyer: 403, sawyer: 200, otherSawyer: 200, admin: 403 },
  },
  {
    name: "GET /api/v1/yard/payouts/:payoutId (unknown)",
    call: (c) => c.get(`/api/v1/yard/payouts/${randomUUID()}`),
    expected: { anonymous: 401, buyer: 403, sawyer: 404, otherSawyer: 404, admin: 403 },
  },
  ...adminOnly("GET /api/v1/admin/payouts/due", (c) => c.get("/api/v1/admin/payouts/due")),
  ...adminOnly(
    "POST /api/v1/admin/payouts (a sawyer with no payout account)",
    (c) => c.post("/api/v1/admin/payouts", { sawyerId: randomUUID(), currency: "USD", dueKey: "matrix" }),
    409,
  ),
  ...adminOnly("POST /api/v1/admin/payouts/batch", (c) =>
    c.post("/api/v1/admin/payouts/batch", { payouts: [{ sawyerId: randomUUID(), currency: "USD", dueKey: "matrix" }] }),
  ),
  ...adminOnly("GET /api/v1/admin/payouts", (c) => c.get("/api/v1/admin/payouts")),
  ...adminOnly("GET /api/v1/admin/payouts/:payoutId (unknown)", (c) => c.get(`/api/v1/admin/payouts/${randomUUID()}`), 404),
  ...adminOnly(
    "GET /api/v1/admin/orders/:orderId/refund (unknown order)",
    (c) => c.get(`/api/v1/admin/orders/${randomUUID()}/refund`),
    404,
  ),
  ...adminOnly(
    "POST /api/v1/admin/orders/:orderId/refund (unknown order)",
    (c) => c.post(`/api/v1/admin/orders/${randomUUID()}/refund`, { amountMinor: 100, reason: "Matrix refunds." }),
    404,
  ),
  {
    name: "POST /api/v1/yard/listings/:listingId/withdraw (last: it ends the draft)",
    call: (c, ids) => c.post(`/api/v1/yard/listings/${ids.listingId}/withdraw`),
    expected: { anonymous: 401, buyer: 403, otherSawyer: 403, admin: 403, sawyer: 200 },
  },
  // Buyer tools (buyer-tools.test.ts has the behaviour); they use buyerToolIds, set up at the end of beforeAll.
  {
    name: "GET /api/v1/saved-searches",
    call: (c) => c.get("/api/v1/saved-searches"),
    expected: { anonymous: 401, buyer: 200, sawyer: 403, otherSawyer: 403, admin: 403 },
  },
  {
    name: "POST /api/v1/saved-searches",
    call: (c) => c.post("/api/v1/saved-searches", { name: "Matrix walnut", query: "species=black-walnut" }),
    expected: { anonymous: 401, buyer: 201, sawyer: 403, otherSawyer: 403, admin: 403 },
  },
  {
    name: "PATCH /api/v1/saved-searches/:savedSearchId (the buyer's)",
    call: (c) => c.patch(`/api/v1/saved-searches/${buyerToolIds.savedSearchId}`, { name: "Renamed by the matrix" }),
    expected: { anonymous: 401, buyer: 200, sawyer: 403, otherSawyer: 403, admin: 403 },
  },
  {
    name: "DELETE /api/v1/saved-searches/:savedSearchId (the buyer's spare one)",
    call: (c) => c.delete(`/api/v1/saved-searches/${buyerToolIds.spareSavedSearchId}`),
    expected: { anonymous: 401, buyer: 204, sawyer: 403, otherSawyer: 403, admin: 403 },
  },
  {
    name: "GET /api/v1/saved-searches/unsubscribe?token= (no sign-in needed)",
    call: (c) => c.get(`/api/v1/saved-searches/unsubscribe?token=${encodeURIComponent(buyerToolIds.unsubscribeToken)}`),
    expected: { anonymous: 200, buyer: 200, sawyer: 200, otherSawyer: 200, admin: 200 },
  },
  {
    name: "PUT /api/v1/favourites/:listingId (live)",
    call: (c) => c.agent.put(`/api/v1/favourites/${buyerToolIds.liveListingId}`).set("x-csrf-token", c.csrfToken),
    expected: { anonymous: 401, buyer: 200, sawyer: 403, otherSawyer: 403, admin: 403 },
  },
  {
    name: "GET /api/v1/favourites",
    call: (c) => c.get("/api/v1/favourites"),
    expected: { anonymous: 401, buyer: 200, sawyer: 403, otherSawyer: 403, admin: 403 },
  },
  {
    name: "DELETE /api/v1/favourites/:listingId",
    call: (c) => c.delete(`/api/v1/favourites/${buyerToolIds.liveListingId}`),
    expected: { anonymous: 401, buyer: 204, sawyer: 403, otherSawyer: 403, admin: 403 },
  },
  {
    name: "POST /api/v1/listings/:listingId/messages (sawyer's live listing)",
    call: (c) => c.post(`/api/v1/listings/${buyerToolIds.liveListingId}/messages`, { body: "Asked by the matrix" }),
    expected: { anonymous: 401, buyer: 201, sawyer: 403, otherSawyer: 201, admin: 403 },
  },
  {
    name: "POST /api/v1/reports (sawyer's live listing)",
    call: (c) =>
      c.post("/api/v1/reports", { targetKind: "listing", targetId: buyerToolIds.liveListingId, reason: "Reported by the matrix." }),
    expected: { anonymous: 401, buyer: 201, sawyer: 422, otherSawyer: 201, admin: 201 },
  },
  {
    name: "GET /api/v1/threads",
    call: (c) => c.get("/api/v1/threads"),
    expected: { anonymous: 401, buyer: 200, sawyer: 200, otherSawyer: 200, admin: 200 },
  },
  {
    name: "GET /api/v1/threads/:threadId (buyer with sawyer)",
    call: (c) => c.get(`/api/v1/threads/${buyerToolIds.threadId}`),
    expected: { anonymous: 401, buyer: 200, sawyer: 200, otherSawyer: 403, admin: 200 },
  },
  {
    name: "POST /api/v1/threads/:threadId/messages (buyer with sawyer)",
    call: (c) => c.post(`/api/v1/threads/${buyerToolIds.threadId}/messages`, { body: "Answered in the matrix" }),
    expected: { anonymous: 401, buyer: 201, sawyer: 201, otherSawyer: 403, admin: 403 },
  },
  // Orders (order-steps.test.ts and checkout.test.ts have the behaviour): "buyer" bought two of
  // "sawyer"'s listings (orderIds, made straight in the database as paid pickup orders). The steps
  // run in order: windows → choice → hand-over → completion; the second order is cancelled.
  {
    name: "GET /api/v1/listings/:listingId/checkout-quote (live)",
    call: (c) => c.get(`/api/v1/listings/${buyerToolIds.liveListingId}/checkout-quote`),
    expected: { anonymous: 200, buyer: 200, sawyer: 200, otherSawyer: 200, admin: 200 },
  },
  {
    name: "POST /api/v1/listings/:listingId/checkout (a draft: not for sale)",
    call: (c, ids) => c.post(`/api/v1/listings/${ids.listingId}/checkout`, { handover: "pickup" }),
    expected: { anonymous: 401, buyer: 409, sawyer: 403, otherSawyer: 403, admin: 403 },
  },
  {
    name: "GET /api/v1/orders",
    call: (c) => c.get("/api/v1/orders"),
    expected: { anonymous: 401, buyer: 200, sawyer: 200, otherSawyer: 200, admin: 200 },
  },
  {
    name: "GET /api/v1/orders/:orderId",
    call: (c) => c.get(`/api/v1/orders/${orderIds.pickup}`),
    expected: { anonymous: 401, buyer: 200, sawyer: 200, otherSawyer: 403, admin: 200 },
  },
  {
    name: "POST /api/v1/orders/:orderId/pickup-windows",
    call: (c) =>
      c.post(`/api/v1/orders/${orderIds.pickup}/pickup-windows`, {
        windows: [{ startsAt: orderIds.windowStart, endsAt: orderIds.windowEnd }],
        pickupAddress: "Matrix yard gate",
      }),
    expected: { anonymous: 401, buyer: 403, sawyer: 200, otherSawyer: 403, admin: 403 },
  },
  {
    name: "POST /api/v1/orders/:orderId/pickup-choice",
    call: (c) => c.post(`/api/v1/orders/${orderIds.pickup}/pickup-choice`, { startsAt: orderIds.windowStart }),
    expected: { anonymous: 401, buyer: 200, sawyer: 403, otherSawyer: 403, admin: 403 },
  },
  {
    name: "POST /api/v1/orders/:orderId/shipment (a pickup order: 409 for its sawyer)",
    call: (c) => c.post(`/api/v1/orders/${orderIds.pickup}/shipment`, { carrier: "Matrix Freight", trackingReference: "MTX-1" }),
    expected: { anonymous: 401, buyer: 403, sawyer: 409, otherSawyer: 403, admin: 403 },
  },
  {
    name: "POST /api/v1/orders/:orderId/handed-over",
    call: (c) => c.post(`/api/v1/orders/${orderIds.pickup}/handed-over`),
    expected: { anonymous: 401, buyer: 403, sawyer: 200, otherSawyer: 403, admin: 403 },
  },
  {
    name: "POST /api/v1/orders/:orderId/completion",
    call: (c) => c.post(`/api/v1/orders/${orderIds.pickup}/completion`),
    expected: { anonymous: 401, buyer: 200, sawyer: 403, otherSawyer: 403, admin: 403 },
  },
  {
    // The buyer cancels first (200); the sawyer then finds it cancelled already (409).
    name: "POST /api/v1/orders/:orderId/cancellation",
    call: (c) => c.post(`/api/v1/orders/${orderIds.toCancel}/cancellation`, { reason: "Matrix cancels" }),
    expected: { anonymous: 401, buyer: 200, sawyer: 409, otherSawyer: 403, admin: 403 },
  },
];

let ctx: TestContext;
const orderIds = { pickup: "", toCancel: "", windowStart: "", windowEnd: "" };
const clients = {} as Record<ActorName, BrowserClient>;
const ids: Ids = { sawyerId: "", logId: "", slabId: "", listingId: "", photoUrl: "", spareBuyerId: "" };
/** Buyer tools: a live listing of "sawyer", a thread "buyer" started on it, two saved searches of "buyer". */
const buyerToolIds = { liveListingId: "", threadId: "", savedSearchId: "", spareSavedSearchId: "", unsubscribeToken: "" };

beforeAll(async () => {
  ctx = await createTestContext();
  clients.anonymous = await ctx.client();
  clients.buyer = await ctx.signedInClient("buyer");
  const sawyer = await ctx.signedInClient("sawyer");
  clients.sawyer = sawyer;
  ids.sawyerId = sawyer.account.id;
  clients.otherSawyer = await ctx.signedInClient("sawyer");
  clients.admin = await ctx.signedInClient("admin");
  ids.spareBuyerId = (await ctx.createAccount("buyer")).id;
  ids.logId = (
    await sawyer.post("/api/v1/yard/logs", {
      speciesSlug: "northern-red-oak",
      siteTown: "Lakemont",
      siteKind: "street",
      fellingReason: "pests",
    })
  ).body.log.id;
  ids.slabId = (
    await sawyer.post("/api/v1/yard/slabs", {
      logId: ids.logId,
      sequenceInLog: 1,
      speciesSlug: "northern-red-oak",
      lengthMm: 2000,
      thicknessMm: 50,
      widthStationsMm: [500, 480],
      liveEdge: "one",
      surfacing: "rough_sawn",
      dryingMethod: "air",
    })
  ).body.slab.id;
  ids.listingId = (
    await sawyer.post("/api/v1/yard/listings", { title: "Matrix oak", slabIds: [ids.slabId], priceMode: "fixed", rateMinor: 20_000 })
  ).body.listing.id;
  const photo = await sharp({ create: { width: 640, height: 480, channels: 3, background: "#8a5a32" } })
    .jpeg()
    .toBuffer();
  const uploaded = await sawyer.agent
    .post(`/api/v1/yard/listings/${ids.listingId}/photos`)
    .set("x-csrf-token", sawyer.csrfToken)
    .set("content-type", "image/jpeg")
    .send(photo);
  ids.photoUrl = uploaded.body.photo.smallUrl;
  // Buyer tools: a second slab listed, submitted and approved, so it is live.
  const liveSlab = (
    await sawyer.post("/api/v1/yard/slabs", {
      logId: ids.logId,
      sequenceInLog: 2,
      speciesSlug: "northern-red-oak",
      lengthMm: 2000,
      thicknessMm: 50,
      widthStationsMm: [500, 480],
      liveEdge: "one",
      surfacing: "rough_sawn",
      dryingMethod: "air",
    })
  ).body.slab.id;
  buyerToolIds.liveListingId = (
    await sawyer.post("/api/v1/yard/listings", { title: "Matrix live oak", slabIds: [liveSlab], priceMode: "fixed", rateMinor: 20_000 })
  ).body.listing.id;
  await sawyer.agent
    .post(`/api/v1/yard/listings/${buyerToolIds.liveListingId}/photos`)
    .set("x-csrf-token", sawyer.csrfToken)
    .set("content-type", "image/jpeg")
    .send(photo);
  await sawyer.post(`/api/v1/yard/listings/${buyerToolIds.liveListingId}/submit`);
  if ((await clients.admin.post(`/api/v1/admin/listings/${buyerToolIds.liveListingId}/approve`)).status !== 200)
    throw new Error("matrix: the live listing was not approved");
  buyerToolIds.threadId = (
    await clients.buyer.post(`/api/v1/listings/${buyerToolIds.liveListingId}/messages`, { body: "Matrix question" })
  ).body.thread.id;
  buyerToolIds.savedSearchId = (
    await clients.buyer.post("/api/v1/saved-searches", { name: "Matrix oak", query: "species=northern-red-oak" })
  ).body.savedSearch.id;
  buyerToolIds.spareSavedSearchId = (
    await clients.buyer.post("/api/v1/saved-searches", { name: "Matrix spare", query: "species=white-oak" })
  ).body.savedSearch.id;
  buyerToolIds.unsubscribeToken = unsubscribeToken(ctx.config.sessionSecret, buyerToolIds.savedSearchId);
  // Two paid pickup orders of "buyer" for "sawyer"'s draft listing (the money side is checkout.test.ts's).
  const buyerId = ((await clients.buyer.get("/api/v1/session")).body.account as { id: string }).id;
  for (const key of ["pickup", "toCancel"] as const) {
    orderIds[key] = randomUUID();
    await ctx.dataSource.getRepository(OrderEntity).insert({
      id: orderIds[key],
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
    });
  }
  orderIds.windowStart = new Date(Date.now() + 2 * 86_400_000).toISOString();
  orderIds.windowEnd = new Date(Date.now() + 2 * 86_400_000 + 7_200_000).toISOString();
});
afterAll(async () => ctx?.close());

describe("role and ownership matrix", () => {
  for (const route of routes) {
    for (const actor of Object.keys(route.expected) as ActorName[]) {
      it(`${route.name} as ${actor} → ${route.expected[actor]}`, async () => {
        const res = await route.call(clients[actor], ids);
        expect(res.status).toBe(route.expected[actor]);
      });
    }
  }

  it("a sawyer's change to their own yard is saved; another sawyer's attempt changes nothing", async () => {
    const own = await clients.sawyer.patch(`/api/v1/yards/${ids.sawyerId}`, { yardName: "Renamed Yard" });
    expect(own.body.account.yardName).toBe("Renamed Yard");
    await clients.otherSawyer.patch(`/api/v1/yards/${ids.sawyerId}`, { yardName: "Hijacked" });
    expect((await clients.sawyer.get("/api/v1/yard")).body.account.yardName).toBe("Renamed Yard");
  });

  it("admin search finds accounts by yard name and filters by role", async () => {
    const res = await clients.admin.get("/api/v1/admin/accounts?query=Renamed&role=sawyer");
    expect(res.status).toBe(200);
    expect(res.body.accounts.map((a: { id: string }) => a.id)).toEqual([ids.sawyerId]);
    const bad = await clients.admin.get("/api/v1/admin/accounts?role=wizard");
    expect(bad.status).toBe(422);
  });
});
