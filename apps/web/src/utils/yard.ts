import { findSpeciesBySlug } from "@grainyard/slab-math";
import type { DryingProjectionView, DryingState, ListingStatus, Log, Slab } from "@grainyard/contracts";
import { formatDate } from "./format.ts";

/** "Black walnut"; an unknown slug is shown as it came. */
export function speciesName(slug: string): string {
  return findSpeciesBySlug(slug)?.commonName ?? slug;
}

export function botanicalName(slug: string): string {
  return findSpeciesBySlug(slug)?.botanicalName ?? "";
}

export const dryingStateLabels: Record<DryingState, string> = {
  no_readings: "No readings yet",
  drying: "Drying",
  ready: "Ready",
  over_dried: "Below 6 %",
};

/** Listings whose slabs are no longer on offer: sold, or held while a buyer pays. */
const notOnOffer: readonly ListingStatus[] = ["sold", "reserved"];

/** Dry enough and still the sawyer's to sell (not sold, not held for a buyer). */
export function isReadyToSell(slab: Pick<Slab, "dryingState">, listingStatus: ListingStatus | null | undefined): boolean {
  return slab.dryingState === "ready" && !(listingStatus && notOnOffer.includes(listingStatus));
}

/** The yard's stock in three counts: every slab, those ready to sell, those sold. */
export function yardStock(
  slabs: readonly Pick<Slab, "id" | "dryingState">[],
  listingStatusOf: (slabId: string) => ListingStatus | null | undefined,
): { total: number; readyToSell: number; sold: number } {
  return {
    total: slabs.length,
    readyToSell: slabs.filter((slab) => isReadyToSell(slab, listingStatusOf(slab.id))).length,
    sold: slabs.filter((slab) => listingStatusOf(slab.id) === "sold").length,
  };
}

/** Plain words for every projection status the API gives. */
export function projectionSentence(projection: DryingProjectionView): string {
  const { minimumPct, maximumPct } = projection.targetBand;
  switch (projection.status) {
    case "ready":
      return `Ready: inside the ${minimumPct}–${maximumPct} % band.`;
    case "below_target_band":
      return `Drier than the ${minimumPct}–${maximumPct} % band. Let it take up moisture indoors before it is worked, or it may swell and move.`;
    case "not_enough_readings":
      return "Not enough readings yet — three are needed for a projection.";
    case "not_drying":
      return "Not drying — the last readings did not fall. Check the stack, the stickers and the airflow.";
    case "target_not_reachable":
      return `Where it is drying, it will not get down to ${maximumPct} %. A kiln or a heated room takes it the rest of the way.`;
    case "projected":
      return projection.projectedDate
        ? `Projected to reach ${maximumPct} % around ${formatDate(projection.projectedDate)}${
            projection.daysFromLastReading != null
              ? ` (about ${Math.round(projection.daysFromLastReading)} days after the last reading)`
              : ""
          }. An estimate from its own readings; keep measuring.`
        : `Projected to reach ${maximumPct} %; keep measuring.`;
  }
}

/** "Street tree in Lakemont · Harbour Hill". */
export function logPlace(log: Pick<Log, "siteTown" | "siteNeighbourhood">): string {
  return [log.siteTown, log.siteNeighbourhood].filter(Boolean).join(" · ");
}

export function slabTitle(slab: Pick<Slab, "speciesSlug" | "sequenceInLog">): string {
  const name = speciesName(slab.speciesSlug);
  return slab.sequenceInLog != null ? `${name}, slab ${slab.sequenceInLog}` : name;
}

/** Today as YYYY-MM-DD in the person's own time zone (for date inputs). */
export function todayIso(): string {
  const now = new Date();
  const month = String(now.getMonth() + 1).padStart(2, "0");
  const day = String(now.getDate()).padStart(2, "0");
  return `${now.getFullYear()}-${month}-${day}`;
}
