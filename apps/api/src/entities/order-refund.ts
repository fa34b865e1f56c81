import { Column, Entity, Index, PrimaryColumn } from "typeorm";

/** Why money went back on an order: a cancellation before hand-over, a payment for a slab sold elsewhere, an admin's dispute refund. */
export type OrderRefundKind = "cancellation" | "sold_elsewhere" | "dispute";

/**
 * One refund on an order, from any of the three refund paths (services/refund-service.ts): all or
 * part of what the buyer paid, why, and the provider's refund once it answered. The idempotency
 * key is the one the provider was given, so a retry finds the same row and the same refund.
 */
@Entity({ name: "order_refund" })
@Index("idx_order_refund_order", ["orderId", "createdAt"])
export class OrderRefundEntity {
  @PrimaryColumn({ type: "char", length: 36 })
  id: string;

  @Column({ name: "order_id", type: "char", length: 36 })
  orderId: string;

  @Column({ type: "varchar", length: 20 })
  kind: OrderRefundKind;

  @Column({ name: "amount_minor", type: "bigint", transformer: { to: (v: number) => v, from: (v: string | number) => Number(v) } })
  amountMinor: number;

  @Column({ type: "varchar", length: 1000 })
  reason: string;

  @Column({ name: "idempotency_key", type: "varchar", length: 80, unique: true })
  idempotencyKey: string;

  /** Null until the provider answered. */
  @Column({ name: "provider_refund_id", type: "varchar", length: 80, nullable: true })
  providerRefundId: string | null;

  /** The admin (dispute) or the party who cancelled; null when Grainyard itself refunded (a payment for a slab sold elsewhere). */
  @Column({ name: "created_by", type: "char", length: 36, nullable: true })
  createdBy: string | null;

  @Column({ name: "created_at", type: "datetime", precision: 3 })
  createdAt: Date;
}
