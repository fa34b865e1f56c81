import type { reportStatuses } from "@grainyard/contracts";
import { Column, Entity, Index, PrimaryColumn } from "typeorm";

export const reportTargets = ["listing", "message", "review"] as const;
export type ReportStatus = (typeof reportStatuses)[number];

/** Someone signed in told the admin that a listing, a message or a review is wrong. */
@Entity({ name: "content_report" })
@Index("idx_content_report_status", ["status", "createdAt"])
@Index("idx_content_report_target", ["targetKind", "targetId"])
export class ContentReportEntity {
  @PrimaryColumn({ type: "char", length: 36 })
  id: string;

  @Column({ name: "reporter_id", type: "char", length: 36 })
  reporterId: string;

  @Column({ name: "target_kind", type: "varchar", length: 12 })
  targetKind: (typeof reportTargets)[number];

  /** The listing id, the message id or the review id. */
  @Column({ name: "target_id", type: "varchar", length: 36 })
  targetId: string;

  /** The listing concerned (the message's thread's listing for a message, the sold listing for a review). */
  @Column({ name: "listing_id", type: "char", length: 36, nullable: true })
  listingId: string | null;

  /** Whose content it is: the listing's sawyer, the message's author or the review's buyer. */
  @Column({ name: "reported_account_id", type: "char", length: 36 })
  reportedAccountId: string;

  @Column({ type: "text" })
  reason: string;

  @Column({ type: "varchar", length: 20 })
  status: ReportStatus;

  @Column({ name: "resolved_by", type: "char", length: 36, nullable: true })
  resolvedBy: string | null;

  @Column({ name: "resolution_note", type: "text", nullable: true })
  resolutionNote: string | null;

  @Column({ name: "resolved_at", type: "datetime", precision: 3, nullable: true })
  resolvedAt: Date | null;

  @Column({ name: "created_at", type: "datetime", precision: 3 })
  createdAt: Date;
}
