import { z } from "zod";
import {
  favouriteEnvelopeSchema,
  favouriteListSchema,
  messageInputSchema,
  messagePostedSchema,
  savedSearchEnvelopeSchema,
  savedSearchInputSchema,
  savedSearchListSchema,
  savedSearchUpdateSchema,
  threadDetailSchema,
  threadListSchema,
} from "../buyer-tools.ts";
import { endpoint } from "../endpoint.ts";
import { API_PREFIX } from "./prefix.ts";

const buyerOnly = ["buyer"] as const;

/** A buyer's saved searches (with e-mail alerts) and favourites. */
export const buyerEndpoints = {
  listSavedSearches: endpoint({
    method: "GET",
    path: `${API_PREFIX}/saved-searches`,
    summary: "The buyer's saved searches.",
    access: buyerOnly,
    answer: savedSearchListSchema,
  }),
  saveSearch: endpoint({
    method: "POST",
    path: `${API_PREFIX}/saved-searches`,
    summary: "Save a catalogue search, with or without e-mail alerts.",
    access: buyerOnly,
    body: savedSearchInputSchema,
    answer: savedSearchEnvelopeSchema,
    status: 201,
    errors: ["too_many_saved_searches", "unknown_place", "bad_cursor"],
  }),
  updateSavedSearch: endpoint({
    method: "PATCH",
    path: `${API_PREFIX}/saved-searches/:savedSearchId`,
    summary: "Rename a saved search or turn its alerts on or off.",
    access: buyerOnly,
    body: savedSearchUpdateSchema,
    answer: savedSearchEnvelopeSchema,
    errors: ["unknown_place", "bad_cursor"],
  }),
  deleteSavedSearch: endpoint({
    method: "DELETE",
    path: `${API_PREFIX}/saved-searches/:savedSearchId`,
    summary: "Delete a saved search.",
    access: buyerOnly,
    answer: null,
    status: 204,
  }),
  unsubscribeSavedSearch: endpoint({
    method: "GET",
    path: `${API_PREFIX}/saved-searches/unsubscribe`,
    summary: "The alert e-mail's link: turns that search's alerts off without signing in; answers a small page.",
    access: "anyone",
    query: z.object({ token: z.string().optional() }),
    answer: { file: "html" },
    errors: ["link_invalid"],
  }),
  listFavourites: endpoint({
    method: "GET",
    path: `${API_PREFIX}/favourites`,
    summary: "The buyer's favourite listings as catalogue cards.",
    access: buyerOnly,
    answer: favouriteListSchema,
  }),
  addFavourite: endpoint({
    method: "PUT",
    path: `${API_PREFIX}/favourites/:listingId`,
    summary: "Keep a live listing among the favourites.",
    access: buyerOnly,
    answer: favouriteEnvelopeSchema,
  }),
  removeFavourite: endpoint({
    method: "DELETE",
    path: `${API_PREFIX}/favourites/:listingId`,
    summary: "Drop a listing from the favourites.",
    access: buyerOnly,
    answer: null,
    status: 204,
  }),
} as const;

/** Questions about a listing between a buyer and its sawyer. */
export const messageEndpoints = {
  askAboutListing: endpoint({
    method: "POST",
    path: `${API_PREFIX}/listings/:listingId/messages`,
    summary: "Ask a listing's sawyer a question (starts or continues the conversation).",
    access: ["buyer", "sawyer"],
    body: messageInputSchema,
    answer: messagePostedSchema,
    status: 201,
    errors: ["own_listing"],
  }),
  listThreads: endpoint({
    method: "GET",
    path: `${API_PREFIX}/threads`,
    summary: "The conversations the account takes part in.",
    access: "signed_in",
    answer: threadListSchema,
  }),
  getThread: endpoint({
    method: "GET",
    path: `${API_PREFIX}/threads/:threadId`,
    summary: "One conversation (its two people, or an admin reading a report); reading it marks it read.",
    access: "signed_in",
    answer: threadDetailSchema,
  }),
  replyInThread: endpoint({
    method: "POST",
    path: `${API_PREFIX}/threads/:threadId/messages`,
    summary: "Answer in a conversation.",
    access: ["buyer", "sawyer"],
    body: messageInputSchema,
    answer: messagePostedSchema,
    status: 201,
  }),
} as const;
