import { randomUUID } from "node:crypto";
import type { DataSource, EntityManager } from "typeorm";
import {
  AccountEntity,
  ListingEntity,
  ListingPhotoEntity,
  ListingSlabEntity,
  MoistureReadingEntity,
  SlabEntity,
  YardLogEntity,
} from "../entities/index.ts";
import { computeListingFigures, computeSlabFigures } from "../services/figures.ts";
import { USUAL_FEES } from "@grainyard/slab-math";
import { lakemontStock } from "./lakemont-stock.ts";
import { slabPhoto } from "./slab-photo.ts";

/**
 * Invented Lakemont yard stock: logs from street trees, parks and building sites, the slabs cut
 * from them, moisture readings as they dried, and the listings made of them. Streets and stories
 * are made up.
 */
export interface DemoSlab {
  sequence: number;
  lengthMm: number;
  thicknessMm: number;
  widthStationsMm: number[];
  liveEdge: "both" | "one" | "none";
  surfacing: "rough_sawn" | "flattened" | "sanded";
  features: ("crotch" | "burl" | "spalting" | "figure")[];
  defects: ("checks" | "cracks" | "voids_filled" | "butterfly_keys")[];
  dryingMethod: "air" | "kiln" | "air_then_kiln";
  kilnCompletedOn: string | null;
  readings: [string, number][];
}

/** A review the buyer of a seeded sale writes (and the sawyer may answer), some days after completion. */
interface DemoReview {
  rating: number;
  matched: { yes: boolean; comment?: string };
  handover: { yes: boolean; comment?: string };
  body?: string;
  answer?: string;
  daysAfter: number;
  /** The sawyer reports the review to the admins with this reason (left open for the desk). */
  reportedBySawyer?: string;
}

/** A sale of a seeded listing, made through the real checkout and order steps. */
export interface DemoSale {
  buyer: string;
  handover: "pickup" | "freight";
  /** Days before the seed's day that the buyer paid. */
  daysAgo: number;
  /** Where the order stands now. */
  end: "completed" | "handed_over" | "ready_for_pickup" | "shipped" | "paid" | "cancelled";
  completedBy?: "buyer" | "automatic";
  cancelReason?: string;
  review?: DemoReview;
}

export interface DemoListing {
  title: string;
  description: string;
  setKind: "single" | "sequential" | "bookmatched";
  slabs: number[];
  priceMode: "per_board_foot" | "fixed";
  rateMinor: number;
  status: "live" | "draft" | "in_review";
  /** Days since it went live (or was submitted for review). */
  daysAgo?: number;
  freight?: boolean;
  sale?: DemoSale;
}

export interface DemoLog {
  yardEmail: string;
  speciesSlug: string;
  siteTown: string;
  siteNeighbourhood: string;
  siteKind: "street" | "park" | "private_yard" | "construction" | "other";
  fellingReason: "storm" | "disease" | "pests" | "construction" | "hazard" | "other";
  felledOn: string;
  milledOn: string;
  lengthMm: number;
  diameterMm: number;
  notes: string;
  /** The mill that cut it (decides the saw marks on a rough face in its photos). */
  mill?: "band" | "chainsaw";
  slabs: DemoSlab[];
  listings: DemoListing[];
}

const kilnDried = (readings: [string, number][]): Pick<DemoSlab, "dryingMethod" | "kilnCompletedOn" | "readings"> => ({
  dryingMethod: "air_then_kiln",
  kilnCompletedOn: readings.at(-1)![0],
  readings,
});

