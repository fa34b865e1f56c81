import { Column, Entity, Index, JoinColumn, ManyToOne, PrimaryColumn } from "typeorm";
import { OrderEntity } from "./order.ts";

/**
 * A buyer's review of a completed order: one per order (the unique index makes a second one
 * impossible, even from two tabs at once), its sawyer's one answer, and an admin's hiding.
 */
@Entity({ name: "order_review" })
@Index("uq_order_review_order", ["orderId"], { unique: true })
/** A yard's visible reviews, newest first (the yard's page, its rating). */
@Index("idx_order_review_yard", ["sawyerId", "hiddenAt", "createdAt"])
@Index("idx_order_review_newest", ["createdAt"])
export class OrderReviewEntity {
  @PrimaryColumn({ type: "char", length: 36 })
  id: string;

  @Column({ name: "order_id", type: "char", length: 36 })
  orderId: string;

  @ManyToOne(() => OrderEntity, { onDelete: "CASCADE" })
  @JoinColumn({ name: "order_id" })
  order?: OrderEntity;

  @Column({ name: "buyer_id", type: "char", length: 36 })
  buyerId: string;

  @Column({ name: "sawyer_id", type: "char", length: 36 })
  sawyerId: string;

  @Column({ name: "listing_id", type: "char", length: 36 })
  listingId: string;

  /** Overall, 1–5. */
  @Column({ type: "tinyint" })
  rating: number;

  @Column({ name: "matched_listing", type: "boolean" })
  matchedListing: boolean;

  @Column({ name: "matched_listing_comment", type: "text" })
  matchedListingComment: string;

  @Column({ name: "handover_went_well", type: "boolean" })
  handoverWentWell: boolean;

  @Column({ name: "handover_comment", type: "text" })
  handoverComment: string;

  @Column({ type: "text" })
  body: string;

  @Column({ name: "created_at", type: "datetime", precision: 3 })
  createdAt: Date;

  @Column({ name: "edited_at", type: "datetime", precision: 3, nullable: true })
  editedAt: Date | null;

  /** The sawyer's one answer. */
  @Column({ type: "text", nullable: true })
  answer: string | null;

  @Column({ name: "answered_at", type: "datetime", precision: 3, nullable: true })
  answeredAt: Date | null;

  @Column({ name: "hidden_at", type: "datetime", precision: 3, nullable: true })
  hiddenAt: Date | null;

  @Column({ name: "hidden_by", type: "char", length: 36, nullable: true })
  hiddenBy: string | null;

  @Column({ name: "hidden_reason", type: "text", nullable: true })
  hiddenReason: string | null;
}
