import { Column, Entity, Index, PrimaryColumn } from "typeorm";

/** One order's amount in a payout: the payout's statement. */
@Entity({ name: "payout_line" })
@Index("idx_payout_line_order", ["orderId"])
export class PayoutLineEntity {
  @PrimaryColumn({ name: "payout_id", type: "char", length: 36 })
  payoutId: string;

  @PrimaryColumn({ name: "order_id", type: "char", length: 36 })
  orderId: string;

  @Column({ name: "amount_minor", type: "bigint", transformer: { to: (v: number) => v, from: (v: string | number) => Number(v) } })
  amountMinor: number;
}