/** The first three demo logs, as they have been since the demo began (the end-to-end suites buy their listings by title). */
const firstLogs: DemoLog[] = [
  {
    yardEmail: "yard@ridgeback-timber.test",
    speciesSlug: "silver-maple",
    siteTown: "Lakemont",
    siteNeighbourhood: "Alder Row",
    siteKind: "street",
    fellingReason: "storm",
    felledOn: "2023-08-19",
    milledOn: "2023-09-02",
    lengthMm: 3100,
    diameterMm: 820,
    notes: "Split in the August thunderstorm; the city crew left us the butt log. Some spalting near the heart.",
    slabs: [1, 2, 3].map((sequence) => ({
      sequence,
      lengthMm: 2900,
      thicknessMm: 57,
      widthStationsMm: [690 - sequence * 10, 655, 640, 672 - sequence * 6],
      liveEdge: "both",
      surfacing: "flattened",
      features: sequence === 2 ? ["spalting", "figure"] : ["spalting"],
      defects: sequence === 3 ? ["checks"] : [],
      ...kilnDried([
        ["2023-09-10", 62],
        ["2024-03-01", 31],
        ["2024-09-15", 16],
        ["2025-01-20", 8.5],
      ]),
    })),
    listings: [
      {
        title: "Spalted silver maple, sequential pair",
        description: "Two neighbouring slabs from an Alder Row street maple, flattened and kiln-finished.",
        setKind: "sequential",
        slabs: [1, 2],
        priceMode: "per_board_foot",
        rateMinor: 1100,
        status: "live",
        daysAgo: 1,
      },
      {
        title: "Silver maple bench slab with checks",
        description: "The outside slab of the Alder Row maple; end checks stabilised.",
        setKind: "single",
        slabs: [3],
        priceMode: "fixed",
        rateMinor: 32000,
        status: "draft",
      },
    ],
  },
  {
    yardEmail: "hello@cobblelane-slabs.test",
    speciesSlug: "northern-red-oak",
    siteTown: "East Lakemont",
    siteNeighbourhood: "Fountain Park",
    siteKind: "park",
    fellingReason: "construction",
    felledOn: "2024-02-12",
    milledOn: "2024-02-20",
    lengthMm: 2700,
    diameterMm: 910,
    notes:
      "Removed for the Fountain Park path renovation; milled on site with the chainsaw mill. The widest slab went through the co-op kiln.",
    slabs: [
      ...[1, 2].map((sequence): DemoSlab => ({
        sequence,
        lengthMm: 2500,
        thicknessMm: 76,
        widthStationsMm: [840, 800, 785, 820],
        liveEdge: "both",
        surfacing: "rough_sawn",
        features: [],
        defects: ["cracks"],
        dryingMethod: "air",
        kilnCompletedOn: null,
        readings: [
          ["2024-03-01", 74],
          ["2024-09-01", 41],
          ["2025-03-01", 27],
          ["2025-09-01", 19],
        ],
      })),
      {
        sequence: 3,
        lengthMm: 2950,
        thicknessMm: 64,
        widthStationsMm: [1040, 985, 960, 975, 1010],
        liveEdge: "both",
        surfacing: "flattened",
        features: ["figure"],
        defects: ["butterfly_keys"],
        ...kilnDried([
          ["2024-03-01", 71],
          ["2024-10-01", 33],
          ["2025-04-01", 17],
          ["2025-08-20", 8],
        ]),
      },
    ],
    listings: [
      {
        title: "Wide red oak dining slab, seats eight",
        description: "Centre cut of the Fountain Park oak, flattened both faces; two walnut butterfly keys hold a small check.",
        setKind: "single",
        slabs: [3],
        priceMode: "per_board_foot",
        rateMinor: 1450,
        status: "live",
        daysAgo: 2,
      },
    ],
  },
  {
    yardEmail: "kiln@northshore-coop.test",
    speciesSlug: "black-walnut",
    siteTown: "Northshore",
    siteNeighbourhood: "St. Brigid hospital grounds",
    siteKind: "construction",
    fellingReason: "construction",
    felledOn: "2022-11-04",
    milledOn: "2022-11-20",
    lengthMm: 2600,
    diameterMm: 700,
    notes: "Came out for the hospital's new wing. Crotch figure in the first cuts; one void filled with clear epoxy.",
    slabs: [1, 2].map((sequence) => ({
      sequence,
      lengthMm: 2440,
      thicknessMm: 51,
      widthStationsMm: [560, 535, 520, 548],
      liveEdge: "one",
      surfacing: "sanded",
      features: ["crotch", "figure"],
      defects: sequence === 1 ? ["voids_filled", "butterfly_keys"] : [],
      ...kilnDried([
        ["2022-12-01", 55],
        ["2023-06-01", 28],
        ["2023-12-01", 14],
        ["2024-02-15", 7.5],
      ]),
    })),
    listings: [
      {
        title: "Bookmatched black walnut pair with crotch figure",
        description: "Two neighbouring slabs from the hospital-wing walnut, opened like a book. One small void filled with clear epoxy.",
        setKind: "bookmatched",
        slabs: [1, 2],
        priceMode: "fixed",
        rateMinor: 260000,
        status: "live",
        daysAgo: 3,
      },
    ],
  },
];

/** Every demo log: the first three, then the rest of the region's stock (dates counted back from `now`). */
export function demoLogs(now = new Date()): DemoLog[] {
  return [...firstLogs, ...lakemontStock(now)];
}

const DAY = 86_400_000;

