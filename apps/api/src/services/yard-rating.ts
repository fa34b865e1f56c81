import type { RatingTotals } from "@grainyard/slab-math";
import type { DataSource, EntityManager } from "typeorm";

/** No reviews yet. */
export const NO_REVIEWS: RatingTotals = { count: 0, ratingTotal: 0, matchedListingYes: 0, handoverYes: 0 };

/**
 * What the visible (not hidden) reviews of each yard add up to, read through
 * `idx_order_review_yard`; yards without reviews are missing from the map.
 */
export async function yardRatingTotals(
  manager: EntityManager | DataSource,
  sawyerIds: readonly string[],
): Promise<Map<string, RatingTotals>> {
  if (sawyerIds.length === 0) return new Map();
  const rows = (await manager.query(
    `SELECT sawyer_id, COUNT(*) AS count, SUM(rating) AS rating_total, SUM(matched_listing) AS matched_yes, SUM(handover_went_well) AS handover_yes
       FROM order_review WHERE sawyer_id IN (${sawyerIds.map(() => "?").join(", ")}) AND hidden_at IS NULL GROUP BY sawyer_id`,
    [...sawyerIds],
  )) as {
    sawyer_id: string;
    count: string | number;
    rating_total: string | number;
    matched_yes: string | number;
    handover_yes: string | number;
  }[];
  return new Map(
    rows.map((row) => [
      row.sawyer_id,
      {
        count: Number(row.count),
        ratingTotal: Number(row.rating_total),
        matchedListingYes: Number(row.matched_yes),
        handoverYes: Number(row.handover_yes),
      },
    ]),
  );
}
