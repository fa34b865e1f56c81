import type { reviewDecisionSchema } from "@grainyard/contracts";
import type { z } from "zod";
import { Column, Entity, Index, PrimaryColumn } from "typeorm";

export type ReviewDecision = z.infer<typeof reviewDecisionSchema>;

/**
 * One decision on a submitted listing, with a snapshot of what the reviewer saw, so the next
 * submission can show what changed since. Kept when the listing is withdrawn.
 */
@Entity({ name: "listing_review" })
@Index("idx_listing_review_listing", ["listingId", "reviewedAt"])
@Index("idx_listing_review_reviewed", ["reviewedAt"])
export class ListingReviewEntity {
  @PrimaryColumn({ type: "char", length: 36 })
  id: string;

  @Column({ name: "listing_id", type: "char", length: 36 })
  listingId: string;

  @Column({ name: "reviewer_id", type: "char", length: 36 })
  reviewerId: string;

  @Column({ type: "varchar", length: 12 })
  decision: ReviewDecision;

  @Column({ type: "text", nullable: true })
  reason: string | null;

  /** The listing and its slabs as reviewed (fields compared on the next submission). */
  @Column({ type: "simple-json" })
  snapshot: Record<string, unknown>;

  @Column({ name: "submitted_at", type: "datetime", precision: 3 })
  submittedAt: Date;

  @Column({ name: "reviewed_at", type: "datetime", precision: 3 })
  reviewedAt: Date;
}
