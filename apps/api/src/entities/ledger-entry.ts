import { Column, CreateDateColumn, Entity, Index, PrimaryGeneratedColumn } from "typeorm";

/**
 * Double-entry ledger: every money movement is a set of entries that sums to zero. Accounts:
 * `provider_clearing` (money held at the payment provider), `platform_fees`, `processing_fees`,
 * `tax_payable`, `sawyer:<id>` (what Grainyard owes a sawyer). Amounts in integer minor units.
 */
@Entity({ name: "ledger_entry" })
@Index("idx_ledger_order", ["orderId"])
@Index("idx_ledger_account", ["account", "createdAt"])
export class LedgerEntryEntity {
  @PrimaryGeneratedColumn({ type: "bigint" })
  id: string;

  @Column({ name: "order_id", type: "char", length: 36, nullable: true })
  orderId: string | null;

  @Column({ type: "varchar", length: 60 })
  account: string;

  @Column({ name: "amount_minor", type: "bigint", transformer: { to: (v: number) => v, from: (v: string | number) => Number(v) } })
  amountMinor: number;

  @Column({ type: "char", length: 3 })
  currency: string;

  /** What moved the money: payment, refund, payout. */
  @Column({ type: "varchar", length: 20 })
  kind: string;

  /** The provider event that caused it, when there is one. */
  @Column({ name: "provider_event_id", type: "varchar", length: 80, nullable: true })
  providerEventId: string | null;

  @CreateDateColumn({ name: "created_at", type: "datetime", precision: 3, default: () => "CURRENT_TIMESTAMP(3)" })
  createdAt: Date;
}
