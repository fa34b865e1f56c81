import type { OfferDeclineReason, OfferStatus, OfferStep, currencies } from "@grainyard/contracts";
import { Column, CreateDateColumn, Entity, Index, PrimaryColumn, UpdateDateColumn } from "typeorm";

const money = { to: (v: number | null) => v, from: (v: string | number | null) => (v === null ? null : Number(v)) };

/**
 * A buyer's offer on a listing and its back and forth with the sawyer (one row per buyer and
 * listing thread; each round's amounts in `steps`). Its status moves only by contracts'
 * `offerTransitions`, as conditional updates in the offer service. Money in integer minor units.
 */
@Entity({ name: "listing_offer" })
@Index("idx_listing_offer_listing", ["listingId", "status"])
@Index("idx_listing_offer_buyer", ["buyerId", "createdAt"])
@Index("idx_listing_offer_sawyer", ["sawyerId", "createdAt"])
@Index("idx_listing_offer_expiry", ["status", "expiresAt"])
export class OfferEntity {
  @PrimaryColumn({ type: "char", length: 36 })
  id: string;

  @Column({ name: "listing_id", type: "char", length: 36 })
  listingId: string;

  @Column({ name: "buyer_id", type: "char", length: 36 })
  buyerId: string;

  @Column({ name: "sawyer_id", type: "char", length: 36 })
  sawyerId: string;

  @Column({ type: "varchar", length: 12 })
  status: OfferStatus;

  @Column({ name: "decline_reason", type: "varchar", length: 24, nullable: true })
  declineReason: OfferDeclineReason | null;

  @Column({ type: "char", length: 3 })
  currency: (typeof currencies)[number];

  /** The buyer's latest amount. */
  @Column({ name: "amount_minor", type: "bigint", transformer: money })
  amountMinor: number;

  /** The sawyer's counter in the current round. */
  @Column({ name: "counter_minor", type: "bigint", nullable: true, transformer: money })
  counterMinor: number | null;

  @Column({ name: "agreed_minor", type: "bigint", nullable: true, transformer: money })
  agreedMinor: number | null;

  @Column({ type: "int" })
  round: number;

  /** Every offer and counter with its message, oldest first. */
  @Column({ type: "simple-json" })
  steps: OfferStep[];

  @Column({ type: "varchar", length: 8 })
  handover: "pickup" | "freight";

  @Column({ name: "delivery_address", type: "text", nullable: true })
  deliveryAddress: string | null;

  /** Until when the one it waits on may answer (null once settled). */
  @Column({ name: "expires_at", type: "datetime", precision: 3, nullable: true })
  expiresAt: Date | null;

  @Column({ name: "order_id", type: "char", length: 36, nullable: true })
  orderId: string | null;

  @CreateDateColumn({ name: "created_at", type: "datetime", precision: 3, default: () => "CURRENT_TIMESTAMP(3)" })
  createdAt: Date;

  @UpdateDateColumn({
    name: "updated_at",
    type: "datetime",
    precision: 3,
    default: () => "CURRENT_TIMESTAMP(3)",
    onUpdate: "CURRENT_TIMESTAMP(3)",
  })
  updatedAt: Date;
}
