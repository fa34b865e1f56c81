import { Column, CreateDateColumn, Entity, PrimaryColumn, UpdateDateColumn } from "typeorm";

/** A sawyer's connected account at the payment provider, where payouts are sent. */
@Entity({ name: "payout_account" })
export class PayoutAccountEntity {
  @PrimaryColumn({ name: "sawyer_id", type: "char", length: 36 })
  sawyerId: string;

  @Column({ name: "provider_account_id", type: "varchar", length: 80, unique: true })
  providerAccountId: string;

  /** The provider says the account can receive transfers (onboarding finished). */
  @Column({ name: "payouts_enabled", type: "boolean", default: false })
  payoutsEnabled: boolean;

  @Column({ name: "details_submitted", type: "boolean", default: false })
  detailsSubmitted: boolean;

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
