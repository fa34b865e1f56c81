import express, { Router } from "express";
import { photoAltTextSchema, photoOrderSchema } from "@grainyard/contracts";
import { NotFound } from "../errors.ts";
import { parse } from "../http/context.ts";
import { MAX_PHOTO_BYTES } from "../photos/index.ts";
import type { LogPhotoService, PhotoService } from "../services/photo-service.ts";

/** Listing photos: upload as the raw request body (so the browser can show upload progress). */
export function photoRoutes(photos: PhotoService, logPhotos: LogPhotoService) {
  const router = Router();
  const id = (value: string | string[] | undefined) => String(value);

  router.post("/yard/listings/:listingId/photos", express.raw({ type: () => true, limit: MAX_PHOTO_BYTES }), async (req, res) => {
    const bytes = Buffer.isBuffer(req.body) ? req.body : Buffer.alloc(0);
    const altText = typeof req.query.altText === "string" ? req.query.altText : "";
    res.status(201).json({ photo: await photos.upload(req.actor, id(req.params.listingId), bytes, altText) });
  });
  router.patch("/yard/listings/:listingId/photos/:photoId", async (req, res) => {
    const { altText } = parse(photoAltTextSchema, req.body);
    res.json({ photo: await photos.setAltText(req.actor, id(req.params.listingId), id(req.params.photoId), altText) });
  });
  router.put("/yard/listings/:listingId/photo-order", async (req, res) => {
    res.json({ photos: await photos.reorder(req.actor, id(req.params.listingId), parse(photoOrderSchema, req.body).photoIds) });
  });
  router.delete("/yard/listings/:listingId/photos/:photoId", async (req, res) => {
    await photos.remove(req.actor, id(req.params.listingId), id(req.params.photoId));
    res.status(204).end();
  });
  router.get("/photos/:photoId/:size.webp", async (req, res) => {
    const size = id(req.params.size);
    if (size !== "small" && size !== "medium" && size !== "large") throw new NotFound("No such photo size.");
    const bytes = await photos.image(req.actor, id(req.params.photoId), size);
    res.setHeader("content-type", "image/webp");
    res.setHeader("cache-control", "private, max-age=300");
    res.setHeader("x-content-type-options", "nosniff");
    res.send(bytes);
  });
  router.post("/yard/logs/:logId/photos", express.raw({ type: () => true, limit: MAX_PHOTO_BYTES }), async (req, res) => {
    const bytes = Buffer.isBuffer(req.body) ? req.body : Buffer.alloc(0);
    const altText = typeof req.query.altText === "string" ? req.query.altText : "";
    res.status(201).json({ photo: await logPhotos.upload(req.actor, id(req.params.logId), bytes, altText) });
  });
  router.delete("/yard/logs/:logId/photos/:photoId", async (req, res) => {
    await logPhotos.remove(req.actor, id(req.params.logId), id(req.params.photoId));
    res.status(204).end();
  });
  router.get("/log-photos/:photoId/:size.webp", async (req, res) => {
    const size = id(req.params.size);
    if (size !== "small" && size !== "medium" && size !== "large") throw new NotFound("No such photo size.");
    const bytes = await logPhotos.image(req.actor, id(req.params.photoId), size);
    res.setHeader("content-type", "image/webp");
    res.setHeader("cache-control", "private, max-age=300");
    res.send(bytes);
  });
  return router;
}
