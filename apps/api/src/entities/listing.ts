import { Column, CreateDateColumn, Entity, Index, JoinColumn, ManyToOne, PrimaryColumn, UpdateDateColumn } from "typeorm";
import type { currencies, ListingStatus, priceModes, setKinds } from "@grainyard/contracts";
import { AccountEntity } from "./account.ts";

/**
 * A slab, or a set of slabs from one log, offered for sale. Price and fee columns are integer
 * minor units computed by slab-math from the rate and the slabs' figures on every write.
 */
@Entity({ name: "listing" })
@Index("idx_listing_sawyer", ["sawyerId", "createdAt"])
@Index("idx_listing_status", ["status", "submittedAt"])
export class ListingEntity {
  @PrimaryColumn({ type: "char", length: 36 })
  id: string;

  @Column({ name: "sawyer_id", type: "char", length: 36 })
  sawyerId: string;

  @ManyToOne(() => AccountEntity, { onDelete: "CASCADE" })
  @JoinColumn({ name: "sawyer_id" })
  sawyer?: AccountEntity;

  @Column({ type: "varchar", length: 120 })
  title: string;

  @Column({ type: "text" })
  description: string;

  @Column({ name: "set_kind", type: "varchar", length: 12 })
  setKind: (typeof setKinds)[number];

  @Column({ name: "price_mode", type: "varchar", length: 16 })
  priceMode: (typeof priceModes)[number];

  @Column({ name: "rate_minor", type: "int" })
  rateMinor: number;

  @Column({ type: "char", length: 3 })
  currency: (typeof currencies)[number];

  @Column({ type: "boolean" })
  pickup: boolean;

  @Column({ type: "boolean" })
  freight: boolean;

  @Column({ type: "varchar", length: 12 })
  status: ListingStatus;

  /** Whether buyers may make offers; below the floor (never shown to them) an offer is declined at once. */
  @Column({ name: "offers_welcome", type: "boolean", default: false })
  offersWelcome: boolean;

  @Column({
    name: "offer_floor_minor",
    type: "bigint",
    nullable: true,
    transformer: { to: (v: number | null) => v, from: (v: string | number | null) => (v === null ? null : Number(v)) },
  })
  offerFloorMinor: number | null;

  @Column({ name: "review_note", type: "text", nullable: true })
  reviewNote: string | null;

  // Figures from slab-math (cache; recomputed on write).
  @Column({ name: "board_feet", type: "double" })
  boardFeet: number;

  @Column({ name: "volume_m3", type: "double" })
  volumeM3: number;

  @Column({ name: "weight_kg", type: "double" })
  weightKg: number;

  @Column({ name: "weight_low_kg", type: "double" })
  weightLowKg: number;

  @Column({ name: "weight_high_kg", type: "double" })
  weightHighKg: number;

  @Column({ name: "price_minor", type: "bigint", transformer: { to: (v: number) => v, from: (v: string | number) => Number(v) } })
  priceMinor: number;

  @Column({ name: "platform_fee_minor", type: "bigint", transformer: { to: (v: number) => v, from: (v: string | number) => Number(v) } })
  platformFeeMinor: number;

  @Column({ name: "processing_fee_minor", type: "bigint", transformer: { to: (v: number) => v, from: (v: string | number) => Number(v) } })
  processingFeeMinor: number;

  @Column({ name: "sawyer_net_minor", type: "bigint", transformer: { to: (v: number) => v, from: (v: string | number) => Number(v) } })
  sawyerNetMinor: number;

  @Column({ name: "submitted_at", type: "datetime", precision: 3, nullable: true })
  submittedAt: Date | null;

  @Column({ name: "published_at", type: "datetime", precision: 3, nullable: true })
  publishedAt: Date | null;

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
