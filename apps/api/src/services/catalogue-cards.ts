import type { CatalogueCard } from "@grainyard/contracts";
import { slabFeatures, yardPaths } from "@grainyard/contracts";
import { In, type DataSource } from "typeorm";
import { CatalogueEntryEntity } from "../entities/index.ts";
import { featureBits } from "./catalogue-service.ts";

/**
 * A catalogue card from a catalogue row, with no search context (no distance, no fit). The same
 * shape and values as the catalogue search's cards; buyer-tools.test.ts checks that they agree.
 * (The search's own `toCard` lives inside the catalogue service's closure; exporting it from
 * there would let this file go.)
 */
export function plainCatalogueCard(entry: CatalogueEntryEntity): CatalogueCard {
  return {
    listingId: entry.listingId,
    title: entry.title,
    speciesSlug: entry.speciesSlug,
    setKind: entry.setKind,
    slabCount: entry.slabCount,
    lengthMm: entry.lengthMm,
    averageWidthMm: entry.averageWidthMm,
    minWidthMm: entry.minWidthMm,
    thicknessMm: entry.thicknessMm,
    boardFeet: entry.boardFeet,
    volumeM3: entry.volumeM3,
    weightKg: entry.weightKg,
    weightHighKg: entry.weightHighKg,
    moisturePct: entry.moisturePct,
    ready: entry.ready,
    priceMinor: entry.priceMinor,
    pricePerBoardFootMinor: entry.pricePerBoardFootMinor,
    currency: entry.currency,
    liveEdge: entry.liveEdge,
    features: slabFeatures.filter((feature) => (entry.featureBits & featureBits([feature])) !== 0),
    freight: entry.freight,
    pickup: entry.pickup,
    town: entry.town,
    yardName: entry.yardName,
    distanceKm: null,
    fit: null,
    photoUrl: entry.photoId ? yardPaths.photoImage(entry.photoId, "small") : null,
    photoAlt: entry.photoAlt,
    publishedAt: entry.publishedAt.toISOString(),
  };
}

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
