/**
 * A listing as the sawyer is writing it, kept whole on the phone: the typed fields, the photos
 * not yet uploaded (as Blobs), alt texts and order, and what still has to reach the server.
 * `syncListingDraft` sends it: create or update the listing, delete removed photos, upload
 * queued photos one by one, then alt texts and order. A lost connection stops it where it is;
 * the next sync carries on from there.
 */
import type { Listing, ListingInput, ListingPhoto } from "@grainyard/contracts";
import { minorToInput } from "@grainyard/slab-math";
import { ApiRequestError, clientErrorCodes, toApiRequestError } from "../api/errors.ts";

export interface ListingDraftFields {
  title: string;
  description: string;
  slabIds: string[];
  setKind: "single" | "sequential" | "bookmatched";
  priceMode: "per_board_foot" | "per_cubic_metre" | "fixed" | "";
  /** The rate as typed ("12.50"); becomes rateMinor when sent. */
  rate: string;
  currency: "USD" | "CAD" | "EUR" | "GBP";
  pickup: boolean;
  freight: boolean;
}

export interface DraftPhoto {
  /** Stable on this phone, before and after upload. */
  key: string;
  serverId: string | null;
  /** The picture itself until it is uploaded. */
  blob: Blob | null;
  fileName: string;
  altText: string;
  /** False when the alt text changed since the server last had it. */
  altTextSynced: boolean;
  smallUrl: string | null;
  /** Why its upload failed (refused, or lost on the way): not sent again until the sawyer asks to retry. */
  rejected: string | null;
}

export interface ListingDraft {
  /** Storage key: "listing:new" until the server gives an id, then "listing:<id>". */
  key: string;
  serverId: string | null;
  fields: ListingDraftFields;
  photos: DraftPhoto[];
  /** Fields changed since the server last had them (or the listing does not exist there yet). */
  fieldsPending: boolean;
  /** The sawyer asked to save: sync as soon as there is a connection. */
  saveQueued: boolean;
  orderPending: boolean;
  deletedPhotoIds: string[];
  updatedAt: string;
}

export const NEW_LISTING_KEY = "listing:new";
export const listingDraftKey = (listingId: string) => `listing:${listingId}`;

function emptyListingFields(): ListingDraftFields {
  return {
    title: "",
    description: "",
    slabIds: [],
    setKind: "single",
    priceMode: "",
    rate: "",
    currency: "USD",
    pickup: true,
    freight: false,
  };
}

export function newListingDraft(fields: Partial<ListingDraftFields> = {}): ListingDraft {
  return {
    key: NEW_LISTING_KEY,
    serverId: null,
    fields: { ...emptyListingFields(), ...fields },
    photos: [],
    fieldsPending: true,
    saveQueued: false,
    orderPending: false,
    deletedPhotoIds: [],
    updatedAt: new Date().toISOString(),
  };
}

function photoFromServer(photo: ListingPhoto): DraftPhoto {
  return {
    key: photo.id,
    serverId: photo.id,
    blob: null,
    fileName: "",
    altText: photo.altText,
    altTextSynced: true,
    smallUrl: photo.smallUrl,
    rejected: null,
  };
}

/** A draft that mirrors what the server has (nothing pending). */
export function draftFromListing(listing: Listing): ListingDraft {
  return {
    key: listingDraftKey(listing.id),
    serverId: listing.id,
    fields: {
      title: listing.title,
      description: listing.description,
      slabIds: listing.slabs.map((slab) => slab.id),
      setKind: listing.setKind,
      priceMode: listing.priceMode,
      rate: minorToInput(listing.rateMinor),
      currency: listing.currency,
      pickup: listing.pickup,
      freight: listing.freight,
    },
    photos: [...listing.photos].sort((a, b) => a.position - b.position).map(photoFromServer),
    fieldsPending: false,
    saveQueued: false,
    orderPending: false,
    deletedPhotoIds: [],
    updatedAt: listing.updatedAt,
  };
}

/** Anything still waiting for the server. */
export function hasPendingWork(draft: ListingDraft): boolean {
  return (
    draft.fieldsPending ||
    draft.orderPending ||
    draft.deletedPhotoIds.length > 0 ||
    draft.photos.some((photo) => (photo.blob && !photo.serverId && !photo.rejected) || (photo.serverId && !photo.altTextSynced))
  );
}

/** How one photo upload goes: its description, progress (0–1) and a way to stop it. */
interface PhotoUploadOptions {
  altText?: string;
  onProgress?: (fraction: number) => void;
  signal?: AbortSignal;
}

