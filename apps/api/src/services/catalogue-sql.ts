import { slabFeatures, type CatalogueQueryParsed } from "@grainyard/contracts";
import type { CatalogueEntryEntity } from "../entities/index.ts";

/*
 * The catalogue search as plain SQL with positional parameters. It is the busiest query of the
 * marketplace, so it is written out rather than assembled by the query builder on every request
 * (building and hydrating through TypeORM cost about as much CPU as MariaDB's own work), and the
 * benchmark runs exactly these strings straight through mysql2.
 *
 * The page is a "deferred join": the inner query walks one of the covering sort indexes
 * (`idx_catalogue_newest` and friends hold the sort key, the id and every filtered column) to
 * pick the page's ids without reading a single row, then the outer query fetches only those rows.
 *
 * Distance is a property of the yard (every listing of a sawyer shares its pickup position), so
 * no distance is computed in SQL: the service works out which yards lie within a radius, and
 * walks the yards nearest first for the "nearest" sort (`nearestIdsSql`, one batch at a time).
 */

/** The columns a catalogue card is built from (everything the search returns per listing). */
export type CatalogueRow = Pick<
  CatalogueEntryEntity,
  | "listingId"
  | "sawyerId"
  | "title"
  | "speciesSlug"
  | "setKind"
  | "slabCount"
  | "lengthMm"
  | "thicknessMm"
  | "averageWidthMm"
  | "minWidthMm"
  | "usableLengthMm"
  | "usableWidthMm"
  | "usableThicknessMm"
  | "moisturePct"
  | "ready"
  | "priceMinor"
  | "pricePerBoardFootMinor"
  | "currency"
  | "boardFeet"
  | "volumeM3"
  | "weightKg"
  | "totalWeightHighKg"
  | "heaviestSlabHighKg"
  | "liveEdge"
  | "featureBits"
  | "freight"
  | "pickup"
  | "town"
  | "yardName"
  | "yardSlug"
  | "yardReviewCount"
  | "yardRatingTotal"
  | "latitude"
  | "longitude"
  | "photoId"
  | "photoAlt"
  | "publishedAt"
>;

const ROW_COLUMNS = [
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
  "yard_slug",
  "yard_review_count",
  "yard_rating_total",
  "latitude",
  "longitude",
  "photo_id",
  "photo_alt",
  "published_at",
] as const;

const number = (value: unknown) => Number(value);
const nullableNumber = (value: unknown) => (value === null || value === undefined ? null : Number(value));
const nullableText = (value: unknown) => (value === null || value === undefined ? null : String(value));

/** A row of the page query (as mysql2 hands it over) as a `CatalogueRow`. */
export function catalogueRowFromSql(raw: Record<string, unknown>): CatalogueRow {
  return {
    listingId: String(raw.listing_id),
    sawyerId: String(raw.sawyer_id),
    title: String(raw.title),
    speciesSlug: String(raw.species_slug),
    setKind: raw.set_kind as CatalogueRow["setKind"],
    slabCount: number(raw.slab_count),
    lengthMm: number(raw.length_mm),
    thicknessMm: number(raw.thickness_mm),
    averageWidthMm: number(raw.average_width_mm),
    minWidthMm: number(raw.min_width_mm),
    usableLengthMm: number(raw.usable_length_mm),
    usableWidthMm: number(raw.usable_width_mm),
    usableThicknessMm: number(raw.usable_thickness_mm),
    moisturePct: nullableNumber(raw.moisture_pct),
    ready: Boolean(number(raw.ready)),
    priceMinor: number(raw.price_minor), // BIGINT arrives as text
    pricePerBoardFootMinor: number(raw.price_per_board_foot_minor),
    currency: raw.currency as CatalogueRow["currency"],
    boardFeet: number(raw.board_feet),
    volumeM3: number(raw.volume_m3),
    weightKg: number(raw.weight_kg),
    totalWeightHighKg: number(raw.total_weight_high_kg),
    heaviestSlabHighKg: number(raw.heaviest_slab_high_kg),
    liveEdge: raw.live_edge as CatalogueRow["liveEdge"],
    featureBits: number(raw.feature_bits),
    freight: Boolean(number(raw.freight)),
    pickup: Boolean(number(raw.pickup)),
    town: nullableText(raw.town),
    yardName: nullableText(raw.yard_name),
    yardSlug: nullableText(raw.yard_slug),
    yardReviewCount: number(raw.yard_review_count),
    yardRatingTotal: number(raw.yard_rating_total),
    latitude: nullableNumber(raw.latitude),
    longitude: nullableNumber(raw.longitude),
    photoId: nullableText(raw.photo_id),
    photoAlt: nullableText(raw.photo_alt),
    publishedAt: raw.published_at instanceof Date ? raw.published_at : new Date(String(raw.published_at)),
  };
}

