import type { outboxEmailStatuses } from "@grainyard/contracts";
import { Column, CreateDateColumn, Entity, Index, PrimaryGeneratedColumn } from "typeorm";

type OutboxEmailStatus = (typeof outboxEmailStatuses)[number];

/**
 * An e-mail to send: written in the same transaction as the change that causes it (so it exists
 * exactly when the change does) and delivered by the outbox job. `waiting` rows are due at
 * `nextAttemptAt`; a `sending` row is claimed by one instance until `nextAttemptAt` (after that a
 * crashed sender's row is claimed again); `sent` and `failed` are final until an admin resends.
 */
@Entity({ name: "outbox_email" })
@Index("idx_outbox_email_due", ["status", "nextAttemptAt", "id"])
export class OutboxEmailEntity {
  /** Increasing: the order the e-mails were written in. */
  @PrimaryGeneratedColumn({ type: "bigint" })
  id: string;

  /** What the e-mail is about, for the operator desk (e.g. "order_paid", "password_reset"). */
  @Column({ type: "varchar", length: 40 })
  kind: string;

  @Column({ type: "varchar", length: 254 })
  recipient: string;

  @Column({ type: "varchar", length: 300 })
  subject: string;

  @Column({ name: "text_body", type: "mediumtext" })
  textBody: string;

  @Column({ name: "html_body", type: "mediumtext", nullable: true })
  htmlBody: string | null;

  @Column({ type: "varchar", length: 10 })
  status: OutboxEmailStatus;

  /** Delivery attempts in the current round (an admin's resend starts a new round). */
  @Column({ type: "int", default: 0 })
  attempts: number;

  @Column({ name: "next_attempt_at", type: "datetime", precision: 3 })
  nextAttemptAt: Date;

  /** The instance that claimed the row for its latest attempt. */
  @Column({ name: "claimed_by", type: "varchar", length: 80, nullable: true })
  claimedBy: string | null;

  /** Why the latest attempt failed, in plain words (the driver's own text goes to the log). */
  @Column({ name: "last_error", type: "varchar", length: 300, nullable: true })
  lastError: string | null;

  @Column({ name: "sent_at", type: "datetime", precision: 3, nullable: true })
  sentAt: Date | null;

  @CreateDateColumn({ name: "created_at", type: "datetime", precision: 3, default: () => "CURRENT_TIMESTAMP(3)" })
  createdAt: Date;
}
