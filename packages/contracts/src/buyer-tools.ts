import { z } from "zod";
import { catalogueCardSchema } from "./catalogue.ts";

/*
 * Buyer tools: saved searches with e-mail alerts, favourites, and messages about a listing.
 */

// ---- Saved searches ----------------------------------------------------------------------

/** Parts of a catalogue query that say how to page, not what to find: never stored. */
export const savedSearchIgnoredKeys = ["cursor", "sort", "limit"] as const;

const savedSearchName = z
  .string({ error: "Give the search a name." })
  .trim()
  .min(1, "Give the search a name.")
  .max(80, "Keep the name under 80 characters.");

export const savedSearchInputSchema = z.object({
  name: savedSearchName,
  /** The catalogue query as a URL query string, e.g. "seats=8&species=black-walnut" (a leading "?" is fine). */
  query: z.string({ error: "Give the search to save." }).trim().max(2000, "That search is too long to save."),
  alerts: z.boolean({ error: "Say whether to send alerts." }).default(true),
});
export type SavedSearchInput = z.input<typeof savedSearchInputSchema>;

export const savedSearchUpdateSchema = z
  .object({ name: savedSearchName, alerts: z.boolean({ error: "Say whether to send alerts." }) })
  .partial()
  .refine((update) => update.name !== undefined || update.alerts !== undefined, {
    message: "Change the name or the alerts.",
    path: ["name"],
  });
export type SavedSearchUpdate = z.input<typeof savedSearchUpdateSchema>;

export const savedSearchSchema = z.object({
  id: z.string(),
  name: z.string(),
  /** Normalised query string (known filters only, no cursor/sort/limit): append to the catalogue URL. */
  query: z.string(),
  alerts: z.boolean(),
  /** When the last alert e-mail went out (at most one a day). */
  lastAlertAt: z.string().nullable(),
  /** Matches waiting for the next day's e-mail. */
  pendingMatches: z.number(),
  createdAt: z.string(),
});
export type SavedSearch = z.infer<typeof savedSearchSchema>;
export const savedSearchEnvelopeSchema = z.object({ savedSearch: savedSearchSchema });
export const savedSearchListSchema = z.object({ savedSearches: z.array(savedSearchSchema) });

// ---- Favourites --------------------------------------------------------------------------

export const favouriteSchema = z.object({ listingId: z.string(), createdAt: z.string() });
export type Favourite = z.infer<typeof favouriteSchema>;
export const favouriteEnvelopeSchema = z.object({ favourite: favouriteSchema });
/** Catalogue cards of favourited listings that are still live, most recently favourited first. */
export const favouriteListSchema = z.object({ favourites: z.array(catalogueCardSchema) });
export type FavouriteList = z.infer<typeof favouriteListSchema>;

// ---- Messages ----------------------------------------------------------------------------

/** The most one message may say (the web's reply box counts down to it). */
export const MESSAGE_MAX_CHARS = 4000;

export const messageInputSchema = z.object({
  body: z
    .string({ error: "Write a message." })
    .trim()
    .min(1, "Write a message.")
    .max(MESSAGE_MAX_CHARS, `Keep the message under ${MESSAGE_MAX_CHARS} characters.`),
});
export type MessageInput = z.input<typeof messageInputSchema>;

export const messageSchema = z.object({
  id: z.string(),
  threadId: z.string(),
  authorId: z.string(),
  authorName: z.string(),
  /** True when the reader wrote it. */
  fromMe: z.boolean(),
  body: z.string(),
  createdAt: z.string(),
  /** When the other party opened it; null while unread. */
  readAt: z.string().nullable(),
});
export type Message = z.infer<typeof messageSchema>;

export const threadSummarySchema = z.object({
  id: z.string(),
  listingId: z.string(),
  listingTitle: z.string(),
  /** The reader's side of the thread; "observer" for an admin reading someone else's. */
  myRole: z.enum(["buyer", "sawyer", "observer"]),
  buyer: z.object({ id: z.string(), displayName: z.string() }),
  sawyer: z.object({ id: z.string(), displayName: z.string(), yardName: z.string().nullable() }),
  /** The person the reader talks to (for an admin: the sawyer). */
  otherParty: z.object({ id: z.string(), displayName: z.string() }),
  lastMessage: z.object({ authorId: z.string(), fromMe: z.boolean(), excerpt: z.string(), createdAt: z.string() }).nullable(),
  /** Messages from the other party the reader has not opened yet (0 for an admin). */
  unreadCount: z.number(),
  lastMessageAt: z.string(),
  createdAt: z.string(),
});
export type ThreadSummary = z.infer<typeof threadSummarySchema>;
export const threadListSchema = z.object({ threads: z.array(threadSummarySchema) });
export const threadDetailSchema = z.object({ thread: threadSummarySchema, messages: z.array(messageSchema) });
export type ThreadDetail = z.infer<typeof threadDetailSchema>;
/** Answer to a new message: the thread (created or continued) and the message. */
export const messagePostedSchema = z.object({ thread: threadSummarySchema, message: messageSchema });
export type MessagePosted = z.infer<typeof messagePostedSchema>;
