import { formatMoney } from "@grainyard/slab-math";
import type { Listing, ReviewChange } from "@grainyard/contracts";

/**
 * What a reviewer saw, as flat labelled text: stored with each review decision, compared with the
 * listing at its next submission so the reviewer sees only what changed.
 */
export type ReviewSnapshot = Record<string, { label: string; value: string }>;

const money = (minor: number, currency: string) => `${formatMoney(minor, currency)} ${currency}`;
const yesNo = (value: boolean) => (value ? "yes" : "no");
const list = (values: readonly (string | number)[]) => (values.length ? values.join(", ") : "none");

export function snapshotOf(listing: Listing): ReviewSnapshot {
  const snapshot: ReviewSnapshot = {
    title: { label: "Title", value: listing.title },
    description: { label: "Description", value: listing.description },
    setKind: { label: "Kind of set", value: listing.setKind },
    price: { label: "Price", value: `${listing.priceMode.replaceAll("_", " ")}: ${money(listing.rateMinor, listing.currency)}` },
    pickup: { label: "Pickup", value: yesNo(listing.pickup) },
    freight: { label: "Freight", value: yesNo(listing.freight) },
    photos: { label: "Photos (short ids, in order)", value: listing.photos.map((p) => p.id.slice(0, 8)).join(", ") || "none" },
    photoCount: { label: "Number of photos", value: String(listing.photos.length) },
  };
  listing.slabs.forEach((slab, i) => {
    const prefix = listing.slabs.length > 1 ? `Slab ${i + 1} ` : "Slab ";
    const key = (name: string) => `slabs.${i}.${name}`;
    const add = (name: string, label: string, value: string) => (snapshot[key(name)] = { label: `${prefix}${label}`, value });
    add("id", "identity", slab.id);
    add("species", "species", slab.speciesSlug);
    add("length", "length", `${slab.lengthMm} mm`);
    add("thickness", "thickness", `${slab.thicknessMm} mm`);
    add("widths", "widths", `${list(slab.widthStationsMm)} mm`);
    add("liveEdge", "live edge", slab.liveEdge);
    add("surfacing", "surfacing", slab.surfacing);
    add("features", "features", list(slab.features));
    add("defects", "defects", list(slab.defects));
    add("drying", "drying", slab.dryingMethod + (slab.kilnCompletedOn ? ` (kiln done ${slab.kilnCompletedOn})` : ""));
    add(
      "moisture",
      "moisture",
      slab.lastMoisturePct === null ? "no reading" : `${slab.lastMoisturePct} %${slab.lastReadOn ? ` on ${slab.lastReadOn}` : ""}`,
    );
    add("notes", "notes", slab.notes);
  });
  return snapshot;
}

/** Fields whose text differs, in the order of the newer snapshot, then fields that are gone. */
export function changesBetween(before: ReviewSnapshot, after: ReviewSnapshot): ReviewChange[] {
  const changes: ReviewChange[] = [];
  for (const [field, entry] of Object.entries(after)) {
    const old = before[field];
    if (!old) changes.push({ field, label: entry.label, before: "—", after: entry.value });
    else if (old.value !== entry.value) changes.push({ field, label: entry.label, before: old.value, after: entry.value });
  }
  for (const [field, entry] of Object.entries(before)) {
    if (!(field in after)) changes.push({ field, label: entry.label, before: entry.value, after: "—" });
  }
  return changes;
}
