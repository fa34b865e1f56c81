import { Router } from "express";
import type { FavouriteService } from "../services/favourite-service.ts";

/** A buyer's favourite listings. */
export function favouriteRoutes(favourites: FavouriteService) {
  const router = Router();
  router.get("/favourites", async (req, res) => {
    res.json({ favourites: await favourites.list(req.actor) });
  });
  router.put("/favourites/:listingId", async (req, res) => {
    res.json({ favourite: await favourites.add(req.actor, String(req.params.listingId)) });
  });
  router.delete("/favourites/:listingId", async (req, res) => {
    await favourites.remove(req.actor, String(req.params.listingId));
    res.status(204).end();
  });
  return router;
}
