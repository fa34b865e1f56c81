import { randomUUID } from "node:crypto";
import { MAX_PHOTOS_PER_LISTING, pathOf, yardEndpoints, type ListingPhoto } from "@grainyard/contracts";
import type { DataSource } from "typeorm";
import { ListingEntity, ListingPhotoEntity, ListingSlabEntity, LogPhotoEntity, YardLogEntity } from "../entities/index.ts";
import { Conflict, Forbidden, Invalid, NotFound } from "../errors.ts";
import type { PhotoStorage } from "../integrations/storage.ts";
import {
  deleteObjects,
  displayKey,
  getObjectBytes,
  cleanOriginal,
  inspectPhoto,
  mediumFromLarge,
  logPhotoKey,
  originalKey,
  putObject,
  renderDisplaySizes,
  type DisplaySizeName,
} from "../photos/index.ts";
import { requireRole, type Actor } from "./actor.ts";
import { photoView } from "./listing-service.ts";

/** Listing states whose photos anyone may see. */
const PUBLIC_STATUSES = ["live", "reserved", "sold"];
/** Listing states in which the sawyer may add, remove or reorder photos. */
const PHOTO_EDITABLE = ["draft", "sent_back"];

/**
 * Listing photos: the original (upright, metadata removed but its colour profile) is kept private in storage; the served sizes are WebP made by
 * sharp with orientation applied and every piece of metadata (GPS included) removed. Storage is
 * written first and the row last, so a storage outage leaves no row behind, and a failed row
 * removes what was stored.
 */