/** Stores one painted photo (storage only) and answers its row; the seed inserts the rows in its transaction. */
export type StorePhoto = (
  listingId: string,
  position: number,
  bytes: Buffer,
  altText: string,
) => Promise<Pick<ListingPhotoEntity, "id" | "listingId" | "position" | "altText" | "width" | "height" | "originalFormat">>;

/** A seeded listing with a sale to make once the stock is in (see lakemont-sales.ts). */
export interface PlannedSale {
  listingId: string;
  title: string;
  yardEmail: string;
  sale: DemoSale;
}

interface PlannedListing {
  id: string;
  log: DemoLog;
  logIndex: number;
  demo: DemoListing;
}

/** Runs `work` over `items`, `limit` at a time (painting in JavaScript overlaps sharp's encoding on its threads). */
async function inParallel<T, R>(items: T[], limit: number, work: (item: T) => Promise<R>): Promise<R[]> {
  const results: R[] = new Array(items.length);
  let next = 0;
  const runners = Array.from({ length: Math.min(limit, items.length) }, async () => {
    while (next < items.length) {
      const index = next++;
      results[index] = await work(items[index]!);
    }
  });
  await Promise.all(runners);
  return results;
}

function altTextOf(log: DemoLog, listing: DemoListing): string {
  const numbers = listing.slabs.join(listing.slabs.length === 2 ? " and " : ", ");
  return listing.slabs.length > 1
    ? `Slabs ${numbers} of the ${log.siteNeighbourhood} ${log.speciesSlug.replace(/-/g, " ")}, top faces${listing.setKind === "bookmatched" ? ", opened like a book" : ""}`
    : `Slab ${numbers} of the ${log.siteNeighbourhood} ${log.speciesSlug.replace(/-/g, " ")}, top face`;
}

/**
 * Adds the demo yard stock that is missing (a log is there when its yard has a log from the same
 * site; a second run adds nothing). With `photos`, every listing but drafts gets a painted photo
 * through the real photo pipeline (painted and stored before the transaction, a few at a time);
 * live listings enter the catalogue through `onLive`. Answers the sales to make of what it added.
 */
export async function seedLakemontYards(
  dataSource: DataSource,
  options: { photos?: StorePhoto; onLive?: (manager: EntityManager, listingId: string) => Promise<void>; now?: Date } = {},
): Promise<{ logs: number; listings: number; photos: number; sales: PlannedSale[]; listingIds: string[] }> {
  const now = options.now ?? new Date();
  const logs = demoLogs(now);
  const sawyers = new Map(
    (await dataSource.getRepository(AccountEntity).find({ where: { role: "sawyer" }, select: { id: true, email: true } })).map((a) => [
      a.email,
      a.id,
    ]),
  );
  const existing = new Set(
    (await dataSource.getRepository(YardLogEntity).find({ select: { sawyerId: true, siteNeighbourhood: true } })).map(
      (l) => `${l.sawyerId}|${l.siteNeighbourhood}`,
    ),
  );
  const missing = logs
    .map((log, logIndex) => ({ log, logIndex }))
    .filter(({ log }) => sawyers.has(log.yardEmail) && !existing.has(`${sawyers.get(log.yardEmail)}|${log.siteNeighbourhood}`));
  const planned: PlannedListing[] = missing.flatMap(({ log, logIndex }) =>
    log.listings.map((demo) => ({ id: randomUUID(), log, logIndex, demo })),
  );

  // Photos first: painted and through the photo pipeline into storage; their rows go in with the rest.
  // A set gets a second photo: its first slab on its own, as a buyer would want to see it.
  const photoJobs = planned
    .filter((p) => p.demo.status !== "draft")
    .flatMap((p) => [
      { ...p, position: 0, slabs: p.demo.slabs },
      ...(p.demo.slabs.length > 1 ? [{ ...p, position: 1, slabs: p.demo.slabs.slice(0, 1) }] : []),
    ]);
  const photoRows = options.photos
    ? await inParallel(photoJobs, 2, async ({ id, log, logIndex, demo, position, slabs }) =>
        options.photos!(
          id,
          position,
          await slabPhoto({
            speciesSlug: log.speciesSlug,
            setKind: slabs.length > 1 ? demo.setKind : "single",
            slabs: slabs.map((n) => log.slabs.find((s) => s.sequence === n)!),
            seed: logIndex * 31 + slabs[0]! + position * 7,
            mill: log.mill,
          }),
          position === 0 ? altTextOf(log, demo) : altTextOf(log, { ...demo, slabs }),
        ),
      )
    : [];

  await dataSource.transaction(async (manager) => {
    for (const { log } of missing) await addLog(manager, sawyers.get(log.yardEmail)!, log, planned, now);
    if (photoRows.length) await manager.getRepository(ListingPhotoEntity).insert(photoRows);
    for (const listing of planned) if (listing.demo.status === "live") await options.onLive?.(manager, listing.id);
  });
  return {
    logs: missing.length,
    listings: planned.length,
    photos: photoRows.length,
    listingIds: planned.map((p) => p.id),
    sales: planned.flatMap((p) =>
      p.demo.sale ? [{ listingId: p.id, title: p.demo.title, yardEmail: p.log.yardEmail, sale: p.demo.sale }] : [],
    ),
  };
}

