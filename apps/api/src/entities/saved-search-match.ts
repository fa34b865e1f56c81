import { Column, Entity, Index, JoinColumn, ManyToOne, PrimaryGeneratedColumn } from "typeorm";
import { ListingEntity } from "./listing.ts";
import { SavedSearchEntity } from "./saved-search.ts";

/** A listing that matched a saved search when it went live; pending until an alert e-mail carries it. */
@Entity({ name: "saved_search_match" })
@Index("idx_saved_search_match_unique", ["savedSearchId", "listingId"], { unique: true })
@Index("idx_saved_search_match_pending", ["alertedAt", "savedSearchId"])
export class SavedSearchMatchEntity {
  @PrimaryGeneratedColumn({ type: "bigint" })
  id: string;

  @Column({ name: "saved_search_id", type: "char", length: 36 })
  savedSearchId: string;

  @ManyToOne(() => SavedSearchEntity, { onDelete: "CASCADE" })
  @JoinColumn({ name: "saved_search_id" })
  savedSearch?: SavedSearchEntity;

  @Column({ name: "listing_id", type: "char", length: 36 })
  listingId: string;

  @ManyToOne(() => ListingEntity, { onDelete: "CASCADE" })
  @JoinColumn({ name: "listing_id" })
  listing?: ListingEntity;

  @Column({ name: "matched_at", type: "datetime", precision: 3 })
  matchedAt: Date;

  /** When an alert e-mail carried this match; null while pending. */
  @Column({ name: "alerted_at", type: "datetime", precision: 3, nullable: true })
  alertedAt: Date | null;
}
