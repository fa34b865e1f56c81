import type { CatalogueCard } from "@grainyard/contracts";
import { In, type DataSource } from "typeorm";
import { CatalogueEntryEntity } from "../entities/index.ts";
import { plainCatalogueCard } from "./catalogue-service.ts";

/** Cards for given listings, in the order given; listings that are not live (no catalogue row) are left out. */
export async function catalogueCardsFor(dataSource: DataSource, listingIds: string[]): Promise<CatalogueCard[]> {
  if (listingIds.length === 0) return [];
  const entries = await dataSource.getRepository(CatalogueEntryEntity).findBy({ listingId: In(listingIds) });
  const byId = new Map(entries.map((entry) => [entry.listingId, entry]));
  return listingIds.flatMap((id) => {
    const entry = byId.get(id);
    return entry ? [plainCatalogueCard(entry)] : [];
  });
}
