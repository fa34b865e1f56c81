import { z } from "zod";

/*
 * Reviews of completed orders. Once an order is completed its buyer may write one review: an
 * overall rating of 1–5, and a yes or no (with a comment, required for a no) on whether the slab
 * matched its listing and on how the hand-over went, plus a few words if they like. The buyer may
 * change it for REVIEW_EDIT_DAYS days after writing it; the sawyer may answer it once; an admin
 * may hide it for a stated reason (and show it again). Hidden reviews count for nothing.
 */

/** Days after writing a review during which its buyer may change it. */
export const REVIEW_EDIT_DAYS = 14;

const comment = (limit: number) =>
  z
    .string()
    .trim()
    .max(limit, `Keep it under ${limit} characters.`)
    .optional()
    .transform((value) => value ?? "");

export const reviewInputSchema = z
  .object({
    rating: z
      .number({ error: "Choose a rating from 1 to 5." })
      .int("Choose a rating from 1 to 5.")
      .min(1, "Choose a rating from 1 to 5.")
      .max(5, "Choose a rating from 1 to 5."),
    matchedListing: z.boolean({ error: "Say whether the slab matched its listing." }),
    matchedListingComment: comment(1000),
    handoverWentWell: z.boolean({ error: "Say whether the hand-over went well." }),
    handoverComment: comment(1000),
    body: comment(2000),
  })
  .superRefine((input, context) => {
    if (!input.matchedListing && !input.matchedListingComment)
      context.addIssue({
        code: "custom",
        path: ["matchedListingComment"],
        message: "Say what did not match: size, moisture, defects…",
      });
    if (!input.handoverWentWell && !input.handoverComment)
      context.addIssue({ code: "custom", path: ["handoverComment"], message: "Say what went wrong with the hand-over." });
  });
export type ReviewInput = z.input<typeof reviewInputSchema>;

export const reviewAnswerInputSchema = z.object({
  body: z.string({ error: "Write your answer." }).trim().min(2, "Write your answer.").max(2000, "Keep it under 2000 characters."),
});
export type ReviewAnswerInput = z.infer<typeof reviewAnswerInputSchema>;

const reasonField = (message: string) => z.string({ error: message }).trim().min(5, message).max(2000, "Keep it under 2000 characters.");
export const reviewModerationSchema = z.object({ reason: reasonField("Say why, in a few words (kept in the audit log).") });
export type ReviewModerationInput = z.infer<typeof reviewModerationSchema>;

/** A review as anyone may read it on a yard's page (only visible reviews; the buyer by first name and initial). */
export const publicReviewSchema = z.object({
  id: z.string(),
  listingId: z.string(),
  /** What was bought (the order's title). */
  title: z.string(),
  buyerLabel: z.string(),
  rating: z.number(),
  matchedListing: z.boolean(),
  matchedListingComment: z.string(),
  handoverWentWell: z.boolean(),
  handoverComment: z.string(),
  body: z.string(),
  createdAt: z.string(),
  editedAt: z.string().nullable(),
  answer: z.object({ body: z.string(), answeredAt: z.string() }).nullable(),
});
export type PublicReview = z.infer<typeof publicReviewSchema>;

/** A review as its buyer, its sawyer or an admin sees it. */
export const orderReviewSchema = publicReviewSchema.extend({
  orderId: z.string(),
  sawyerId: z.string(),
  yardName: z.string().nullable(),
  buyerName: z.string(),
  /** Until when the buyer may change it. */
  editableUntil: z.string(),
  hidden: z.object({ reason: z.string(), hiddenAt: z.string() }).nullable(),
});
export type OrderReview = z.infer<typeof orderReviewSchema>;

export const reviewActions = ["write", "edit", "answer", "hide", "show"] as const;
export type ReviewAction = (typeof reviewActions)[number];

/** An order's review (none yet: null) and what the one looking may do with it now. */
export const orderReviewStateSchema = z.object({
  review: orderReviewSchema.nullable(),
  actions: z.array(z.enum(reviewActions)),
});
export type OrderReviewState = z.infer<typeof orderReviewStateSchema>;

/** A yard's rating from its visible reviews (figures from slab-math's `ratingSummary`). */
export const yardRatingSchema = z.object({
  count: z.number(),
  average: z.number().nullable(),
  matchedListingPct: z.number().nullable(),
  handoverPct: z.number().nullable(),
});
export type YardRating = z.infer<typeof yardRatingSchema>;

export const yardReviewQuerySchema = z.object({
  cursor: z
    .string()
    .regex(/^\d{1,15}\.[0-9a-f-]{36}$/, "Not a page of these reviews.")
    .optional(),
  limit: z.coerce.number().int().min(1).max(50).default(10),
});

/** A yard's visible reviews, newest first, with its rating (for the yard's public page and the slab page). */
export const yardReviewsSchema = z.object({
  yard: z.object({ id: z.string(), name: z.string().nullable(), town: z.string().nullable() }),
  rating: yardRatingSchema,
  reviews: z.array(publicReviewSchema),
  nextCursor: z.string().nullable(),
});
export type YardReviews = z.infer<typeof yardReviewsSchema>;

export const adminReviewQuerySchema = z.object({ hidden: z.enum(["yes", "no"]).optional() });
export const adminReviewListSchema = z.object({ reviews: z.array(orderReviewSchema) });
export const orderReviewEnvelopeSchema = z.object({ review: orderReviewSchema });
