import { Router } from "express";
import { listingInputSchema, listingUpdateSchema, sendBackSchema } from "@grainyard/contracts";
import { parse } from "../http/context.ts";
import type { ListingService } from "../services/listing-service.ts";

/** A sawyer's listings and the admin's review list. */
export function listingRoutes(listings: ListingService) {
  const router = Router();
  const id = (value: string | string[] | undefined) => String(value);

  router.get("/yard/listings", async (req, res) => {
    res.json({ listings: await listings.listOwn(req.actor) });
  });
  router.post("/yard/listings", async (req, res) => {
    res.status(201).json({ listing: await listings.create(req.actor, parse(listingInputSchema, req.body)) });
  });
  router.get("/yard/listings/:listingId", async (req, res) => {
    res.json({ listing: await listings.getOwn(req.actor, id(req.params.listingId)) });
  });
  router.patch("/yard/listings/:listingId", async (req, res) => {
    res.json({ listing: await listings.update(req.actor, id(req.params.listingId), parse(listingUpdateSchema, req.body)) });
  });
  router.post("/yard/listings/:listingId/submit", async (req, res) => {
    res.json({ listing: await listings.submit(req.actor, id(req.params.listingId)) });
  });
  router.post("/yard/listings/:listingId/withdraw", async (req, res) => {
    res.json({ listing: await listings.withdraw(req.actor, id(req.params.listingId)) });
  });

  router.get("/admin/listings", async (req, res) => {
    res.json({ listings: await listings.reviewQueue(req.actor) });
  });
  router.post("/admin/listings/:listingId/approve", async (req, res) => {
    res.json({ listing: await listings.approve(req.actor, id(req.params.listingId)) });
  });
  router.post("/admin/listings/:listingId/send-back", async (req, res) => {
    res.json({ listing: await listings.sendBack(req.actor, id(req.params.listingId), parse(sendBackSchema, req.body)) });
  });

  return router;
}