/** The API calls a sync needs (the listings client, or a fake in tests). */
export interface ListingSyncApi {
  createListing(input: ListingInput): Promise<{ listing: Listing }>;
  updateListing(listingId: string, input: ListingInput): Promise<{ listing: Listing }>;
  uploadListingPhoto(listingId: string, file: Blob, options?: PhotoUploadOptions): Promise<{ photo: ListingPhoto }>;
  updatePhotoAltText(listingId: string, photoId: string, altText: string): Promise<void>;
  setPhotoOrder(listingId: string, photoIds: string[]): Promise<void>;
  deletePhoto(listingId: string, photoId: string): Promise<void>;
}

export interface SyncHooks {
  api: ListingSyncApi;
  /** The fields as the API takes them, or null when they are not complete yet. */
  toInput(fields: ListingDraftFields): ListingInput | null;
  /** Called after every step that changed the draft (persist it, show it). */
  onChange(draft: ListingDraft): void | Promise<void>;
  onProgress?(photoKey: string, fraction: number): void;
  isOnline?(): boolean;
}

export type SyncResult =
  | { status: "synced"; listing: Listing | null }
  | { status: "offline" }
  | { status: "incomplete" }
  | { status: "failed"; error: ApiRequestError };

function isOffline(error: unknown): boolean {
  return error instanceof ApiRequestError && error.code === clientErrorCodes.offline;
}

/**
 * Sends what is pending, in order. Never throws: the result says how far it got.
 * Photos the server refuses keep their message (`rejected`) and do not stop the others.
 */
export async function syncListingDraft(draft: ListingDraft, hooks: SyncHooks, options: { photosOnly?: boolean } = {}): Promise<SyncResult> {
  const online = hooks.isOnline ?? (() => (typeof navigator === "undefined" ? true : navigator.onLine !== false));
  if (!online()) return { status: "offline" };
  let listing: Listing | null = null;
  try {
    if (!draft.serverId || (draft.fieldsPending && !options.photosOnly)) {
      const input = hooks.toInput(draft.fields);
      if (!input) return { status: "incomplete" };
      listing = draft.serverId
        ? (await hooks.api.updateListing(draft.serverId, input)).listing
        : (await hooks.api.createListing(input)).listing;
      draft.serverId = listing.id;
      draft.key = listingDraftKey(listing.id);
      draft.fieldsPending = false;
      await hooks.onChange(draft);
    }
    const listingId = draft.serverId;

    for (const photoId of [...draft.deletedPhotoIds]) {
      try {
        await hooks.api.deletePhoto(listingId, photoId);
      } catch (error) {
        if (!(error instanceof ApiRequestError && error.status === 404)) throw error;
      }
      draft.deletedPhotoIds = draft.deletedPhotoIds.filter((id) => id !== photoId);
      await hooks.onChange(draft);
    }

    let uploaded = false;
    for (const photo of draft.photos) {
      if (!photo.blob || photo.serverId || photo.rejected) continue;
      hooks.onProgress?.(photo.key, 0);
      try {
        const { photo: saved } = await hooks.api.uploadListingPhoto(listingId, photo.blob, {
          altText: photo.altText,
          onProgress: (fraction) => hooks.onProgress?.(photo.key, fraction),
        });
        photo.serverId = saved.id;
        photo.smallUrl = saved.smallUrl;
        photo.blob = null;
        photo.altTextSynced = saved.altText === photo.altText.trim();
        uploaded = true;
        hooks.onProgress?.(photo.key, 1);
      } catch (error) {
        if (isOffline(error)) throw error;
        if (error instanceof DOMException && error.name === "AbortError") throw error;
        photo.rejected = toApiRequestError(error).message;
      }
      await hooks.onChange(draft);
    }

    for (const photo of draft.photos) {
      if (!photo.serverId || photo.altTextSynced) continue;
      await hooks.api.updatePhotoAltText(listingId, photo.serverId, photo.altText.trim());
      photo.altTextSynced = true;
      await hooks.onChange(draft);
    }

    const order = draft.photos.flatMap((photo) => (photo.serverId ? [photo.serverId] : []));
    if ((draft.orderPending || uploaded) && order.length > 0) {
      await hooks.api.setPhotoOrder(listingId, order);
    }
    draft.orderPending = false;
    if (!options.photosOnly) draft.saveQueued = false;
    await hooks.onChange(draft);
    return { status: "synced", listing };
  } catch (error) {
    if (isOffline(error)) return { status: "offline" };
    return { status: "failed", error: toApiRequestError(error) };
  }
}
