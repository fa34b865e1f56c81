import { Column, Entity, Index, JoinColumn, ManyToOne, PrimaryColumn } from "typeorm";
import { ListingEntity } from "./listing.ts";
import { SlabEntity } from "./slab.ts";

/** Which slabs a listing offers, in order. A slab is in at most one listing that is not withdrawn. */
@Entity({ name: "listing_slab" })
@Index("idx_listing_slab_slab", ["slabId"])
export class ListingSlabEntity {
  @PrimaryColumn({ name: "listing_id", type: "char", length: 36 })
  listingId: string;

  @PrimaryColumn({ name: "slab_id", type: "char", length: 36 })
  slabId: string;

  @ManyToOne(() => ListingEntity, { onDelete: "CASCADE" })
  @JoinColumn({ name: "listing_id" })
  listing?: ListingEntity;

  @ManyToOne(() => SlabEntity, { onDelete: "CASCADE" })
  @JoinColumn({ name: "slab_id" })
  slab?: SlabEntity;

  @Column({ type: "smallint" })
  position: number;
}
