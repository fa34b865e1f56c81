import { Column, Entity, Index, PrimaryColumn } from "typeorm";

/** A refund an admin gave on a disputed order (all or part of what the buyer paid), with the reason. */
@Entity({ name: "order_refund" })
@Index("idx_order_refund_order", ["orderId", "createdAt"])
export class OrderRefundEntity {
  @PrimaryColumn({ type: "char", length: 36 })
  id: string;

  @Column({ name: "order_id", type: "char", length: 36 })
  orderId: string;

  @Column({ name: "amount_minor", type: "bigint", transformer: { to: (v: number) => v, from: (v: string | number) => Number(v) } })
  amountMinor: number;

  @Column({ type: "varchar", length: 1000 })
  reason: string;

  @Column({ name: "provider_refund_id", type: "varchar", length: 80, nullable: true })
  providerRefundId: string | null;

  @Column({ name: "created_by", type: "char", length: 36 })
  createdBy: string;

  @Column({ name: "created_at", type: "datetime", precision: 3 })
  createdAt: Date;
}