/** A piece of SQL and its positional parameters, in the order their `?` appear. */
export interface Fragment {
  sql: string;
  parameters: unknown[];
}

/** The finished top a fit search asks for (mm). */
export interface WantedTop {
  lengthMm: number;
  widthMm: number;
  thicknessMm: number;
}

const FEATURE_BITS: Record<(typeof slabFeatures)[number], number> = { crotch: 1, burl: 2, spalting: 4, figure: 8 };

/** Features as the bits stored in `feature_bits` (crotch 1, burl 2, spalting 4, figure 8). */
export function featureBits(features: readonly string[]): number {
  return features.reduce((bits, f) => bits | (FEATURE_BITS[f as keyof typeof FEATURE_BITS] ?? 0), 0);
}

/** The features a `feature_bits` value holds. */
export function featuresOf(bits: number) {
  return slabFeatures.filter((f) => (bits & FEATURE_BITS[f]) !== 0);
}

/**
 * Which yards a search is limited to: the sawyers whose pickup lies within the radius, or every
 * yard with a known position (`"placed"`); null for no limit.
 */
export type YardLimit = readonly string[] | "placed" | null;

const list = (values: readonly unknown[]) => values.map(() => "?").join(", ");

/** Every filter of the query as one WHERE condition ("1 = 1" when there is none). */
export function filterSql(input: CatalogueQueryParsed, top: WantedTop | null, yards: YardLimit = null): Fragment {
  const conditions: string[] = [];
  const parameters: unknown[] = [];
  const add = (sql: string, ...values: unknown[]) => {
    conditions.push(sql);
    parameters.push(...values);
  };
  if (top) add("usable_length_mm >= ? AND usable_width_mm >= ? AND usable_thickness_mm >= ?", top.lengthMm, top.widthMm, top.thicknessMm);
  if (input.species?.length) add(`species_slug IN (${list(input.species)})`, ...input.species);
  if (input.lengthMin !== undefined) add("length_mm >= ?", input.lengthMin);
  if (input.lengthMax !== undefined) add("length_mm <= ?", input.lengthMax);
  const widthColumn = input.widthBasis === "minimum" ? "min_width_mm" : "average_width_mm";
  if (input.widthMin !== undefined) add(`${widthColumn} >= ?`, input.widthMin);
  if (input.widthMax !== undefined) add(`${widthColumn} <= ?`, input.widthMax);
  if (input.thicknessMin !== undefined) add("thickness_mm >= ?", input.thicknessMin);
  if (input.thicknessMax !== undefined) add("thickness_mm <= ?", input.thicknessMax);
  if (input.moistureMax !== undefined) add("moisture_pct <= ?", input.moistureMax);
  if (input.ready) add("ready = 1");
  if (input.priceMin !== undefined) add("price_minor >= ?", input.priceMin);
  if (input.priceMax !== undefined) add("price_minor <= ?", input.priceMax);
  if (input.liveEdge?.length) add(`live_edge IN (${list(input.liveEdge)})`, ...input.liveEdge);
  if (input.features?.length) {
    const bits = featureBits(input.features);
    add("(feature_bits & ?) = ?", bits, bits);
  }
  if (input.sets?.length) add(`set_kind IN (${list(input.sets)})`, ...input.sets);
  if (input.freight) add("freight = 1");
  if (yards === "placed") add("latitude IS NOT NULL");
  else if (yards && yards.length === 0) add("0 = 1");
  else if (yards) add(`sawyer_id IN (${list(yards)})`, ...yards);
  return { sql: conditions.length ? conditions.join(" AND ") : "1 = 1", parameters };
}

