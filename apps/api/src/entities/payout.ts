import { Column, Entity, Index, PrimaryColumn } from "typeorm";

/**
 * Money an admin approved for a sawyer, sent as one transfer. `dueKey` names the exact lines
 * approved; one attempt per key is open at a time (a failed attempt may be followed by another).
 */
@Entity({ name: "payout" })
@Index("idx_payout_due_attempt", ["dueKey", "attempt"], { unique: true })
@Index("idx_payout_sawyer", ["sawyerId", "createdAt"])
@Index("idx_payout_status", ["status", "createdAt"])
export class PayoutEntity {
  @PrimaryColumn({ type: "char", length: 36 })
  id: string;

  @Column({ name: "sawyer_id", type: "char", length: 36 })
  sawyerId: string;

  @Column({ type: "char", length: 3 })
  currency: string;

  @Column({ name: "amount_minor", type: "bigint", transformer: { to: (v: number) => v, from: (v: string | number) => Number(v) } })
  amountMinor: number;

  @Column({ type: "varchar", length: 12 })
  status: "sending" | "sent" | "failed";

  @Column({ name: "due_key", type: "varchar", length: 100 })
  dueKey: string;

  @Column({ type: "smallint" })
  attempt: number;

  @Column({ name: "transfer_id", type: "varchar", length: 80, nullable: true })
  transferId: string | null;

  @Column({ name: "failure_reason", type: "varchar", length: 500, nullable: true })
  failureReason: string | null;

  @Column({ name: "approved_by", type: "char", length: 36, nullable: true })
  approvedBy: string | null;

  @Column({ name: "created_at", type: "datetime", precision: 3 })
  createdAt: Date;

  @Column({ name: "sent_at", type: "datetime", precision: 3, nullable: true })
  sentAt: Date | null;
}
