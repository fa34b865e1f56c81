import { Column, CreateDateColumn, Entity, Index, JoinColumn, ManyToOne, PrimaryColumn, UpdateDateColumn } from "typeorm";
import type { fellingReasons, siteKinds } from "@grainyard/contracts";
import { AccountEntity } from "./account.ts";

/** A log a sawyer rescued, with where the tree stood and why it came down. Parent of its slabs. */
@Entity({ name: "yard_log" })
@Index("idx_yard_log_sawyer", ["sawyerId", "createdAt"])
export class YardLogEntity {
  @PrimaryColumn({ type: "char", length: 36 })
  id: string;

  @Column({ name: "sawyer_id", type: "char", length: 36 })
  sawyerId: string;

  @ManyToOne(() => AccountEntity, { onDelete: "CASCADE" })
  @JoinColumn({ name: "sawyer_id" })
  sawyer?: AccountEntity;

  @Column({ name: "species_slug", type: "varchar", length: 64 })
  speciesSlug: string;

  @Column({ name: "site_town", type: "varchar", length: 80 })
  siteTown: string;

  @Column({ name: "site_neighbourhood", type: "varchar", length: 80, default: "" })
  siteNeighbourhood: string;

  @Column({ name: "site_kind", type: "varchar", length: 20 })
  siteKind: (typeof siteKinds)[number];

  @Column({ name: "felling_reason", type: "varchar", length: 20 })
  fellingReason: (typeof fellingReasons)[number];

  @Column({ name: "felled_on", type: "date", nullable: true })
  felledOn: string | null;

  @Column({ name: "milled_on", type: "date", nullable: true })
  milledOn: string | null;

  @Column({ name: "length_mm", type: "int", nullable: true })
  lengthMm: number | null;

  @Column({ name: "diameter_mm", type: "int", nullable: true })
  diameterMm: number | null;

  @Column({ type: "text" })
  notes: string;

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
