import { Column, CreateDateColumn, Entity, Index, JoinColumn, ManyToOne, PrimaryColumn, UpdateDateColumn } from "typeorm";
import type { dryingMethods, liveEdges, slabDefects, slabFeatures, surfacings } from "@grainyard/contracts";
import { AccountEntity } from "./account.ts";
import { YardLogEntity } from "./yard-log.ts";

/**
 * One slab in a sawyer's yard. Measurements in millimetres; the figure columns (area, volume,
 * board feet, widths, weight) are a cache that the slab service recomputes with slab-math on
 * every write that changes their inputs.
 */
const exactMillimetres = { to: (value: number) => value, from: (value: string | number) => Number(value) };

@Entity({ name: "slab" })
@Index("idx_slab_sawyer", ["sawyerId", "createdAt"])
@Index("idx_slab_log", ["logId", "sequenceInLog"])
export class SlabEntity {
  @PrimaryColumn({ type: "char", length: 36 })
  id: string;

  @Column({ name: "sawyer_id", type: "char", length: 36 })
  sawyerId: string;

  @ManyToOne(() => AccountEntity, { onDelete: "CASCADE" })
  @JoinColumn({ name: "sawyer_id" })
  sawyer?: AccountEntity;

  @Column({ name: "log_id", type: "char", length: 36, nullable: true })
  logId: string | null;

  @ManyToOne(() => YardLogEntity, { onDelete: "SET NULL" })
  @JoinColumn({ name: "log_id" })
  log?: YardLogEntity | null;

  @Column({ name: "sequence_in_log", type: "smallint", nullable: true })
  sequenceInLog: number | null;

  @Column({ name: "species_slug", type: "varchar", length: 64 })
  speciesSlug: string;

  /**
   * Length and thickness exactly as entered: millimetres to six decimals, which hold any entry in
   * millimetres (612.5) or in inches down to 1/64″ (2¼″ = 57.15 mm) without rounding, so board feet
   * and price match a hand calculation in either unit system. DECIMAL comes back as text: read as a number.
   */
  @Column({ name: "length_mm", type: "decimal", precision: 12, scale: 6, transformer: exactMillimetres })
  lengthMm: number;

  @Column({ name: "thickness_mm", type: "decimal", precision: 12, scale: 6, transformer: exactMillimetres })
  thicknessMm: number;

  @Column({ name: "width_stations_mm", type: "simple-json" })
  widthStationsMm: number[];

  @Column({ name: "live_edge", type: "varchar", length: 8 })
  liveEdge: (typeof liveEdges)[number];

  @Column({ type: "varchar", length: 16 })
  surfacing: (typeof surfacings)[number];

  @Column({ type: "simple-json" })
  features: (typeof slabFeatures)[number][];

  @Column({ type: "simple-json" })
  defects: (typeof slabDefects)[number][];

  @Column({ name: "drying_method", type: "varchar", length: 16 })
  dryingMethod: (typeof dryingMethods)[number];

  @Column({ name: "kiln_completed_on", type: "date", nullable: true })
  kilnCompletedOn: string | null;

  @Column({ name: "heat_treated", type: "boolean", default: false })
  heatTreated: boolean;

  @Column({ name: "heat_treatment_temperature_c", type: "double", nullable: true })
  heatTreatmentTemperatureC: number | null;

  @Column({ name: "heat_treatment_minutes", type: "int", nullable: true })
  heatTreatmentMinutes: number | null;

  @Column({ type: "text" })
  notes: string;

  // Figures from slab-math (cache; recomputed on write).
  @Column({ name: "area_m2", type: "double" })
  areaM2: number;

  @Column({ name: "volume_m3", type: "double" })
  volumeM3: number;

  @Column({ name: "board_feet", type: "double" })
  boardFeet: number;

  @Column({ name: "average_width_mm", type: "double" })
  averageWidthMm: number;

  @Column({ name: "min_width_mm", type: "double" })
  minWidthMm: number;

  @Column({ name: "max_width_mm", type: "double" })
  maxWidthMm: number;

  @Column({ name: "weight_kg", type: "double" })
  weightKg: number;

  @Column({ name: "weight_low_kg", type: "double" })
  weightLowKg: number;

  @Column({ name: "weight_high_kg", type: "double" })
  weightHighKg: number;

  @Column({ name: "weight_at_moisture_pct", type: "double" })
  weightAtMoisturePct: number;

  @Column({ name: "last_moisture_pct", type: "double", nullable: true })
  lastMoisturePct: number | null;

  @Column({ name: "last_read_on", type: "date", nullable: true })
  lastReadOn: string | null;

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
