import type { CatalogueCard, Favourite } from "@grainyard/contracts";
import type { DataSource } from "typeorm";
import { FavouriteEntity, ListingEntity } from "../entities/index.ts";
import { NotFound } from "../errors.ts";
import { requireRole, type Actor } from "./actor.ts";
import { catalogueCardsFor } from "./catalogue-cards.ts";

/** Listings a buyer keeps an eye on. */
export function createFavouriteService(deps: { dataSource: DataSource; now?: () => Date }) {
  const { dataSource } = deps;
  const now = deps.now ?? (() => new Date());
  const favourites = () => dataSource.getRepository(FavouriteEntity);

  return {
    /** Idempotent: favouriting twice keeps the first time. Only live listings. */
    async add(actor: Actor, listingId: string): Promise<Favourite> {
      const buyer = requireRole(actor, "buyer");
      const listing = await dataSource.getRepository(ListingEntity).findOneBy({ id: listingId });
      if (!listing || listing.status !== "live") throw new NotFound("Only slabs that are for sale can be kept as favourites.");
      await favourites()
        .createQueryBuilder()
        .insert()
        .into(FavouriteEntity)
        .values({ accountId: buyer.accountId, listingId, createdAt: now() })
        .orIgnore()
        .execute();
      const saved = await favourites().findOneByOrFail({ accountId: buyer.accountId, listingId });
      return { listingId: saved.listingId, createdAt: saved.createdAt.toISOString() };
    },

    /** Idempotent: removing one that is not there is fine. */
    async remove(actor: Actor, listingId: string): Promise<void> {
      const buyer = requireRole(actor, "buyer");
      await favourites().delete({ accountId: buyer.accountId, listingId });
    },

    /** Catalogue cards of favourites still live, most recently favourited first. */
    async list(actor: Actor): Promise<CatalogueCard[]> {
      const buyer = requireRole(actor, "buyer");
      const rows = await favourites().find({
        where: { accountId: buyer.accountId },
        order: { createdAt: "DESC", listingId: "ASC" },
        take: 500,
      });
      return catalogueCardsFor(
        dataSource,
        rows.map((row) => row.listingId),
      );
    },
  };
}

export type FavouriteService = ReturnType<typeof createFavouriteService>;
