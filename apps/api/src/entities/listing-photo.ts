import { Column, CreateDateColumn, Entity, Index, JoinColumn, ManyToOne, PrimaryColumn } from "typeorm";
import { ListingEntity } from "./listing.ts";

/**
 * A listing photo. The original stays private in storage; the served sizes are WebP with all
 * metadata removed (no GPS position of the yard).
 */
@Entity({ name: "listing_photo" })
@Index("idx_listing_photo_listing", ["listingId", "position"])
export class ListingPhotoEntity {
  @PrimaryColumn({ type: "char", length: 36 })
  id: string;

  @Column({ name: "listing_id", type: "char", length: 36 })
  listingId: string;

  @ManyToOne(() => ListingEntity, { onDelete: "CASCADE" })
  @JoinColumn({ name: "listing_id" })
  listing?: ListingEntity;

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
