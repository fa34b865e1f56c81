import { Column, CreateDateColumn, Entity, Index, JoinColumn, ManyToOne, PrimaryColumn } from "typeorm";
import { AccountEntity } from "./account.ts";

/**
 * A signed-in session. The cookie carries a random session key; only its SHA-256 is stored, so
 * sign-out (or a password reset) revokes the row and a copied cookie stops working.
 */
@Entity({ name: "session_record" })
@Index("idx_session_record_account", ["accountId"])
export class SessionRecordEntity {
  @PrimaryColumn({ name: "key_hash", type: "char", length: 64 })
  keyHash: string;

  @Column({ name: "account_id", type: "char", length: 36 })
  accountId: string;

  @ManyToOne(() => AccountEntity, { onDelete: "CASCADE" })
  @JoinColumn({ name: "account_id" })
  account?: AccountEntity;

  @CreateDateColumn({ name: "created_at", type: "datetime", precision: 3, default: () => "CURRENT_TIMESTAMP(3)" })
  createdAt: Date;

  @Column({ name: "expires_at", type: "datetime", precision: 3 })
  expiresAt: Date;

  @Column({ name: "revoked_at", type: "datetime", precision: 3, nullable: true })
  revokedAt: Date | null;
}