export function createPhotoService(deps: { dataSource: DataSource; storage: PhotoStorage }) {
  const { dataSource, storage } = deps;

  async function editableListing(actor: Actor, listingId: string) {
    const sawyer = requireRole(actor, "sawyer");
    const listing = await dataSource.getRepository(ListingEntity).findOneBy({ id: listingId });
    if (!listing) throw new NotFound("No listing with that id.");
    if (listing.sawyerId !== sawyer.accountId) throw new Forbidden("That listing belongs to another yard.");
    if (!PHOTO_EDITABLE.includes(listing.status))
      throw new Conflict("Photos can change only while the listing is a draft or was sent back.", "listing_not_editable");
    return listing;
  }

  async function ownPhoto(actor: Actor, listingId: string, photoId: string) {
    await editableListing(actor, listingId);
    const photo = await dataSource.getRepository(ListingPhotoEntity).findOneBy({ id: photoId, listingId });
    if (!photo) throw new NotFound("No photo with that id on this listing.");
    return photo;
  }

  const keysOf = (listingId: string, photoId: string) => [
    originalKey(listingId, photoId),
    displayKey(listingId, photoId, "small"),
    displayKey(listingId, photoId, "medium"),
    displayKey(listingId, photoId, "large"),
  ];

  return {
    async upload(actor: Actor, listingId: string, bytes: Buffer, altText: string): Promise<ListingPhoto> {
      const listing = await editableListing(actor, listingId);
      if (altText.length > 300) throw new Invalid("Keep the description under 300 characters.", { altText: "At most 300 characters." });
      const already = await dataSource.getRepository(ListingPhotoEntity).countBy({ listingId });
      if (already >= MAX_PHOTOS_PER_LISTING)
        throw new Conflict(`A listing holds at most ${MAX_PHOTOS_PER_LISTING} photos.`, "too_many_photos");

      const inspection = await inspectPhoto(bytes);
      const { sizes } = await renderDisplaySizes(bytes);
      const clean = await cleanOriginal(bytes);
      const photoId = randomUUID();
      const stored: string[] = [];
      try {
        const original = originalKey(listing.id, photoId);
        await putObject(storage.client, storage.bucket, original, clean.bytes, clean.contentType, { private: true });
        stored.push(original);
        for (const size of sizes) {
          const key = displayKey(listing.id, photoId, size.name);
          await putObject(storage.client, storage.bucket, key, size.bytes, size.contentType, { private: false });
          stored.push(key);
        }
        const large = sizes.find((s) => s.name === "large") ?? sizes[0]!;
        const photo = await dataSource.transaction(async (manager) => {
          // Lock the listing row so two uploads at once cannot pass the limit or share a position.
          await manager.getRepository(ListingEntity).findOne({ where: { id: listing.id }, lock: { mode: "pessimistic_write" } });
          const photos = await manager.getRepository(ListingPhotoEntity).find({ where: { listingId: listing.id } });
          if (photos.length >= MAX_PHOTOS_PER_LISTING)
            throw new Conflict(`A listing holds at most ${MAX_PHOTOS_PER_LISTING} photos.`, "too_many_photos");
          const entity = manager.getRepository(ListingPhotoEntity).create({
            id: photoId,
            listingId: listing.id,
            position: photos.reduce((max, p) => Math.max(max, p.position), -1) + 1,
            altText: altText.trim(),
            width: large.width,
            height: large.height,
            originalFormat: inspection.format,
          });
          await manager.getRepository(ListingPhotoEntity).insert(entity);
          return entity;
        });
        return photoView(photo);
      } catch (error) {
        if (stored.length) await deleteObjects(storage.client, storage.bucket, stored).catch(() => undefined);
        throw error;
      }
    },

    async setAltText(actor: Actor, listingId: string, photoId: string, altText: string): Promise<ListingPhoto> {
      const photo = await ownPhoto(actor, listingId, photoId);
      await dataSource.getRepository(ListingPhotoEntity).update({ id: photo.id }, { altText });
      return photoView({ ...photo, altText });
    },

    async reorder(actor: Actor, listingId: string, photoIds: string[]): Promise<ListingPhoto[]> {
      await editableListing(actor, listingId);
      return dataSource.transaction(async (manager) => {
        const photos = await manager.getRepository(ListingPhotoEntity).find({ where: { listingId } });
        const known = new Set(photos.map((p) => p.id));
        if (photoIds.length !== photos.length || photoIds.some((id) => !known.has(id)) || new Set(photoIds).size !== photoIds.length) {
          throw new Invalid("Send every photo of the listing once, in the new order.", { photoIds: "Every photo once." });
        }
        for (const [position, id] of photoIds.entries()) await manager.getRepository(ListingPhotoEntity).update({ id }, { position });
        const ordered = await manager.getRepository(ListingPhotoEntity).find({ where: { listingId }, order: { position: "ASC" } });
        return ordered.map(photoView);
      });
    },

    async remove(actor: Actor, listingId: string, photoId: string): Promise<void> {
      const photo = await ownPhoto(actor, listingId, photoId);
      await dataSource.getRepository(ListingPhotoEntity).delete({ id: photo.id });
      // The row is gone first, so nothing points at the objects any more; a failed delete only leaves unreachable bytes.
      await deleteObjects(storage.client, storage.bucket, keysOf(listingId, photoId)).catch(() => undefined);
    },

    /** A served size: public once the listing is live; before that only its sawyer and admins. */
    async image(actor: Actor, photoId: string, size: DisplaySizeName): Promise<Buffer> {
      const photo = await dataSource.getRepository(ListingPhotoEntity).findOne({ where: { id: photoId }, relations: { listing: true } });
      if (!photo?.listing) throw new NotFound("No such photo.");
      if (!PUBLIC_STATUSES.includes(photo.listing.status)) {
        const isOwner = actor.kind === "account" && actor.accountId === photo.listing.sawyerId;
        const isAdmin = actor.kind === "account" && actor.role === "admin";
        if (!isOwner && !isAdmin) throw new NotFound("No such photo.");
      }
      const bytes = await servedSize(storage, (name) => displayKey(photo.listingId, photo.id, name), size);
      if (!bytes) throw new NotFound("That photo is missing from storage.");
      return bytes;
    },
  };
}

/**
 * One served size from storage. Photos uploaded before the medium size existed have none: it is
 * made once from their large size, stored beside it, and served from then on.
 */
