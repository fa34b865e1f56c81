import { randomUUID } from "node:crypto";
import type { DataSource, EntityManager } from "typeorm";
import { AccountEntity, ListingEntity, ListingSlabEntity, MoistureReadingEntity, SlabEntity, YardLogEntity } from "../entities/index.ts";
import { computeListingFigures, computeSlabFigures } from "../services/figures.ts";
import { USUAL_FEES } from "@grainyard/slab-math";
import { slabPicture } from "./slab-picture.ts";

/**
 * Invented Lakemont yard stock: logs from street trees, parks and a hospital expansion, the slabs
 * cut from them, and moisture readings as they dried. Streets and stories are made up.
 */
interface DemoSlab {
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

interface DemoLog {
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
  slabs: DemoSlab[];
  listings: {
    title: string;
    description: string;
    setKind: "single" | "sequential" | "bookmatched";
    slabs: number[];
    priceMode: "per_board_foot" | "fixed";
    rateMinor: number;
    live: boolean;
  }[];
}

const kilnDried = (readings: [string, number][]): Pick<DemoSlab, "dryingMethod" | "kilnCompletedOn" | "readings"> => ({
  dryingMethod: "air_then_kiln",
  kilnCompletedOn: readings.at(-1)![0],
  readings,
});

export const demoLogs: DemoLog[] = [
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
        live: true,
      },
      {
        title: "Silver maple bench slab with checks",
        description: "The outside slab of the Alder Row maple; end checks stabilised.",
        setKind: "single",
        slabs: [3],
        priceMode: "fixed",
        rateMinor: 32000,
        live: false,
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
        live: true,
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
        live: true,
      },
    ],
  },
];

type AddPhoto = (manager: EntityManager, listingId: string, position: number, bytes: Buffer, altText: string) => Promise<void>;

async function addLog(
  manager: EntityManager,
  sawyer: AccountEntity,
  demo: DemoLog,
  photos?: AddPhoto,
  onLive?: (manager: EntityManager, listingId: string) => Promise<void>,
) {
  const logId = randomUUID();
  await manager.getRepository(YardLogEntity).insert({
    id: logId,
    sawyerId: sawyer.id,
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
  for (const slab of demo.slabs) {
    const id = randomUUID();
    const last = slab.readings.at(-1) ?? null;
    const figures = computeSlabFigures({ ...slab, speciesSlug: demo.speciesSlug, lastMoisturePct: last ? last[1] : null });
    await manager.getRepository(SlabEntity).insert({
      id,
      sawyerId: sawyer.id,
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
    for (const [readOn, moistureContentPct] of slab.readings) {
      await manager
        .getRepository(MoistureReadingEntity)
        .insert({ id: randomUUID(), slabId: id, readOn, moistureContentPct, method: "pin_meter" });
    }
    slabIds.set(slab.sequence, id);
    figuresBySequence.set(slab.sequence, figures);
  }
  for (const demoListing of demo.listings) {
    const listingId = randomUUID();
    const figures = computeListingFigures({
      priceMode: demoListing.priceMode,
      rateMinor: demoListing.rateMinor,
      slabs: demoListing.slabs.map((n) => figuresBySequence.get(n)!),
      fees: USUAL_FEES,
    });
    const at = new Date();
    await manager.getRepository(ListingEntity).insert({
      id: listingId,
      sawyerId: sawyer.id,
      title: demoListing.title,
      description: demoListing.description,
      setKind: demoListing.setKind,
      priceMode: demoListing.priceMode,
      rateMinor: demoListing.rateMinor,
      currency: "USD",
      pickup: true,
      freight: true,
      status: demoListing.live ? "live" : "draft",
      reviewNote: null,
      submittedAt: demoListing.live ? at : null,
      publishedAt: demoListing.live ? at : null,
      ...figures,
    });
    await manager
      .getRepository(ListingSlabEntity)
      .insert(demoListing.slabs.map((n, position) => ({ listingId, slabId: slabIds.get(n)!, position })));
    if (photos) {
      for (const [position, n] of demoListing.slabs.entries()) {
        const slab = demo.slabs.find((s) => s.sequence === n)!;
        await photos(
          manager,
          listingId,
          position,
          await slabPicture(demo.speciesSlug, slab.lengthMm, slab.widthStationsMm, n),
          `Slab ${n} of the ${demo.siteNeighbourhood} log, top face`,
        );
      }
    }
    if (demoListing.live) await onLive?.(manager, listingId);
  }
}

/**
 * Adds the demo yard stock to each demo sawyer who does not have it yet; a second run adds
 * nothing. With `photos`, listings get drawn photos through the real photo pipeline, and live
 * ones enter the catalogue through `onLive`.
 */
export async function seedLakemontYards(
  dataSource: DataSource,
  options: { photos?: AddPhoto; onLive?: (manager: EntityManager, listingId: string) => Promise<void> } = {},
): Promise<{ logs: number }> {
  let logs = 0;
  await dataSource.transaction(async (manager) => {
    for (const demo of demoLogs) {
      const sawyer = await manager.getRepository(AccountEntity).findOneBy({ email: demo.yardEmail });
      if (!sawyer) continue;
      if (await manager.getRepository(YardLogEntity).exists({ where: { sawyerId: sawyer.id, siteNeighbourhood: demo.siteNeighbourhood } }))
        continue;
      await addLog(manager, sawyer, demo, options.photos, options.onLive);
      logs += 1;
    }
  });
  return { logs };
}
