import { Column, CreateDateColumn, Entity, Index, JoinColumn, ManyToOne, PrimaryColumn } from "typeorm";
import type { moistureMethods } from "@grainyard/contracts";
import { SlabEntity } from "./slab.ts";

/** One moisture-meter reading of a slab as it dries. */
@Entity({ name: "moisture_reading" })
@Index("idx_moisture_reading_slab", ["slabId", "readOn"])
export class MoistureReadingEntity {
  @PrimaryColumn({ type: "char", length: 36 })
  id: string;

  @Column({ name: "slab_id", type: "char", length: 36 })
  slabId: string;

  @ManyToOne(() => SlabEntity, { onDelete: "CASCADE" })
  @JoinColumn({ name: "slab_id" })
  slab?: SlabEntity;

  @Column({ name: "read_on", type: "date" })
  readOn: string;

  @Column({ name: "moisture_content_pct", type: "double" })
  moistureContentPct: number;

  @Column({ type: "varchar", length: 16 })
  method: (typeof moistureMethods)[number];

  @CreateDateColumn({ name: "created_at", type: "datetime", precision: 3, default: () => "CURRENT_TIMESTAMP(3)" })
  createdAt: Date;
}
