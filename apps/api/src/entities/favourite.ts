import { Column, Entity, Index, JoinColumn, ManyToOne, PrimaryColumn } from "typeorm";
import { AccountEntity } from "./account.ts";
import { ListingEntity } from "./listing.ts";

/** A listing a buyer keeps an eye on. One row per buyer and listing. */
@Entity({ name: "favourite" })
@Index("idx_favourite_account_newest", ["accountId", "createdAt"])
export class FavouriteEntity {
  @PrimaryColumn({ name: "account_id", type: "char", length: 36 })
  accountId: string;

  @PrimaryColumn({ name: "listing_id", type: "char", length: 36 })
  listingId: string;

  @ManyToOne(() => AccountEntity, { onDelete: "CASCADE" })
  @JoinColumn({ name: "account_id" })
  account?: AccountEntity;

  @ManyToOne(() => ListingEntity, { onDelete: "CASCADE" })
  @JoinColumn({ name: "listing_id" })
  listing?: ListingEntity;

  @Column({ name: "created_at", type: "datetime", precision: 3 })
  createdAt: Date;
}
