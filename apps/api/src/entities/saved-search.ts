import { Column, Entity, Index, JoinColumn, ManyToOne, PrimaryColumn } from "typeorm";
import { AccountEntity } from "./account.ts";

/** A buyer's saved catalogue search; with alerts on, new matching listings are mailed at most once a day. */
@Entity({ name: "saved_search" })
@Index("idx_saved_search_account", ["accountId", "createdAt"])
@Index("idx_saved_search_alerts", ["alerts", "lastAlertAt"])
export class SavedSearchEntity {
  @PrimaryColumn({ type: "char", length: 36 })
  id: string;

  @Column({ name: "account_id", type: "char", length: 36 })
  accountId: string;

  @ManyToOne(() => AccountEntity, { onDelete: "CASCADE" })
  @JoinColumn({ name: "account_id" })
  account?: AccountEntity;

  @Column({ type: "varchar", length: 80 })
  name: string;

  /** Normalised catalogue query string (known filters only; no cursor, sort or limit). */
  @Column({ type: "varchar", length: 2000 })
  query: string;

  @Column({ type: "boolean" })
  alerts: boolean;

  @Column({ name: "last_alert_at", type: "datetime", precision: 3, nullable: true })
  lastAlertAt: Date | null;

  @Column({ name: "created_at", type: "datetime", precision: 3 })
  createdAt: Date;
}
