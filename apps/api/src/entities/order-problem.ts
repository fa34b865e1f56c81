import type { OrderProblemKind, orderProblemStatuses } from "@grainyard/contracts";
import { Column, Entity, Index, PrimaryColumn } from "typeorm";

const bigintNumber = { to: (v: number | null) => v, from: (v: string | number | null) => (v === null ? null : Number(v)) };

/**
 * A problem the buyer reported after hand-over instead of confirming receipt (not received, or not
 * as described), with their words. One per order (the unique order id); the order waits for the
 * desk meanwhile. The desk settles it with a refund (all or part) or by releasing the sale to the
 * sawyer, and its note goes to both sides.
 */
@Entity({ name: "order_problem" })
@Index("uq_order_problem_order", ["orderId"], { unique: true })
@Index("idx_order_problem_status", ["status", "createdAt"])
export class OrderProblemEntity {
  @PrimaryColumn({ type: "char", length: 36 })
  id: string;

  @Column({ name: "order_id", type: "char", length: 36 })
  orderId: string;

  @Column({ name: "buyer_id", type: "char", length: 36 })
  buyerId: string;

  @Column({ type: "varchar", length: 20 })
  kind: OrderProblemKind;

  @Column({ type: "text" })
  comment: string;

  @Column({ type: "varchar", length: 12 })
  status: (typeof orderProblemStatuses)[number] | "settling";

  @Column({ name: "resolved_by", type: "char", length: 36, nullable: true })
  resolvedBy: string | null;

  @Column({ name: "resolution_note", type: "text", nullable: true })
  resolutionNote: string | null;

  @Column({ name: "refunded_minor", type: "bigint", nullable: true, transformer: bigintNumber })
  refundedMinor: number | null;

  @Column({ name: "resolved_at", type: "datetime", precision: 3, nullable: true })
  resolvedAt: Date | null;

  @Column({ name: "created_at", type: "datetime", precision: 3 })
  createdAt: Date;
}
