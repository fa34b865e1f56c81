import { Router, type Response } from "express";
import { savedSearchInputSchema, savedSearchUpdateSchema } from "@grainyard/contracts";
import { AppError } from "../errors.ts";
import { parse } from "../http/context.ts";
import type { SavedSearchService } from "../services/saved-search-service.ts";

const escapeHtml = (s: string) =>
  s.replace(/[&<>"']/g, (c) => ({ "&": "&amp;", "<": "&lt;", ">": "&gt;", '"': "&quot;", "'": "&#39;" })[c]!);

/** The one HTML answer of the API: what a person sees after following an e-mail's unsubscribe link. */
function htmlPage(res: Response, status: number, heading: string, text: string) {
  res
    .status(status)
    .type("html")
    .setHeader("cache-control", "no-store")
    .send(
      `<!doctype html><html lang="en"><head><meta charset="utf-8"><meta name="viewport" content="width=device-width, initial-scale=1"><meta name="robots" content="noindex"><title>${escapeHtml(heading)} · Grainyard</title></head>` +
        `<body style="margin:0;background:#f6f1e8;font-family:Georgia,serif;color:#2a211b;line-height:1.5"><main style="max-width:560px;margin:0 auto;padding:48px 20px"><p style="font-weight:bold;font-size:20px;margin:0 0 24px">Grainyard</p><h1 style="font-size:26px;line-height:1.25">${escapeHtml(heading)}</h1><p>${escapeHtml(text)}</p><p><a href="/saved-searches" style="color:#3d5a31;font-weight:bold">Your saved searches</a> · <a href="/" style="color:#9c4d1d">Back to Grainyard</a></p></main></body></html>`,
    );
}

/** A buyer's saved searches, and the sign-in-free unsubscribe link of their alert e-mails. */
export function savedSearchRoutes(savedSearches: SavedSearchService) {
  const router = Router();
  const id = (value: string | string[] | undefined) => String(value);

  router.get("/saved-searches/unsubscribe", async (req, res) => {
    try {
      const { name } = await savedSearches.unsubscribe(typeof req.query.token === "string" ? req.query.token : "");
      htmlPage(
        res,
        200,
        `Alerts for “${name}” are off`,
        "We will not e-mail you about this search again. It stays in your saved searches: sign in to turn alerts back on or to delete it.",
      );
    } catch (error) {
      if (!(error instanceof AppError)) throw error;
      const status = error.status === 422 ? 400 : error.status;
      htmlPage(res, status, status === 404 ? "That search is gone" : "This link does not work", error.message);
    }
  });
  router.get("/saved-searches", async (req, res) => {
    res.json({ savedSearches: await savedSearches.list(req.actor) });
  });
  router.post("/saved-searches", async (req, res) => {
    res.status(201).json({ savedSearch: await savedSearches.create(req.actor, parse(savedSearchInputSchema, req.body)) });
  });
  router.patch("/saved-searches/:savedSearchId", async (req, res) => {
    res.json({
      savedSearch: await savedSearches.update(req.actor, id(req.params.savedSearchId), parse(savedSearchUpdateSchema, req.body)),
    });
  });
  router.delete("/saved-searches/:savedSearchId", async (req, res) => {
    await savedSearches.remove(req.actor, id(req.params.savedSearchId));
    res.status(204).end();
  });
  return router;
}
