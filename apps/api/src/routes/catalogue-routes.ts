import { Router } from "express";
import { catalogueQuerySchema } from "@grainyard/contracts";
import { z } from "zod";
import { parse } from "../http/context.ts";
import type { CatalogueService } from "../services/catalogue-service.ts";
import { searchPlaces } from "../services/places.ts";

const placeQuerySchema = z.object({ query: z.string().trim().min(1, "Type the start of a town name.").max(80) });

/** The public catalogue: search, slab pages, and towns to search around. */
export function catalogueRoutes(catalogue: CatalogueService) {
  const router = Router();
  router.get("/catalogue", async (req, res) => {
    const { json, etag } = await catalogue.searchAnswer(parse(catalogueQuerySchema, req.query));
    res.setHeader("etag", etag);
    if (req.fresh) res.status(304).end();
    else res.type("application/json").send(json);
  });
  router.get("/catalogue/:listingId", async (req, res) => {
    res.json(await catalogue.detail(req.actor, String(req.params.listingId)));
  });
  router.get("/places", async (req, res) => {
    res.json({ places: searchPlaces(parse(placeQuerySchema, req.query).query) });
  });
  return router;
}
