import { z } from "zod";
import { hasLetter } from "./common.ts";
import { yardRatingSchema } from "./order-reviews.ts";
import { liveEdges, slabFeatures } from "./yard.ts";
import { currencies, listingFiguresSchema, listingPhotoSchema, setKinds } from "./listings.ts";
import { moistureReadingSchema, photoSchema, slabSchema, logSchema } from "./yard.ts";

/*
 * The buyers' catalogue: live listings, filtered and sorted, paged with an opaque cursor.
 * Query values travel as text in the URL (the web keeps every filter there); measurements in
 * millimetres, prices in minor units.
 */
export const catalogueSorts = ["newest", "price_low", "price_high", "price_per_board_foot", "largest", "nearest"] as const;
export const catalogueSortLabels = {
  newest: "Newest first",
  price_low: "Price, low to high",
  price_high: "Price, high to low",
  price_per_board_foot: "Price per board foot",
  largest: "Largest first",
  nearest: "Nearest first",
} as const;

const list = <T extends readonly [string, ...string[]]>(values: T, label: string) =>
  z
    .string()
    .transform((text) =>
      text
        .split(",")
        .map((part) => part.trim())
        .filter(Boolean),
    )
    .pipe(z.array(z.enum(values, { error: `Unknown ${label}.` })).max(values.length));
const millimetres = (label: string) =>
  z.coerce
    .number({ error: `The ${label} must be a number of millimetres.` })
    .int(`Give the ${label} in whole millimetres.`)
    .min(0, `The ${label} cannot be negative.`)
    .max(12_000, `The ${label} is beyond any slab.`);
const money = (label: string) =>
  z.coerce
    .number({ error: `The ${label} must be a number.` })
    .int(`Give the ${label} in cents.`)
    .min(0, `The ${label} cannot be negative.`)
    .max(100_000_000);
const flag = z.enum(["1", "true", "0", "false"]).transform((v) => v === "1" || v === "true");

export const catalogueQuerySchema = z
  .object({
    species: z
      .string()
      .transform((text) =>
        text
          .split(",")
          .map((part) => part.trim())
          .filter(Boolean),
      )
      .pipe(z.array(z.string().regex(/^[a-z][a-z0-9-]{1,60}$/, "Unknown species.")).max(40))
      .optional(),
    lengthMin: millimetres("shortest length").optional(),
    lengthMax: millimetres("longest length").optional(),
    widthMin: millimetres("narrowest width").optional(),
    widthMax: millimetres("widest width").optional(),
    widthBasis: z.enum(["average", "minimum"]).default("average"),
    thicknessMin: millimetres("thinnest thickness").optional(),
    thicknessMax: millimetres("thickest thickness").optional(),
    moistureMax: z.coerce
      .number({ error: "Moisture content must be a number." })
      .min(0, "Moisture content cannot be negative.")
      .max(100)
      .optional(),
    ready: flag.optional(),
    priceMin: money("lowest price").optional(),
    priceMax: money("highest price").optional(),
    liveEdge: list(liveEdges, "edge choice").optional(),
    features: list(slabFeatures, "feature").optional(),
    sets: list(["single", "sequential", "bookmatched"] as const, "set kind").optional(),
    // A town's name has letters of some script; digits, punctuation or emoji alone match no place.
    near: z
      .string()
      .trim()
      .max(120)
      .refine((text) => text === "" || hasLetter(text), "Type a town's name.")
      .optional(),
    radiusKm: z.coerce
      .number({ error: "The distance must be a number of kilometres." })
      .min(1, "Search at least 1 km around.")
      .max(5000)
      .optional(),
    freight: flag.optional(),
    // "Fits my table": the finished top wanted (mm), or a number of diners.
    fitLength: z.coerce
      .number({ error: "Give the top's length in millimetres." })
      .int()
      .min(200, "A top is at least 200 mm long.")
      .max(12_000)
      .optional(),
    fitWidth: z.coerce
      .number({ error: "Give the top's width in millimetres." })
      .int()
      .min(100, "A top is at least 100 mm wide.")
      .max(3_000)
      .optional(),
    fitThickness: z.coerce
      .number({ error: "Give the top's thickness in millimetres." })
      .int()
      .min(10, "A top is at least 10 mm thick.")
      .max(300)
      .optional(),
    fitEdge: z.enum(["keep_live_edge", "trim_straight"]).default("keep_live_edge"),
    seats: z.coerce
      .number({ error: "Give the number of diners." })
      .int("Give a whole number of diners.")
      .min(2, "A table seats at least 2.")
      .max(20, "Twenty diners is the most we plan for.")
      .optional(),
    sort: z.enum(catalogueSorts, { error: "Unknown sort order." }).default("newest"),
    cursor: z.string().max(400).optional(),
    limit: z.coerce.number().int().min(1).max(60).default(24),
  })
  .superRefine((query, context) => {
    const pairs: [keyof typeof query, keyof typeof query, string][] = [
      ["lengthMin", "lengthMax", "length"],
      ["widthMin", "widthMax", "width"],
      ["thicknessMin", "thicknessMax", "thickness"],
      ["priceMin", "priceMax", "price"],
    ];
    for (const [low, high, label] of pairs) {
      const a = query[low] as number | undefined;
      const b = query[high] as number | undefined;
      if (a !== undefined && b !== undefined && a > b)
        context.addIssue({ code: "custom", path: [low], message: `The lowest ${label} is above the highest.` });
    }
    if (query.sort === "nearest" && !query.near)
      context.addIssue({ code: "custom", path: ["sort"], message: "Choose a town to sort by distance." });
    if (query.radiusKm !== undefined && !query.near)
      context.addIssue({ code: "custom", path: ["radiusKm"], message: "Choose a town to search around." });
    if (query.seats !== undefined && query.fitLength !== undefined)
      context.addIssue({ code: "custom", path: ["seats"], message: "Give either the number of diners or the top's length, not both." });
  });