async function servedSize(storage: PhotoStorage, keyOf: (size: DisplaySizeName) => string, size: DisplaySizeName): Promise<Buffer | null> {
  const bytes = await getObjectBytes(storage.client, storage.bucket, keyOf(size));
  if (bytes || size !== "medium") return bytes;
  const large = await getObjectBytes(storage.client, storage.bucket, keyOf("large"));
  if (!large) return null;
  const medium = await mediumFromLarge(large);
  await putObject(storage.client, storage.bucket, keyOf("medium"), medium, "image/webp", { private: false });
  return medium;
}

export type PhotoService = ReturnType<typeof createPhotoService>;

/**
 * Stores a photo for a listing without the request checks (the seed's painted demo photos): the
 * same pipeline — inspected, resized to WebP without metadata, original kept private. Answers the
 * row for the caller to insert in its own transaction (storage first, the row last, as uploads do).
 */
export async function storeSeedPhoto(
  storage: PhotoStorage,
  listingId: string,
  position: number,
  bytes: Buffer,
  altText: string,
): Promise<Pick<ListingPhotoEntity, "id" | "listingId" | "position" | "altText" | "width" | "height" | "originalFormat">> {
  const inspection = await inspectPhoto(bytes);
  const { sizes } = await renderDisplaySizes(bytes);
  const photoId = randomUUID();
  const clean = await cleanOriginal(bytes);
  await putObject(storage.client, storage.bucket, originalKey(listingId, photoId), clean.bytes, clean.contentType, { private: true });
  for (const size of sizes)
    await putObject(storage.client, storage.bucket, displayKey(listingId, photoId, size.name), size.bytes, size.contentType, {
      private: false,
    });
  const large = sizes.find((s) => s.name === "large") ?? sizes[0]!;
  return { id: photoId, listingId, position, altText, width: large.width, height: large.height, originalFormat: inspection.format };
}

/** Listing states that make a log's photos public (its story is shown on the slab page). */
const LOG_PUBLIC_STATUSES = ["live", "reserved", "sold"];

export function logPhotoView(photo: LogPhotoEntity): ListingPhoto {
  return {
    id: photo.id,
    position: photo.position,
    altText: photo.altText,
    width: photo.width,
    height: photo.height,
    smallUrl: pathOf(yardEndpoints.logPhotoImage, { photoId: photo.id, size: "small" }),
    mediumUrl: pathOf(yardEndpoints.logPhotoImage, { photoId: photo.id, size: "medium" }),
    largeUrl: pathOf(yardEndpoints.logPhotoImage, { photoId: photo.id, size: "large" }),
  };
}

