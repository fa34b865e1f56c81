import { Column, CreateDateColumn, Entity, Index, JoinColumn, ManyToOne, PrimaryColumn } from "typeorm";
import { YardLogEntity } from "./yard-log.ts";

/** A photo of a log (the tree as felled, the cut ends, the mill). Same pipeline as listing photos. */
@Entity({ name: "log_photo" })
@Index("idx_log_photo_log", ["logId", "position"])
export class LogPhotoEntity {
  @PrimaryColumn({ type: "char", length: 36 })
  id: string;

  @Column({ name: "log_id", type: "char", length: 36 })
  logId: string;

  @ManyToOne(() => YardLogEntity, { onDelete: "CASCADE" })
  @JoinColumn({ name: "log_id" })
  log?: YardLogEntity;

  @Column({ type: "smallint" })
  position: number;

  @Column({ name: "alt_text", type: "varchar", length: 300 })
  altText: string;

  @Column({ type: "int" })
  width: number;

  @Column({ type: "int" })
  height: number;

  @Column({ name: "original_format", type: "varchar", length: 8 })
  originalFormat: string;

  @CreateDateColumn({ name: "created_at", type: "datetime", precision: 3, default: () => "CURRENT_TIMESTAMP(3)" })
  createdAt: Date;
}
