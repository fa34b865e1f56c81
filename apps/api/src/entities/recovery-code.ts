import { Column, CreateDateColumn, Entity, Index, JoinColumn, ManyToOne, PrimaryGeneratedColumn } from "typeorm";
import { AccountEntity } from "./account.ts";

/** One of the ten single-use recovery codes of a second factor; only its bcrypt hash is kept. */
@Entity({ name: "recovery_code" })
@Index("idx_recovery_code_account", ["accountId"])
export class RecoveryCodeEntity {
  @PrimaryGeneratedColumn({ type: "bigint" })
  id: string;

  @Column({ name: "account_id", type: "char", length: 36 })
  accountId: string;

  @ManyToOne(() => AccountEntity, { onDelete: "CASCADE" })
  @JoinColumn({ name: "account_id" })
  account?: AccountEntity;

  @Column({ name: "code_hash", type: "varchar", length: 100 })
  codeHash: string;

  @CreateDateColumn({ name: "created_at", type: "datetime", precision: 3, default: () => "CURRENT_TIMESTAMP(3)" })
  createdAt: Date;

  @Column({ name: "used_at", type: "datetime", precision: 3, nullable: true })
  usedAt: Date | null;
}
