import type { OrderSlabSnapshot, OrderStatus } from "@grainyard/contracts";
import { Column, CreateDateColumn, Entity, Index, PrimaryColumn, UpdateDateColumn } from "typeorm";

const money = { to: (v: number) => v, from: (v: string | number) => Number(v) };

/**
 * A buyer's order for one listing. Everything the buyer agreed to — the slabs' figures, the price,
 * the fees, tax and the handover choice — is a snapshot taken when the order was made. Its status
 * moves only by the transitions of contracts' order-lifecycle.ts (the services' conditional updates).
 */
@Entity({ name: "buyer_order" })
@Index("idx_buyer_order_buyer", ["buyerId", "createdAt"])
@Index("idx_buyer_order_sawyer", ["sawyerId", "createdAt"])
@Index("idx_buyer_order_listing", ["listingId"])
@Index("idx_buyer_order_status", ["status", "reservedUntil"])
@Index("idx_buyer_order_handed_over", ["status", "handedOverAt"])
export class OrderEntity {
  @PrimaryColumn({ type: "char", length: 36 })
  id: string;

  @Column({ name: "buyer_id", type: "char", length: 36 })
  buyerId: string;

  @Column({ name: "sawyer_id", type: "char", length: 36 })
  sawyerId: string;

  @Column({ name: "listing_id", type: "char", length: 36 })
  listingId: string;

  @Column({ type: "varchar", length: 20 })
  status: OrderStatus;

  @Column({ type: "varchar", length: 120 })
  title: string;

  /** The slabs and their figures as they were when the order was made (written through contracts' `orderSlabSnapshotSchema`). */
  @Column({ name: "slab_snapshot", type: "simple-json" })
  slabSnapshot: OrderSlabSnapshot[];

  @Column({ type: "char", length: 3 })
  currency: string;

  @Column({ name: "price_minor", type: "bigint", transformer: money })
  priceMinor: number;

  @Column({ name: "platform_fee_minor", type: "bigint", transformer: money })
  platformFeeMinor: number;

  @Column({ name: "processing_fee_minor", type: "bigint", transformer: money })
  processingFeeMinor: number;

  @Column({ name: "sawyer_net_minor", type: "bigint", transformer: money })
  sawyerNetMinor: number;

  @Column({ name: "tax_minor", type: "bigint", transformer: money })
  taxMinor: number;

  @Column({ name: "total_minor", type: "bigint", transformer: money })
  totalMinor: number;

  @Column({ type: "varchar", length: 8 })
  handover: "pickup" | "freight";

  @Column({ name: "delivery_address", type: "text", nullable: true })
  deliveryAddress: string | null;

  @Column({ name: "checkout_session_id", type: "varchar", length: 80, nullable: true })
  checkoutSessionId: string | null;

  @Column({ name: "checkout_url", type: "varchar", length: 400, nullable: true })
  checkoutUrl: string | null;

  @Column({ name: "payment_intent_id", type: "varchar", length: 80, nullable: true })
  paymentIntentId: string | null;

  @Column({ name: "reserved_until", type: "datetime", precision: 3 })
  reservedUntil: Date;

  @Column({ name: "paid_at", type: "datetime", precision: 3, nullable: true })
  paidAt: Date | null;

  // ---- The steps after payment (each stamped when it happens) ----

  /** The sawyer's proposed pickup windows (1–5), ISO instants. */
  @Column({ name: "pickup_windows", type: "simple-json", nullable: true })
  pickupWindows: { startsAt: string; endsAt: string }[] | null;

  /** The yard's IANA time zone when the windows were proposed: every reader sees the windows in it. */
  @Column({ name: "pickup_time_zone", type: "varchar", length: 64, nullable: true })
  pickupTimeZone: string | null;

  /** Where to come for pickup (yard address, gate, directions), given with the windows. */
  @Column({ name: "pickup_address", type: "varchar", length: 300, nullable: true })
  pickupAddress: string | null;

  @Column({ name: "pickup_starts_at", type: "datetime", precision: 3, nullable: true })
  pickupStartsAt: Date | null;

  @Column({ name: "pickup_ends_at", type: "datetime", precision: 3, nullable: true })
  pickupEndsAt: Date | null;

  @Column({ name: "ready_for_pickup_at", type: "datetime", precision: 3, nullable: true })
  readyForPickupAt: Date | null;

  @Column({ name: "pickup_chosen_at", type: "datetime", precision: 3, nullable: true })
  pickupChosenAt: Date | null;

  @Column({ type: "varchar", length: 80, nullable: true })
  carrier: string | null;

  @Column({ name: "tracking_reference", type: "varchar", length: 120, nullable: true })
  trackingReference: string | null;

  @Column({ name: "shipped_at", type: "datetime", precision: 3, nullable: true })
  shippedAt: Date | null;

  /** When the slab left the sawyer's hands (payouts count from here). */
  @Column({ name: "handed_over_at", type: "datetime", precision: 3, nullable: true })
  handedOverAt: Date | null;

  @Column({ name: "completed_at", type: "datetime", precision: 3, nullable: true })
  completedAt: Date | null;

  /** "buyer" (confirmed receipt), "automatic" (the days after hand-over ran out) or "desk" (a reported problem settled for the sawyer). */
  @Column({ name: "completed_by", type: "varchar", length: 10, nullable: true })
  completedBy: "buyer" | "automatic" | "desk" | null;

  @Column({ name: "cancelled_at", type: "datetime", precision: 3, nullable: true })
  cancelledAt: Date | null;

  @Column({ name: "cancelled_by", type: "varchar", length: 10, nullable: true })
  cancelledBy: "buyer" | "sawyer" | null;

  @Column({ name: "cancel_reason", type: "varchar", length: 500, nullable: true })
  cancelReason: string | null;

  /** Why the slab was handed over before the booked pickup time. */
  @Column({ name: "hand_over_note", type: "varchar", length: 500, nullable: true })
  handOverNote: string | null;

  @Column({ name: "refund_id", type: "varchar", length: 80, nullable: true })
  refundId: string | null;

  @Column({ name: "refunded_at", type: "datetime", precision: 3, nullable: true })
  refundedAt: Date | null;

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
