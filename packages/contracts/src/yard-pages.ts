import { z } from "zod";
import { catalogueCardSchema } from "./catalogue.ts";
import { yardRatingSchema } from "./order-reviews.ts";
import { dryingProjectionSchema } from "./yard.ts";

/**
 * A yard's public page: who the sawyer is and what they have, for a buyer about to pay someone
 * they have never met. Only the town, never the street address (that comes with a booked pickup).
 */
export const yardPageSchema = z.object({
  yard: z.object({
    /** The sawyer's account id: the yard's reviews are at `orderReviews.yardReviews`. */
    id: z.string(),
    slug: z.string(),
    name: z.string(),
    story: z.string().nullable(),
    town: z.string().nullable(),
    /** When the sawyer joined Grainyard (ISO 8601). */
    memberSince: z.string(),
    /** Slabs handed over to buyers (a set counts each of its slabs). */
    slabsSold: z.number(),
    /** How fast the sawyer first answers a buyer's question (each thread's first question to the first answer after it). */
    firstReply: z.object({
      /** The median in minutes (slab-math's median); null before any question was answered. */
      medianMinutes: z.number().nullable(),
      /** Threads in which a buyer asked, and how many of them the sawyer answered. */
      asked: z.number(),
      answered: z.number(),
    }),
    rating: yardRatingSchema,
  }),
  /** Every live listing of the yard, newest first, as catalogue cards. */
  liveSlabs: z.array(catalogueCardSchema),
  /** Logs whose slabs are still drying (none listed or sold yet), with when slab-math projects them ready. */
  dryingLogs: z.array(
    z.object({
      id: z.string(),
      speciesSlug: z.string(),
      /** Where the tree stood: the town and the park or street, as on a slab page. */
      siteTown: z.string(),
      siteNeighbourhood: z.string(),
      felledOn: z.string().nullable(),
      milledOn: z.string().nullable(),
      slabCount: z.number(),
      thicknessMm: z.number(),
      /** The wettest slab's last reading, % MC, and its date. */
      lastMoisturePct: z.number().nullable(),
      lastReadOn: z.string().nullable(),
      /** The slowest slab's projection: the log is ready when its last slab is (projectedDate from slab-math's dryingProjection). */
      projection: dryingProjectionSchema,
    }),
  ),
});
export type YardPage = z.infer<typeof yardPageSchema>;
