import escapeHtml from "escape-html";
import type { buyerEndpoints } from "@grainyard/contracts";
import { AppError } from "../errors.ts";
import type { FileReply, Handlers } from "../http/endpoints.ts";
import type { FavouriteService } from "../services/favourite-service.ts";
import type { SavedSearchService } from "../services/saved-search-service.ts";

/** The one HTML answer of the API: what a person sees after following an e-mail's unsubscribe link. */
function htmlPage(status: number, heading: string, text: string): FileReply {
  return {
    status,
    contentType: "text/html; charset=utf-8",
    cacheControl: "no-store",
    body:
      `<!doctype html><html lang="en"><head><meta charset="utf-8"><meta name="viewport" content="width=device-width, initial-scale=1"><meta name="robots" content="noindex"><title>${escapeHtml(heading)} · Grainyard</title></head>` +
      `<body style="margin:0;background:#f6f1e8;font-family:Georgia,serif;color:#2a211b;line-height:1.5"><main style="max-width:560px;margin:0 auto;padding:48px 20px"><p style="font-weight:bold;font-size:20px;margin:0 0 24px">Grainyard</p><h1 style="font-size:26px;line-height:1.25">${escapeHtml(heading)}</h1><p>${escapeHtml(text)}</p><p><a href="/saved-searches" style="color:#3d5a31;font-weight:bold">Your saved searches</a> · <a href="/" style="color:#9c4d1d">Back to Grainyard</a></p></main></body></html>`,
  };
}

/** A buyer's saved searches and favourites, and the sign-in-free unsubscribe link of their alert e-mails. */
export function buyerHandlers(savedSearches: SavedSearchService, favourites: FavouriteService): Handlers<typeof buyerEndpoints> {
  return {
    listSavedSearches: async ({ actor }) => ({ savedSearches: await savedSearches.list(actor) }),
    saveSearch: async ({ actor, body }) => ({ savedSearch: await savedSearches.create(actor, body) }),
    updateSavedSearch: async ({ actor, params, body }) => ({ savedSearch: await savedSearches.update(actor, params.savedSearchId, body) }),
    deleteSavedSearch: ({ actor, params }) => savedSearches.remove(actor, params.savedSearchId),
    unsubscribeSavedSearch: async ({ query }) => {
      try {
        const { name } = await savedSearches.unsubscribe(query.token ?? "");
        return htmlPage(
          200,
          `Alerts for “${name}” are off`,
          "We will not e-mail you about this search again. It stays in your saved searches: sign in to turn alerts back on or to delete it.",
        );
      } catch (error) {
        if (!(error instanceof AppError)) throw error;
        const status = error.status === 422 ? 400 : error.status;
        return htmlPage(status, status === 404 ? "That search is gone" : "This link does not work", error.message);
      }
    },
    listFavourites: async ({ actor }) => ({ favourites: await favourites.list(actor) }),
    addFavourite: async ({ actor, params }) => ({ favourite: await favourites.add(actor, params.listingId) }),
    removeFavourite: ({ actor, params }) => favourites.remove(actor, params.listingId),
  };
}
