import type { listingEndpoints, reviewEndpoints } from "@grainyard/contracts";
import type { Handlers } from "../http/endpoints.ts";
import type { ListingService } from "../services/listing-service.ts";
import type { PhotoService } from "../services/photo-service.ts";
import { displaySize } from "./yard-routes.ts";

/** A sawyer's listings and their photos. */
export function listingHandlers(listings: ListingService, photos: PhotoService): Handlers<typeof listingEndpoints> {
  return {
    listOwnListings: async ({ actor }) => ({ listings: await listings.listOwn(actor) }),
    createListing: async ({ actor, body }) => ({ listing: await listings.create(actor, body) }),
    getOwnListing: async ({ actor, params }) => ({ listing: await listings.getOwn(actor, params.listingId) }),
    updateListing: async ({ actor, params, body }) => ({ listing: await listings.update(actor, params.listingId, body) }),
    submitListing: async ({ actor, params }) => ({ listing: await listings.submit(actor, params.listingId) }),
    withdrawListing: async ({ actor, params }) => ({ listing: await listings.withdraw(actor, params.listingId) }),
    uploadListingPhoto: async ({ actor, params, query, body }) => ({
      photo: await photos.upload(actor, params.listingId, body, query.altText ?? ""),
    }),
    setPhotoAltText: async ({ actor, params, body }) => ({
      photo: await photos.setAltText(actor, params.listingId, params.photoId, body.altText),
    }),
    setPhotoOrder: async ({ actor, params, body }) => ({ photos: await photos.reorder(actor, params.listingId, body.photoIds) }),
    deleteListingPhoto: ({ actor, params }) => photos.remove(actor, params.listingId, params.photoId),
    listingPhotoImage: async ({ actor, params }) => ({
      body: await photos.image(actor, params.photoId, displaySize(params.size)),
      contentType: "image/webp",
      cacheControl: "private, max-age=300",
    }),
  };
}

/** The admin's review of submitted listings. */
export function reviewHandlers(listings: ListingService): Handlers<typeof reviewEndpoints> {
  return {
    reviewDesk: async ({ actor }) => ({ items: await listings.reviewDesk(actor) }),
    reviewHistory: async ({ actor, params }) => ({ reviews: await listings.reviewHistory(actor, params.listingId) }),
    approveListing: async ({ actor, params }) => ({ listing: await listings.approve(actor, params.listingId) }),
    sendBackListing: async ({ actor, params, body }) => ({ listing: await listings.sendBack(actor, params.listingId, body) }),
    rejectListing: async ({ actor, params, body }) => ({ listing: await listings.reject(actor, params.listingId, body) }),
  };
}