async function addLog(manager: EntityManager, sawyerId: string, demo: DemoLog, planned: PlannedListing[], now: Date) {
  const logId = randomUUID();
  await manager.getRepository(YardLogEntity).insert({
    id: logId,
    sawyerId,
    speciesSlug: demo.speciesSlug,
    siteTown: demo.siteTown,
    siteNeighbourhood: demo.siteNeighbourhood,
    siteKind: demo.siteKind,
    fellingReason: demo.fellingReason,
    felledOn: demo.felledOn,
    milledOn: demo.milledOn,
    lengthMm: demo.lengthMm,
    diameterMm: demo.diameterMm,
    notes: demo.notes,
  });
  const slabIds = new Map<number, string>();
  const figuresBySequence = new Map<number, ReturnType<typeof computeSlabFigures>>();
  const readings: Partial<MoistureReadingEntity>[] = [];
  const slabRows: Partial<SlabEntity>[] = [];
  for (const slab of demo.slabs) {
    const id = randomUUID();
    const last = slab.readings.at(-1) ?? null;
    const figures = computeSlabFigures({ ...slab, speciesSlug: demo.speciesSlug, lastMoisturePct: last ? last[1] : null });
    slabRows.push({
      id,
      sawyerId,
      logId,
      sequenceInLog: slab.sequence,
      speciesSlug: demo.speciesSlug,
      lengthMm: slab.lengthMm,
      thicknessMm: slab.thicknessMm,
      widthStationsMm: slab.widthStationsMm,
      liveEdge: slab.liveEdge,
      surfacing: slab.surfacing,
      features: slab.features,
      defects: slab.defects,
      dryingMethod: slab.dryingMethod,
      kilnCompletedOn: slab.kilnCompletedOn,
      heatTreated: slab.dryingMethod !== "air",
      heatTreatmentTemperatureC: slab.dryingMethod !== "air" ? 60 : null,
      heatTreatmentMinutes: slab.dryingMethod !== "air" ? 60 : null,
      notes: "",
      ...figures,
      lastMoisturePct: last ? last[1] : null,
      lastReadOn: last ? last[0] : null,
    });
    for (const [readOn, moistureContentPct] of slab.readings)
      readings.push({ id: randomUUID(), slabId: id, readOn, moistureContentPct, method: "pin_meter" });
    slabIds.set(slab.sequence, id);
    figuresBySequence.set(slab.sequence, figures);
  }
  await manager.getRepository(SlabEntity).insert(slabRows);
  if (readings.length) await manager.getRepository(MoistureReadingEntity).insert(readings);
  for (const { id: listingId, demo: demoListing } of planned.filter((p) => p.log === demo)) {
    const figures = computeListingFigures({
      priceMode: demoListing.priceMode,
      rateMinor: demoListing.rateMinor,
      slabs: demoListing.slabs.map((n) => figuresBySequence.get(n)!),
      fees: USUAL_FEES,
    });
    const at = new Date(now.getTime() - (demoListing.daysAgo ?? 0) * DAY);
    const submitted = demoListing.status !== "draft";
    await manager.getRepository(ListingEntity).insert({
      id: listingId,
      sawyerId,
      title: demoListing.title,
      description: demoListing.description,
      setKind: demoListing.setKind,
      priceMode: demoListing.priceMode,
      rateMinor: demoListing.rateMinor,
      currency: "USD",
      pickup: true,
      freight: demoListing.freight ?? true,
      status: demoListing.status,
      reviewNote: null,
      submittedAt: submitted ? new Date(at.getTime() - (demoListing.status === "live" ? DAY : 0)) : null,
      publishedAt: demoListing.status === "live" ? at : null,
      ...figures,
    });
    await manager
      .getRepository(ListingSlabEntity)
      .insert(demoListing.slabs.map((n, position) => ({ listingId, slabId: slabIds.get(n)!, position })));
  }
}