export type CatalogueQuery = z.input<typeof catalogueQuerySchema>;
export type CatalogueQueryParsed = z.output<typeof catalogueQuerySchema>;

export const catalogueCardSchema = z.object({
  listingId: z.string(),
  title: z.string(),
  speciesSlug: z.string(),
  setKind: z.enum(setKinds),
  slabCount: z.number(),
  lengthMm: z.number(),
  averageWidthMm: z.number(),
  minWidthMm: z.number(),
  thicknessMm: z.number(),
  boardFeet: z.number(),
  volumeM3: z.number(),
  /** The whole set (one slab: the slab), central estimate, kg. */
  weightKg: z.number(),
  /** The whole set, high end, kg: never below `heaviestSlabHighKg`. */
  totalWeightHighKg: z.number(),
  /** The heaviest single slab, high end, kg: the lifting advice's weight. */
  heaviestSlabHighKg: z.number(),
  moisturePct: z.number().nullable(),
  ready: z.boolean(),
  priceMinor: z.number(),
  pricePerBoardFootMinor: z.number(),
  currency: z.enum(currencies),
  liveEdge: z.enum(liveEdges),
  features: z.array(z.enum(slabFeatures)),
  freight: z.boolean(),
  pickup: z.boolean(),
  town: z.string().nullable(),
  yardName: z.string().nullable(),
  /** The address of the yard's public page (`/yards/<slug>`). */
  yardSlug: z.string().nullable(),
  /** The yard's rating from its buyers' reviews (mean to one decimal, and how many); null before its first review. */
  yardRating: z.object({ average: z.number(), count: z.number() }).nullable(),
  distanceKm: z.number().nullable(),
  /** With a fit search: the margin left over the wanted top, mm. */
  fit: z.object({ spareLengthMm: z.number(), spareWidthMm: z.number(), spareThicknessMm: z.number() }).nullable(),
  /** The first photo, small (400 px); `photoMediumUrl` is the same at 800 px, for sharp screens. */
  photoUrl: z.string().nullable(),
  photoMediumUrl: z.string().nullable(),
  photoAlt: z.string().nullable(),
  publishedAt: z.string(),
});
export type CatalogueCard = z.infer<typeof catalogueCardSchema>;

export const catalogueResultSchema = z.object({
  results: z.array(catalogueCardSchema),
  total: z.number(),
  /** The count stopped at its cap: there are at least `total` matches. */
  totalIsAtLeast: z.boolean(),
  nextCursor: z.string().nullable(),
  near: z.object({ name: z.string(), region: z.string(), latitude: z.number(), longitude: z.number() }).nullable(),
  /** The top that was searched for (after turning diners into a size). */
  fitTop: z.object({ lengthMm: z.number(), widthMm: z.number(), thicknessMm: z.number(), seats: z.number().nullable() }).nullable(),
});
export type CatalogueResult = z.infer<typeof catalogueResultSchema>;

export const placeSchema = z.object({
  id: z.string(),
  name: z.string(),
  region: z.string(),
  country: z.string(),
  latitude: z.number(),
  longitude: z.number(),
});
export type Place = z.infer<typeof placeSchema>;
export const placeListSchema = z.object({ places: z.array(placeSchema) });

/** How many live slabs each species has in the catalogue (species with none are left out), for the browse filter. */
export const speciesCountsSchema = z.object({ species: z.array(z.object({ slug: z.string(), liveSlabs: z.number() })) });
export type SpeciesCounts = z.infer<typeof speciesCountsSchema>["species"];

/** Everything a buyer sees on a slab page. */
export const catalogueDetailSchema = z.object({
  listing: z.object({
    id: z.string(),
    title: z.string(),
    description: z.string(),
    setKind: z.enum(setKinds),
    priceMode: z.string(),
    rateMinor: z.number(),
    currency: z.enum(currencies),
    pickup: z.boolean(),
    freight: z.boolean(),
    status: z.string(),
    /** Whether the sawyer takes offers on it (their floor is never shown). */
    offersWelcome: z.boolean(),
    /** What a buyer needs; the fee split is the sawyer's business. */
    figures: listingFiguresSchema.pick({
      boardFeet: true,
      volumeM3: true,
      weightKg: true,
      weightLowKg: true,
      weightHighKg: true,
      heavyLift: true,
      priceMinor: true,
    }),
    photos: z.array(listingPhotoSchema),
    publishedAt: z.string().nullable(),
  }),
  slabs: z.array(slabSchema.extend({ readings: z.array(moistureReadingSchema) })),
  log: logSchema.nullable(),
  /** Photos of the log (the tree as felled, the cut ends). */
  logPhotos: z.array(photoSchema),
  otherSlabsFromLog: z.array(
    z.object({ id: z.string(), sequenceInLog: z.number().nullable(), listingId: z.string().nullable(), status: z.string() }),
  ),
  yard: z.object({
    /** The sawyer's account id: their yard's reviews are at `orderReviews.yardReviews`. */
    id: z.string(),
    name: z.string().nullable(),
    /** The address of the yard's public page (`/yards/<slug>`). */
    slug: z.string().nullable(),
    town: z.string().nullable(),
    latitude: z.number().nullable(),
    longitude: z.number().nullable(),
    rating: yardRatingSchema,
  }),
});
export type CatalogueDetail = z.infer<typeof catalogueDetailSchema>;
