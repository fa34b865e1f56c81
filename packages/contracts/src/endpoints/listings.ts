import { z } from "zod";
import { rejectSchema, pastReviewSchema, reviewDeskSchema } from "../admin.ts";
import { endpoint } from "../endpoint.ts";
import {
  listingEnvelopeSchema,
  listingInputSchema,
  listingListSchema,
  listingPhotoSchema,
  listingUpdateSchema,
  photoAltTextSchema,
  photoOrderSchema,
  sendBackSchema,
} from "../listings.ts";
import type { ErrorCode } from "../errors.ts";
import { API_PREFIX } from "./prefix.ts";

const sawyerOnly = ["sawyer"] as const;
const adminOnly = ["admin"] as const;
const photoErrors = [
  "listing_not_editable",
  "too_many_photos",
  "too_large_file",
  "not_an_image",
  "unsupported_format",
  "too_many_pixels",
  "corrupt_image",
  "decompression_bomb",
  "storage_unavailable",
] as const satisfies readonly ErrorCode[];

/** A sawyer's listings and their photos. */
export const listingEndpoints = {
  listOwnListings: endpoint({
    method: "GET",
    path: `${API_PREFIX}/yard/listings`,
    summary: "The yard's listings in every state.",
    access: sawyerOnly,
    answer: listingListSchema,
  }),
  createListing: endpoint({
    method: "POST",
    path: `${API_PREFIX}/yard/listings`,
    summary: "A draft listing of one or more slabs.",
    access: sawyerOnly,
    body: listingInputSchema,
    answer: listingEnvelopeSchema,
    status: 201,
    errors: ["slab_already_listed", "slab_locked"],
  }),
  getOwnListing: endpoint({
    method: "GET",
    path: `${API_PREFIX}/yard/listings/:listingId`,
    summary: "One listing as its sawyer (or an admin) sees it.",
    access: ["sawyer", "admin"],
    answer: listingEnvelopeSchema,
  }),
  updateListing: endpoint({
    method: "PATCH",
    path: `${API_PREFIX}/yard/listings/:listingId`,
    summary: "Change a draft or sent-back listing.",
    access: sawyerOnly,
    body: listingUpdateSchema,
    answer: listingEnvelopeSchema,
    errors: ["listing_not_editable", "slab_already_listed", "slab_locked"],
  }),
  submitListing: endpoint({
    method: "POST",
    path: `${API_PREFIX}/yard/listings/:listingId/submit`,
    summary: "Send a listing to review.",
    access: sawyerOnly,
    answer: listingEnvelopeSchema,
    errors: ["listing_not_submittable", "photos_missing", "email_unverified", "slab_already_listed"],
  }),
  withdrawListing: endpoint({
    method: "POST",
    path: `${API_PREFIX}/yard/listings/:listingId/withdraw`,
    summary: "Take a listing off the market.",
    access: sawyerOnly,
    answer: listingEnvelopeSchema,
    errors: ["listing_not_withdrawable"],
  }),
  uploadListingPhoto: endpoint({
    method: "POST",
    path: `${API_PREFIX}/yard/listings/:listingId/photos`,
    summary: "A photo of a listing (raw bytes, so the browser can show progress; alt text in the query).",
    access: sawyerOnly,
    query: z.object({ altText: z.string().optional() }),
    body: "photo_bytes",
    answer: z.object({ photo: listingPhotoSchema }),
    status: 201,
    errors: photoErrors,
  }),
  setPhotoAltText: endpoint({
    method: "PATCH",
    path: `${API_PREFIX}/yard/listings/:listingId/photos/:photoId`,
    summary: "Describe a photo for people who cannot see it.",
    access: sawyerOnly,
    body: photoAltTextSchema,
    answer: z.object({ photo: listingPhotoSchema }),
    errors: ["listing_not_editable"],
  }),
  setPhotoOrder: endpoint({
    method: "PUT",
    path: `${API_PREFIX}/yard/listings/:listingId/photo-order`,
    summary: "Put a listing's photos in a new order.",
    access: sawyerOnly,
    body: photoOrderSchema,
    answer: z.object({ photos: z.array(listingPhotoSchema) }),
    errors: ["listing_not_editable"],
  }),
  deleteListingPhoto: endpoint({
    method: "DELETE",
    path: `${API_PREFIX}/yard/listings/:listingId/photos/:photoId`,
    summary: "Delete a photo of a listing.",
    access: sawyerOnly,
    answer: null,
    status: 204,
    errors: ["listing_not_editable", "storage_unavailable"],
  }),
  listingPhotoImage: endpoint({
    method: "GET",
    path: `${API_PREFIX}/photos/:photoId/:size.webp`,
    summary: "A listing photo's display size: public while the listing is live or sold, else its sawyer's and admins'.",
    access: "anyone",
    answer: { file: "webp" },
    errors: ["storage_unavailable"],
  }),
} as const;

/** The admin's review of submitted listings. */
export const reviewEndpoints = {
  reviewDesk: endpoint({
    method: "GET",
    path: `${API_PREFIX}/admin/review-desk`,
    summary: "Listings waiting for review, with warnings and what changed since the last decision.",
    access: adminOnly,
    answer: reviewDeskSchema,
  }),
  reviewHistory: endpoint({
    method: "GET",
    path: `${API_PREFIX}/admin/listings/:listingId/reviews`,
    summary: "Every past decision on a listing, newest first.",
    access: adminOnly,
    answer: z.object({ reviews: z.array(pastReviewSchema) }),
  }),
  approveListing: endpoint({
    method: "POST",
    path: `${API_PREFIX}/admin/listings/:listingId/approve`,
    summary: "Put a listing live.",
    access: adminOnly,
    answer: listingEnvelopeSchema,
    errors: ["listing_not_in_review", "sawyer_suspended"],
  }),
  sendBackListing: endpoint({
    method: "POST",
    path: `${API_PREFIX}/admin/listings/:listingId/send-back`,
    summary: "Return a listing to its sawyer with what to fix.",
    access: adminOnly,
    body: sendBackSchema,
    answer: listingEnvelopeSchema,
    errors: ["listing_not_in_review"],
  }),
  rejectListing: endpoint({
    method: "POST",
    path: `${API_PREFIX}/admin/listings/:listingId/reject`,
    summary: "Refuse a listing for good.",
    access: adminOnly,
    body: rejectSchema,
    answer: listingEnvelopeSchema,
    errors: ["listing_not_in_review"],
  }),
} as const;