/** Photos of logs: the sawyer's own, through the same pipeline as listing photos. */
export function createLogPhotoService(deps: { dataSource: DataSource; storage: PhotoStorage }) {
  const { dataSource, storage } = deps;
  const keysOf = (logId: string, photoId: string) => [
    logPhotoKey(logId, photoId, "original"),
    logPhotoKey(logId, photoId, "small"),
    logPhotoKey(logId, photoId, "medium"),
    logPhotoKey(logId, photoId, "large"),
  ];

  async function ownLog(actor: Actor, logId: string) {
    const sawyer = requireRole(actor, "sawyer");
    const log = await dataSource.getRepository(YardLogEntity).findOneBy({ id: logId });
    if (!log) throw new NotFound("No log with that id in your yard.");
    if (log.sawyerId !== sawyer.accountId) throw new Forbidden("That log belongs to another yard.");
    return log;
  }

  return {
    async list(logId: string): Promise<ListingPhoto[]> {
      const photos = await dataSource.getRepository(LogPhotoEntity).find({ where: { logId }, order: { position: "ASC" } });
      return photos.map(logPhotoView);
    },

    async upload(actor: Actor, logId: string, bytes: Buffer, altText: string): Promise<ListingPhoto> {
      const log = await ownLog(actor, logId);
      if (altText.length > 300) throw new Invalid("Keep the description under 300 characters.", { altText: "At most 300 characters." });
      if ((await dataSource.getRepository(LogPhotoEntity).countBy({ logId })) >= MAX_PHOTOS_PER_LISTING) {
        throw new Conflict(`A log holds at most ${MAX_PHOTOS_PER_LISTING} photos.`, "too_many_photos");
      }
      const inspection = await inspectPhoto(bytes);
      const { sizes } = await renderDisplaySizes(bytes);
      const clean = await cleanOriginal(bytes);
      const photoId = randomUUID();
      const stored: string[] = [];
      try {
        const original = logPhotoKey(log.id, photoId, "original");
        await putObject(storage.client, storage.bucket, original, clean.bytes, clean.contentType, { private: true });
        stored.push(original);
        for (const size of sizes) {
          const key = logPhotoKey(log.id, photoId, size.name);
          await putObject(storage.client, storage.bucket, key, size.bytes, size.contentType, { private: false });
          stored.push(key);
        }
        const large = sizes.find((s) => s.name === "large") ?? sizes[0]!;
        const photo = await dataSource.transaction(async (manager) => {
          await manager.getRepository(YardLogEntity).findOne({ where: { id: log.id }, lock: { mode: "pessimistic_write" } });
          const photos = await manager.getRepository(LogPhotoEntity).find({ where: { logId: log.id } });
          if (photos.length >= MAX_PHOTOS_PER_LISTING)
            throw new Conflict(`A log holds at most ${MAX_PHOTOS_PER_LISTING} photos.`, "too_many_photos");
          const entity = manager.getRepository(LogPhotoEntity).create({
            id: photoId,
            logId: log.id,
            position: photos.reduce((max, p) => Math.max(max, p.position), -1) + 1,
            altText: altText.trim(),
            width: large.width,
            height: large.height,
            originalFormat: inspection.format,
          });
          await manager.getRepository(LogPhotoEntity).insert(entity);
          return entity;
        });
        return logPhotoView(photo);
      } catch (error) {
        if (stored.length) await deleteObjects(storage.client, storage.bucket, stored).catch(() => undefined);
        throw error;
      }
    },

    async remove(actor: Actor, logId: string, photoId: string): Promise<void> {
      await ownLog(actor, logId);
      const photo = await dataSource.getRepository(LogPhotoEntity).findOneBy({ id: photoId, logId });
      if (!photo) throw new NotFound("No photo with that id on this log.");
      await dataSource.getRepository(LogPhotoEntity).delete({ id: photo.id });
      await deleteObjects(storage.client, storage.bucket, keysOf(logId, photoId)).catch(() => undefined);
    },

    /** A served size: public once a slab from the log is in a live listing; before that its sawyer and admins. */
    async image(actor: Actor, photoId: string, size: DisplaySizeName): Promise<Buffer> {
      const photo = await dataSource.getRepository(LogPhotoEntity).findOne({ where: { id: photoId }, relations: { log: true } });
      if (!photo?.log) throw new NotFound("No such photo.");
      const isOwner = actor.kind === "account" && actor.accountId === photo.log.sawyerId;
      const isAdmin = actor.kind === "account" && actor.role === "admin";
      if (!isOwner && !isAdmin) {
        const shown = await dataSource
          .getRepository(ListingSlabEntity)
          .createQueryBuilder("link")
          .innerJoin("link.slab", "slab")
          .innerJoin("link.listing", "listing")
          .where("slab.log_id = :logId", { logId: photo.logId })
          .andWhere("listing.status IN (:...statuses)", { statuses: LOG_PUBLIC_STATUSES })
          .getCount();
        if (shown === 0) throw new NotFound("No such photo.");
      }
      const bytes = await servedSize(storage, (name) => logPhotoKey(photo.logId, photo.id, name), size);
      if (!bytes) throw new NotFound("That photo is missing from storage.");
      return bytes;
    },
  };
}

export type LogPhotoService = ReturnType<typeof createLogPhotoService>;
