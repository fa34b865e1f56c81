import { Column, CreateDateColumn, Entity, Index, JoinColumn, ManyToOne, PrimaryGeneratedColumn } from "typeorm";
import { AccountEntity } from "./account.ts";

export type EmailTokenPurpose = "verify_email" | "reset_password";

/** A single-use token mailed as a link (e-mail verification, password reset); only its hash is kept. */
@Entity({ name: "email_token" })
@Index("idx_email_token_account", ["accountId", "purpose"])
export class EmailTokenEntity {
  @PrimaryGeneratedColumn({ type: "bigint" })
  id: string;

  @Column({ name: "account_id", type: "char", length: 36 })
  accountId: string;

  @ManyToOne(() => AccountEntity, { onDelete: "CASCADE" })
  @JoinColumn({ name: "account_id" })
  account?: AccountEntity;

  @Column({ type: "varchar", length: 20 })
  purpose: EmailTokenPurpose;

  @Column({ name: "token_hash", type: "char", length: 64, unique: true })
  tokenHash: string;

  @CreateDateColumn({ name: "created_at", type: "datetime", precision: 3, default: () => "CURRENT_TIMESTAMP(3)" })
  createdAt: Date;

  @Column({ name: "expires_at", type: "datetime", precision: 3 })
  expiresAt: Date;

  @Column({ name: "used_at", type: "datetime", precision: 3, nullable: true })
  usedAt: Date | null;
}
