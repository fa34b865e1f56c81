import { Column, Entity, Index, JoinColumn, ManyToOne, PrimaryColumn } from "typeorm";
import { AccountEntity } from "./account.ts";
import { ListingEntity } from "./listing.ts";

/** One conversation between a buyer and the sawyer about one listing (one per buyer and listing). */
@Entity({ name: "message_thread" })
@Index("idx_message_thread_buyer_listing", ["buyerId", "listingId"], { unique: true })
@Index("idx_message_thread_buyer", ["buyerId", "lastMessageAt"])
@Index("idx_message_thread_sawyer", ["sawyerId", "lastMessageAt"])
export class MessageThreadEntity {
  @PrimaryColumn({ type: "char", length: 36 })
  id: string;

  @Column({ name: "listing_id", type: "char", length: 36 })
  listingId: string;

  @ManyToOne(() => ListingEntity, { onDelete: "CASCADE" })
  @JoinColumn({ name: "listing_id" })
  listing?: ListingEntity;

  /** Who asked (usually a buyer; a sawyer may ask another yard). */
  @Column({ name: "buyer_id", type: "char", length: 36 })
  buyerId: string;

  @ManyToOne(() => AccountEntity, { onDelete: "CASCADE" })
  @JoinColumn({ name: "buyer_id" })
  buyer?: AccountEntity;

  /** The listing's sawyer, copied so a thread list needs no join through the listing. */
  @Column({ name: "sawyer_id", type: "char", length: 36 })
  sawyerId: string;

  @ManyToOne(() => AccountEntity, { onDelete: "CASCADE" })
  @JoinColumn({ name: "sawyer_id" })
  sawyer?: AccountEntity;

  @Column({ name: "last_message_at", type: "datetime", precision: 3 })
  lastMessageAt: Date;

  @Column({ name: "created_at", type: "datetime", precision: 3 })
  createdAt: Date;
}
