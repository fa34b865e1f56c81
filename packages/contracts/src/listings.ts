import { z } from "zod";
import { slabSchema } from "./yard.ts";

/*
 * A listing puts one slab, or a set of sequential / bookmatched slabs from one log, up for sale.
 * Status names are Grainyard's own: draft → in_review → live, or sent_back (with the reviewer's
 * reason) → edited → in_review again; live → reserved → sold (checkout); withdrawn by the sawyer.
 * The admin may reject a submission (final), take a live listing down after a report, and while
 * a sawyer is suspended their live listings are "suspended" (hidden) until the account is restored.
 */
export const listingStatuses = [
  "draft",
  "in_review",
  "sent_back",
  "live",
  "reserved",
  "sold",
  "withdrawn",
  "rejected",
  "taken_down",
  "suspended",
] as const;
export type ListingStatus = (typeof listingStatuses)[number];

export const listingStatusLabels: Record<ListingStatus, string> = {
  draft: "Draft",
  in_review: "Waiting for review",
  sent_back: "Needs changes",
  live: "Live",
  reserved: "Reserved",
  sold: "Sold",
  withdrawn: "Withdrawn",
  rejected: "Rejected",
  taken_down: "Taken down",
  suspended: "Hidden (account suspended)",
};

export const priceModes = ["per_board_foot", "per_cubic_metre", "fixed"] as const;
export const priceModeLabels = { per_board_foot: "Per board foot", per_cubic_metre: "Per cubic metre", fixed: "Fixed price" } as const;
export const setKinds = ["single", "sequential", "bookmatched"] as const;
export const currencies = ["USD", "CAD", "EUR", "GBP"] as const;

const listingFields = {
  title: z
    .string({ error: "Give the listing a title." })
    .trim()
    .min(4, "Give the listing a title of at least 4 characters.")
    .max(120, "Keep the title under 120 characters."),
  description: z.string().trim().max(5000, "Keep the description under 5000 characters."),
  slabIds: z
    .array(z.string().uuid("Choose slabs from your yard."))
    .min(1, "Choose at least one slab.")
    .max(12, "A set holds at most 12 slabs."),
  setKind: z.enum(setKinds),
  priceMode: z.enum(priceModes, { error: "Choose how the price is set." }),
  rateMinor: z
    .number({ error: "Give the price." })
    .int("Give the price in whole cents.")
    .min(100, "The price must be at least 1.00.")
    .max(100_000_000, "That price is beyond what Grainyard takes."),
  currency: z.enum(currencies),
  pickup: z.boolean(),
  freight: z.boolean(),
};

function listingRules(listing: { pickup?: boolean; freight?: boolean; slabIds?: string[]; setKind?: string }, context: z.RefinementCtx) {
  if (listing.pickup === false && listing.freight === false)
    context.addIssue({ code: "custom", path: ["pickup"], message: "Offer pickup, freight, or both." });
  if (listing.slabIds && new Set(listing.slabIds).size !== listing.slabIds.length)
    context.addIssue({ code: "custom", path: ["slabIds"], message: "Each slab once." });
  if (listing.setKind === "bookmatched" && listing.slabIds && listing.slabIds.length !== 2)
    context.addIssue({ code: "custom", path: ["setKind"], message: "A bookmatched set is two neighbouring slabs." });
  if (listing.setKind === "single" && listing.slabIds && listing.slabIds.length > 1)
    context.addIssue({ code: "custom", path: ["setKind"], message: "Choose sequential or bookmatched for more than one slab." });
}

// Field schemas carry no defaults (partial updates must not reset fields); creation adds them.
export const listingInputSchema = z
  .object({
    ...listingFields,
    description: listingFields.description.default(""),
    setKind: listingFields.setKind.default("single"),
    currency: listingFields.currency.default("USD"),
    pickup: listingFields.pickup.default(true),
    freight: listingFields.freight.default(false),
  })
  .superRefine(listingRules);
export type ListingInput = z.input<typeof listingInputSchema>;
export const listingUpdateSchema = z.object(listingFields).partial().superRefine(listingRules);
export type ListingUpdate = z.input<typeof listingUpdateSchema>;