/** The sort orders as SQL: each plain column has a covering index starting with it (see the entity). */
const SORT_COLUMNS: Record<Exclude<CatalogueQueryParsed["sort"], "nearest">, string> = {
  newest: "published_at",
  price_low: "price_minor",
  price_high: "price_minor",
  price_per_board_foot: "price_per_board_foot_minor",
  largest: "board_feet",
};

export interface PageSqlOptions {
  sort: Exclude<CatalogueQueryParsed["sort"], "nearest">;
  direction: "ASC" | "DESC";
  /** The last row of the previous page: its sort value and id. */
  after: { value: unknown; id: string } | null;
  /** Rows to fetch (one more than shown, to know whether another page follows). */
  rows: number;
}

/** The page query: the ids of the page in order through a covering index, then their rows. */
export function pageSql(filters: Fragment, options: PageSqlOptions): Fragment {
  const comparison = options.direction === "ASC" ? ">" : "<";
  const orderKey = SORT_COLUMNS[options.sort];
  const parameters: unknown[] = [...filters.parameters];
  let inner = `SELECT listing_id FROM catalogue_entry WHERE ${filters.sql}`;
  if (options.after) {
    inner += ` AND (${orderKey} ${comparison} ? OR (${orderKey} = ? AND listing_id ${comparison} ?))`;
    parameters.push(options.after.value, options.after.value, options.after.id);
  }
  inner += ` ORDER BY ${orderKey} ${options.direction}, listing_id ${options.direction} LIMIT ${Math.trunc(options.rows)}`;
  const sql =
    `SELECT ${ROW_COLUMNS.map((column) => `e.${column}`).join(", ")} FROM (${inner}) AS page ` +
    `STRAIGHT_JOIN catalogue_entry e ON e.listing_id = page.listing_id ORDER BY e.${orderKey} ${options.direction}, e.listing_id ${options.direction}`;
  return { sql, parameters };
}

/**
 * One batch of the "nearest" walk: the ids of matching listings from these yards (through the
 * covering `idx_catalogue_yard`), and from yards at exactly the previous page's last distance
 * only those after its last id.
 */
export function nearestIdsSql(
  filters: Fragment,
  yards: readonly string[],
  tie: { yards: readonly string[]; afterId: string } | null,
): Fragment {
  const parts: string[] = [];
  const parameters: unknown[] = [];
  if (yards.length) {
    parts.push(`sawyer_id IN (${list(yards)})`);
    parameters.push(...yards);
  }
  if (tie && tie.yards.length) {
    parts.push(`(sawyer_id IN (${list(tie.yards)}) AND listing_id > ?)`);
    parameters.push(...tie.yards, tie.afterId);
  }
  const which = parts.length ? `(${parts.join(" OR ")})` : "0 = 1";
  return {
    sql: `SELECT listing_id, sawyer_id FROM catalogue_entry WHERE ${which} AND ${filters.sql}`,
    parameters: [...parameters, ...filters.parameters],
  };
}

/** The rows of these listings (in no particular order). */
export function rowsByIdSql(listingIds: readonly string[]): Fragment {
  if (listingIds.length === 0) return { sql: `SELECT ${ROW_COLUMNS.join(", ")} FROM catalogue_entry WHERE 0 = 1`, parameters: [] };
  return {
    sql: `SELECT ${ROW_COLUMNS.join(", ")} FROM catalogue_entry WHERE listing_id IN (${list(listingIds)})`,
    parameters: [...listingIds],
  };
}

/** Counts at most `cap + 1` matches: enough to say "cap+" without reading the whole catalogue. */
export function cappedCountSql(filters: Fragment, cap: number): Fragment {
  return {
    sql: `SELECT COUNT(*) AS total FROM (SELECT 1 FROM catalogue_entry WHERE ${filters.sql} LIMIT ${Math.trunc(cap) + 1}) AS capped`,
    parameters: filters.parameters,
  };
}

/** Whether one listing matches the filters (a saved search's alert check). */
export function matchesListingSql(filters: Fragment, listingId: string): Fragment {
  return {
    sql: `SELECT 1 AS found FROM catalogue_entry WHERE listing_id = ? AND ${filters.sql} LIMIT 1`,
    parameters: [listingId, ...filters.parameters],
  };
}
