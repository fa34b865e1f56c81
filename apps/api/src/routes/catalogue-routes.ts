import { Router, type Request, type Response } from "express";
import { API_PREFIX, catalogueQuerySchema } from "@grainyard/contracts";
import { z } from "zod";
import { parse } from "../http/context.ts";
import { gzippedAnswer, type CatalogueService } from "../services/catalogue-service.ts";
import { searchPlaces } from "../services/places.ts";
import type { SettingsService } from "../services/settings-service.ts";

const placeQuerySchema = z.object({ query: z.string().trim().min(1, "Type the start of a town name.").max(80) });

export const catalogueSearchPath = `${API_PREFIX}/catalogue`;

/**
 * The catalogue search: the same answer for everyone, so it needs no session (mounted before it in
 * app.ts). A query string asked in the last few seconds is answered from the service's cache
 * before it is parsed again, compressed once for every browser that takes gzip.
 */
export function catalogueSearch(catalogue: CatalogueService) {
  return async (req: Request, res: Response) => {
    const queryString = req.url.slice(req.url.indexOf("?") + 1 || req.url.length);
    const answer =
      catalogue.cachedAnswer(queryString) ?? (await catalogue.searchAnswer(parse(catalogueQuerySchema, req.query), queryString));
    res.setHeader("etag", answer.etag);
    res.setHeader("vary", "Accept-Encoding");
    if (req.fresh) {
      res.status(304).end();
      return;
    }
    res.type("application/json");
    if (req.headers["accept-encoding"] && req.acceptsEncodings("gzip") === "gzip") {
      res.setHeader("content-encoding", "gzip");
      res.send(gzippedAnswer(answer));
    } else res.send(answer.body);
  };
}

/** The rest of the public catalogue: slab pages, towns to search around, and the fees in force. */
export function catalogueRoutes(catalogue: CatalogueService, settings: Pick<SettingsService, "fees">) {
  const router = Router();
  router.get("/marketplace/fees", (_req, res) => {
    res.json({ fees: settings.fees() });
  });
  router.get("/catalogue/:listingId", async (req, res) => {
    res.json(await catalogue.detail(req.actor, String(req.params.listingId)));
  });
  router.get("/places", async (req, res) => {
    res.json({ places: searchPlaces(parse(placeQuerySchema, req.query).query) });
  });
  return router;
}