export const listingFiguresSchema = z.object({
  boardFeet: z.number(),
  volumeM3: z.number(),
  weightKg: z.number(),
  weightLowKg: z.number(),
  weightHighKg: z.number(),
  heavyLift: z.boolean(),
  priceMinor: z.number(),
  platformFeeMinor: z.number(),
  processingFeeMinor: z.number(),
  sawyerNetMinor: z.number(),
});
export type ListingFigures = z.infer<typeof listingFiguresSchema>;

export const listingPhotoSchema = z.object({
  id: z.string(),
  position: z.number(),
  altText: z.string(),
  width: z.number(),
  height: z.number(),
  smallUrl: z.string(),
  /** 800 px on the long side: phones and catalogue cards. */
  mediumUrl: z.string(),
  largeUrl: z.string(),
});
export type ListingPhoto = z.infer<typeof listingPhotoSchema>;

export const listingSchema = z.object({
  id: z.string(),
  sawyerId: z.string(),
  yardName: z.string().nullable(),
  title: z.string(),
  description: z.string(),
  setKind: z.enum(setKinds),
  priceMode: z.enum(priceModes),
  rateMinor: z.number(),
  currency: z.enum(currencies),
  pickup: z.boolean(),
  freight: z.boolean(),
  status: z.enum(listingStatuses),
  /** Whether buyers may make offers, and the floor below which they are declined at once (the sawyer's eyes only). */
  offersWelcome: z.boolean(),
  offerFloorMinor: z.number().nullable(),
  reviewNote: z.string().nullable(),
  figures: listingFiguresSchema,
  slabs: z.array(slabSchema),
  photos: z.array(listingPhotoSchema),
  submittedAt: z.string().nullable(),
  publishedAt: z.string().nullable(),
  updatedAt: z.string(),
  createdAt: z.string(),
});
export type Listing = z.infer<typeof listingSchema>;

export const listingListSchema = z.object({ listings: z.array(listingSchema) });
export const listingEnvelopeSchema = z.object({ listing: listingSchema });

export const sendBackSchema = z.object({
  reason: z.string({ error: "Tell the sawyer what to change." }).trim().min(5, "Tell the sawyer what to change.").max(2000),
});
export type SendBackInput = z.infer<typeof sendBackSchema>;

export const photoAltTextSchema = z.object({ altText: z.string().trim().max(300, "Keep the description under 300 characters.") });
export const photoOrderSchema = z.object({ photoIds: z.array(z.string()).min(1).max(12) });

export const MAX_PHOTOS_PER_LISTING = 12;

/** 25 MB: a full-resolution phone photo is 2–12 MB; anything bigger is not a photo from a phone. */
export const MAX_PHOTO_BYTES = 25 * 1024 * 1024;
export const ACCEPTED_PHOTO_FORMATS_TEXT = "JPEG, PNG, WebP or HEIC";
/** What a browser may call a photo the API takes (HEIC often comes with no type at all). */
const PHOTO_TYPES = ["image/jpeg", "image/png", "image/webp", "image/heic", "image/heif", ""];
const PHOTO_NAME = /\.(jpe?g|png|webp|hei[cf])$/i;

/**
 * Why a picked file will not be taken, checked in the browser before anything is sent (the API
 * checks the bytes again); null when it may go up. A file with no type is judged by its name.
 */
export function photoFileProblem(file: { name: string; size: number; type: string }): string | null {
  if (file.size === 0) return `“${file.name}” is empty; choose a photo.`;
  if (file.size > MAX_PHOTO_BYTES)
    return `“${file.name}” is ${(file.size / (1024 * 1024)).toFixed(1)} MB; photos can be at most ${MAX_PHOTO_BYTES / (1024 * 1024)} MB.`;
  const type = file.type.toLowerCase();
  if (!PHOTO_TYPES.includes(type) || (type === "" && !PHOTO_NAME.test(file.name)))
    return `“${file.name}” is not a photo we can take; photos must be ${ACCEPTED_PHOTO_FORMATS_TEXT}.`;
  return null;
}
