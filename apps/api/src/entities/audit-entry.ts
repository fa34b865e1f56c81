import { Column, Entity, Index, PrimaryGeneratedColumn } from "typeorm";

/**
 * Append-only record of every admin action: who, what, on what, when, the state before and after,
 * and the reason given. Written in the same transaction as the action; never updated or deleted.
 * No foreign keys: the record outlives what it is about.
 */
@Entity({ name: "audit_entry" })
@Index("idx_audit_entry_created", ["createdAt", "id"])
@Index("idx_audit_entry_actor", ["actorId", "id"])
@Index("idx_audit_entry_action", ["action", "id"])
@Index("idx_audit_entry_target", ["targetId", "id"])
export class AuditEntryEntity {
  /** Increasing: the order of events, and the keyset for paging. */
  @PrimaryGeneratedColumn({ type: "bigint" })
  id: string;

  @Column({ name: "actor_id", type: "char", length: 36, nullable: true })
  actorId: string | null;

  /** The acting admin's e-mail at the time (or "cli" for the command line). */
  @Column({ name: "actor_label", type: "varchar", length: 254 })
  actorLabel: string;

  @Column({ type: "varchar", length: 60 })
  action: string;

  @Column({ name: "target_kind", type: "varchar", length: 30 })
  targetKind: string;

  @Column({ name: "target_id", type: "varchar", length: 64 })
  targetId: string;

  @Column({ name: "before_json", type: "simple-json", nullable: true })
  before: unknown;

  @Column({ name: "after_json", type: "simple-json", nullable: true })
  after: unknown;

  @Column({ type: "text", nullable: true })
  reason: string | null;

  @Column({ name: "created_at", type: "datetime", precision: 3 })
  createdAt: Date;
}
