import { createHash, createHmac, timingSafeEqual } from "node:crypto";
import { gzipSync } from "node:zlib";
import type { CatalogueCard, CatalogueDetail, CatalogueQueryParsed, CatalogueResult, Place, SpeciesCounts } from "@grainyard/contracts";
import { listingEndpoints, pathOf } from "@grainyard/contracts";
import {
  averageRating,
  ratingSummary,
  KILN_DRIED_TARGET_BAND,
  NIOSH_LOAD_CONSTANT_KG,
  findSpeciesBySlug,
  gluedTableFit,
  greatCircleKm,
  tableFit,
  topLengthForSeats,
} from "@grainyard/slab-math";
import { LRUCache } from "lru-cache";
import { In, type DataSource, type EntityManager } from "typeorm";
import {
  AccountEntity,
  CatalogueEntryEntity,
  LogPhotoEntity,
  ListingEntity,
  ListingPhotoEntity,
  ListingSlabEntity,
  MoistureReadingEntity,
  SlabEntity,
  YardLogEntity,
} from "../entities/index.ts";
import { Invalid, NotFound } from "../errors.ts";
import type { Actor } from "./actor.ts";
import { photoView } from "./listing-service.ts";
import { logPhotoView } from "./photo-service.ts";
import { cardWeights, withFigureErrors } from "./figures.ts";
import { findPlace } from "./places.ts";
import { toLog, toSlab } from "./yard-service.ts";
import { nearestFirst, type YardDistance } from "./nearest-first.ts";
import { NO_REVIEWS, yardRatingTotals } from "./yard-rating.ts";
import { createReplicaReads, type ReplicaReads } from "../db/read-replica.ts";
import {
  cappedCountSql,
  catalogueRowFromSql,
  featureBits,
  featuresOf,
  filterSql,
  matchesListingSql,
  nearestIdsSql,
  pageSql,
  rowsByIdSql,
  type CatalogueRow,
  type Fragment,
  type YardLimit,
} from "./catalogue-sql.ts";

/** A yard's pickup position. */
interface YardPosition {
  sawyerId: string;
  latitude: number;
  longitude: number;
}

export { featureBits } from "./catalogue-sql.ts";

/** A catalogue card from a catalogue row, with no search context (no distance, no fit). */
export function plainCatalogueCard(entry: CatalogueRow): CatalogueCard {
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
    totalWeightHighKg: entry.totalWeightHighKg,
    heaviestSlabHighKg: entry.heaviestSlabHighKg,
    moisturePct: entry.moisturePct,
    ready: entry.ready,
    priceMinor: entry.priceMinor,
    pricePerBoardFootMinor: entry.pricePerBoardFootMinor,
    currency: entry.currency,
    liveEdge: entry.liveEdge,
    features: featuresOf(entry.featureBits),
    freight: entry.freight,
    pickup: entry.pickup,
    town: entry.town,
    yardName: entry.yardName,
    yardSlug: entry.yardSlug,
    yardRating:
      entry.yardReviewCount > 0
        ? { average: averageRating(entry.yardRatingTotal, entry.yardReviewCount)!, count: entry.yardReviewCount }
        : null,
    distanceKm: null,
    fit: null,
    photoUrl: entry.photoId ? pathOf(listingEndpoints.listingPhotoImage, { photoId: entry.photoId, size: "small" }) : null,
    photoMediumUrl: entry.photoId ? pathOf(listingEndpoints.listingPhotoImage, { photoId: entry.photoId, size: "medium" }) : null,
    photoAlt: entry.photoAlt,
    publishedAt: entry.publishedAt.toISOString(),
  };
}

/** A dining top's usual width and thickness when a buyer gives only the number of diners (common practice: about 900 mm wide, 38 mm thick). */
const DEFAULT_DINING_WIDTH_MM = 900;
const DEFAULT_TOP_THICKNESS_MM = 38;

/**
 * What a listing yields as a finished top, from slab-math's fit check with its default allowances:
 * the fit against a 1 mm top leaves spare = usable − 1 in each direction.
 */
export function usableTop(slabs: { lengthMm: number; thicknessMm: number; widthStationsMm: number[] }[]) {
  const smallest = { lengthMm: 1, widthMm: 1, thicknessMm: 1 };
  const fit = slabs.length === 1 ? tableFit(slabs[0]!, smallest) : gluedTableFit(slabs, smallest);
  return {
    usableLengthMm: Math.max(0, Math.floor(fit.spareLengthMm + 1)),
    usableWidthMm: Math.max(0, Math.floor(fit.spareWidthMm + 1)),
    usableThicknessMm: Math.max(0, Math.floor(fit.spareThicknessMm + 1)),
  };
}

/** The top a fit search asks for, or null when the query has no fit part. */
export function wantedTop(
  input: CatalogueQueryParsed,
): { lengthMm: number; widthMm: number; thicknessMm: number; seats: number | null } | null {
  if (input.seats === undefined && input.fitLength === undefined && input.fitWidth === undefined && input.fitThickness === undefined)
    return null;
  const lengthMm = input.seats !== undefined ? topLengthForSeats(input.seats) : (input.fitLength ?? 200);
  return {
    lengthMm,
    widthMm: input.fitWidth ?? (input.seats !== undefined ? DEFAULT_DINING_WIDTH_MM : 100),
    thicknessMm: input.fitThickness ?? DEFAULT_TOP_THICKNESS_MM,
    seats: input.seats ?? null,
  };
}

/** Each sort's direction, and how its page token carries the last row's sort value. */
interface SortSpec {
  direction: "ASC" | "DESC";
  value: (entry: CatalogueRow, distance: number | null) => string | number;
  decode: (value: string | number) => unknown;
}

const SORTS: Record<CatalogueQueryParsed["sort"], SortSpec> = {
  newest: { direction: "DESC", value: (e) => e.publishedAt.toISOString(), decode: (v) => new Date(String(v)) },
  price_low: { direction: "ASC", value: (e) => e.priceMinor, decode: Number },
  price_high: { direction: "DESC", value: (e) => e.priceMinor, decode: Number },
  price_per_board_foot: { direction: "ASC", value: (e) => e.pricePerBoardFootMinor, decode: Number },
  largest: { direction: "DESC", value: (e) => e.boardFeet, decode: Number },
  nearest: { direction: "ASC", value: (_e, d) => d ?? 0, decode: Number },
};

/** Counts above this read "1000+": counting stops there, so a broad search costs no full scan. */
const COUNT_CAP = 1000;

/**
 * Short-lived answers for repeated searches (a popular filter set is asked again and again):
 * counts for 30 s, pages for 5 s. Any change to the catalogue clears both in this instance at
 * once and in every other instance within about half a second (jobs/shared-invalidation.ts).
 */
const COUNT_TTL_MS = 30_000;
const PAGE_TTL_MS = 5_000;

/** A search answer ready to send: the JSON as bytes, its entity tag, and (once asked for) its gzip form. */
export interface CatalogueAnswer {
  body: Buffer;
  etag: string;
  gzipped?: Buffer;
}

/** The answer compressed with gzip, made once per cached answer (a phone on a weak signal gets a fifth of the bytes). */
export function gzippedAnswer(answer: CatalogueAnswer): Buffer {
  answer.gzipped ??= gzipSync(answer.body);
  return answer.gzipped;
}

export function createCatalogueService(deps: { dataSource: DataSource; cursorSecret: string; cache?: boolean; reads?: ReplicaReads }) {
  const { dataSource } = deps;
  const caching = deps.cache ?? true;
  /** The search and visitors' slab pages read from the replica when one is configured (db/read-replica.ts). */
  const reads = deps.reads ?? createReplicaReads(dataSource);
  /** Runs one piece of the search's SQL (on the replica, when there is one). */
  const run = <T = Record<string, unknown>>(fragment: Fragment) => reads.query<T>(fragment.sql, fragment.parameters);
  /** The same on the primary: a check that must see a change just committed. */
  const runOnPrimary = <T = Record<string, unknown>>(fragment: Fragment) =>
    dataSource.query(fragment.sql, fragment.parameters) as Promise<T[]>;
  const counts = new LRUCache<string, { total: number; capped: boolean }>({ max: 2000, ttl: COUNT_TTL_MS });
  // Pages are kept as the bytes that go out with their entity tag, so a repeated search costs
  // neither serialising, encoding nor hashing. They are found by the query string exactly as the
  // browser sent it (so a repeat skips validation too: the same text always parses the same way).
  const pages = new LRUCache<string, CatalogueAnswer>({ max: 500, ttl: PAGE_TTL_MS });
  /** Live slabs per species for the browse filter: one grouped query, kept like the counts and cleared with them. */
  let speciesCounts: { loadedAt: number; value: Promise<SpeciesCounts> } | null = null;
  const forgetCached = () => {
    counts.clear();
    pages.clear();
    positions = null;
    speciesCounts = null;
  };

  const sign = (payload: string) => createHmac("sha256", deps.cursorSecret).update(payload).digest("base64url").slice(0, 22);

  /** An opaque page token: the last row's sort value and id, signed so it cannot be forged. */
  function encodeCursor(sort: string, value: string | number, id: string): string {
    const payload = Buffer.from(JSON.stringify([sort, value, id])).toString("base64url");
    return `${payload}.${sign(payload)}`;
  }
  function decodeCursor(sort: string, cursor: string): { value: string | number; id: string } {
    const bad = () =>
      new Invalid("That page link is not valid any more. Start the search again.", { cursor: "Invalid page token." }, "bad_cursor");
    const [payload, signature] = cursor.split(".");
    if (!payload || !signature) throw bad();
    const expected = Buffer.from(sign(payload));
    const given = Buffer.from(signature);
    if (expected.length !== given.length || !timingSafeEqual(expected, given)) throw bad();
    try {
      const [cursorSort, value, id] = JSON.parse(Buffer.from(payload, "base64url").toString("utf8")) as [string, string | number, string];
      if (cursorSort !== sort || typeof id !== "string") throw bad();
      return { value, id };
    } catch {
      throw bad();
    }
  }

  /**
   * Where each yard with live listings collects from (a sawyer's pickup position; every listing
   * of a yard shares it), read again after 30 s or any change to the catalogue in any instance.
   * Kept with the answer cache off too: it is the search's map of yards, not an answer.
   */
  let positions: { loadedAt: number; yards: Promise<YardPosition[]> } | null = null;
  function yardPositions(): Promise<YardPosition[]> {
    if (!positions || Date.now() - positions.loadedAt > COUNT_TTL_MS) {
      const yards = reads
        .query<{ id: string; pickup_latitude: number; pickup_longitude: number }>(
          // The distinct yards come from idx_catalogue_yard by a loose index scan.
          "SELECT a.id, a.pickup_latitude, a.pickup_longitude FROM (SELECT DISTINCT sawyer_id FROM catalogue_entry) AS yard " +
            "JOIN account a ON a.id = yard.sawyer_id WHERE a.pickup_latitude IS NOT NULL AND a.pickup_longitude IS NOT NULL",
        )
        .then((rows) =>
          rows.map((row) => ({ sawyerId: row.id, latitude: Number(row.pickup_latitude), longitude: Number(row.pickup_longitude) })),
        );
      positions = { loadedAt: Date.now(), yards };
      yards.catch(() => (positions = null)); // a failed read is tried again by the next search
    }
    return positions.yards;
  }
  /** The yards by great-circle distance from a town (slab-math), nearest first, and each yard's distance; kept per town while the positions last. */
  interface TownDistances {
    from: Promise<YardPosition[]>;
    yards: YardDistance[];
    distanceOf: Map<string, number>;
  }
  const distancesByTown = new LRUCache<string, TownDistances>({ max: 300 });
  async function yardsByDistance(near: Place): Promise<TownDistances> {
    const current = yardPositions();
    const kept = distancesByTown.get(near.id);
    if (kept && kept.from === current) return kept;
    const yards = (await current)
      .map((yard) => ({ sawyerId: yard.sawyerId, distanceKm: greatCircleKm(near, yard) }))
      .sort((a, b) => a.distanceKm - b.distanceKm || (a.sawyerId < b.sawyerId ? -1 : 1));
    const distances = { from: current, yards, distanceOf: new Map(yards.map((yard) => [yard.sawyerId, yard.distanceKm])) };
    distancesByTown.set(near.id, distances);
    return distances;
  }

  /** One batch of the nearest-first walk, through `idx_catalogue_yard`. */
  const nearestBatch = (filters: Fragment) => async (yards: readonly string[], tie: { yards: readonly string[]; afterId: string } | null) =>
    (await run<{ listing_id: string; sawyer_id: string }>(nearestIdsSql(filters, yards, tie))).map((row) => ({
      listingId: row.listing_id,
      sawyerId: row.sawyer_id,
    }));

  /** A search result's card: the plain card, with the distance from the chosen town and the fit's spare margin. */
  function toCard(entry: CatalogueRow, distance: number | null, top: ReturnType<typeof wantedTop>): CatalogueCard {
    return {
      ...plainCatalogueCard(entry),
      distanceKm: distance === null ? null : Math.round(distance * 10) / 10,
      fit: top
        ? {
            spareLengthMm: entry.usableLengthMm - top.lengthMm,
            spareWidthMm: entry.usableWidthMm - top.widthMm,
            spareThicknessMm: entry.usableThicknessMm - top.thicknessMm,
          }
        : null,
    };
  }

  return {
    /**
     * How many live slabs each species has: one grouped query over the catalogue rows (a listing's
     * slabs are of its species), kept for 30 s and dropped with the other answers on any catalogue
     * change in any instance. With the answer cache off it always asks.
     */
    speciesCounts(): Promise<SpeciesCounts> {
      if (caching && speciesCounts && Date.now() - speciesCounts.loadedAt <= COUNT_TTL_MS) return speciesCounts.value;
      const value = reads
        .query<{ species_slug: string; live_slabs: string | number }>(
          "SELECT species_slug, SUM(slab_count) AS live_slabs FROM catalogue_entry GROUP BY species_slug ORDER BY species_slug",
        )
        .then((rows) => rows.map((row) => ({ slug: row.species_slug, liveSlabs: Number(row.live_slabs) })));
      if (caching) {
        const kept = { loadedAt: Date.now(), value };
        speciesCounts = kept;
        value.catch(() => {
          if (speciesCounts === kept) speciesCounts = null; // a failed read is tried again next time
        });
      }
      return value;
    },
    /** Drops the kept answers, counts and yard positions (a change here or in another instance). */
    forgetCached,
    /** Rebuilds (or removes) a listing's catalogue row; call inside the transaction that changed it. */
    async refreshEntry(manager: EntityManager, listingId: string): Promise<void> {
      forgetCached();
      const repository = manager.getRepository(CatalogueEntryEntity);
      const listing = await manager.getRepository(ListingEntity).findOneBy({ id: listingId });
      if (!listing || listing.status !== "live" || !listing.publishedAt) {
        await repository.delete({ listingId });
        return;
      }
      const links = await manager
        .getRepository(ListingSlabEntity)
        .find({ where: { listingId }, relations: { slab: true }, order: { position: "ASC" } });
      const slabs = links.map((l) => l.slab!).filter(Boolean);
      if (slabs.length === 0) {
        await repository.delete({ listingId });
        return;
      }
      const [sawyer, photo, ratings] = await Promise.all([
        manager.getRepository(AccountEntity).findOneBy({ id: listing.sawyerId }),
        manager.getRepository(ListingPhotoEntity).findOne({ where: { listingId }, order: { position: "ASC" } }),
        yardRatingTotals(manager, [listing.sawyerId]),
      ]);
      const rating = ratings.get(listing.sawyerId) ?? NO_REVIEWS;
      const moistures = slabs.map((s) => s.lastMoisturePct);
      const allRead = moistures.every((m) => m !== null);
      const edges = new Set(slabs.map((s) => s.liveEdge));
      await repository.save({
        listingId,
        sawyerId: listing.sawyerId,
        title: listing.title,
        speciesSlug: slabs[0]!.speciesSlug,
        setKind: listing.setKind,
        slabCount: slabs.length,
        // The catalogue filters in whole millimetres: each figure rounded down (a slab never claims more than it has).
        lengthMm: Math.floor(Math.min(...slabs.map((s) => s.lengthMm))),
        thicknessMm: Math.floor(Math.min(...slabs.map((s) => s.thicknessMm))),
        averageWidthMm: Math.round(Math.min(...slabs.map((s) => s.averageWidthMm))),
        minWidthMm: Math.floor(Math.min(...slabs.map((s) => s.minWidthMm))),
        ...usableTop(slabs),
        moisturePct: allRead ? Math.max(...(moistures as number[])) : null,
        ready:
          allRead && (moistures as number[]).every((m) => m >= KILN_DRIED_TARGET_BAND.minimumPct && m <= KILN_DRIED_TARGET_BAND.maximumPct),
        priceMinor: listing.priceMinor,
        // Price per board foot of the whole listing, half-up to the minor unit (for sorting and cards).
        pricePerBoardFootMinor: listing.boardFeet > 0 ? Math.round(listing.priceMinor / listing.boardFeet) : 0,
        currency: listing.currency,
        boardFeet: listing.boardFeet,
        volumeM3: listing.volumeM3,
        // The set's total and its heaviest slab, named apart and from the same slab-math call.
        ...cardWeights(slabs),
        // Both edges live only when every slab has both; any live edge at all counts as one.
        liveEdge: edges.size === 1 && edges.has("both") ? "both" : edges.has("both") || edges.has("one") ? "one" : "none",
        featureBits: slabs.map((s) => featureBits(s.features)).reduce((a, b) => a | b, 0),
        freight: listing.freight,
        pickup: listing.pickup,
        town: sawyer?.pickupTown ?? null,
        yardName: sawyer?.yardName ?? null,
        yardSlug: sawyer?.yardSlug ?? null,
        yardReviewCount: rating.count,
        yardRatingTotal: rating.ratingTotal,
        latitude: sawyer?.pickupLatitude ?? null,
        longitude: sawyer?.pickupLongitude ?? null,
        photoId: photo?.id ?? null,
        photoAlt: photo?.altText ?? null,
        publishedAt: listing.publishedAt,
      });
    },

    /** A yard's visible reviews changed: its rating on every one of its catalogue rows follows (inside the review's transaction). */
    async refreshYardRating(manager: EntityManager, sawyerId: string): Promise<void> {
      forgetCached();
      const rating = (await yardRatingTotals(manager, [sawyerId])).get(sawyerId) ?? NO_REVIEWS;
      await manager
        .getRepository(CatalogueEntryEntity)
        .update({ sawyerId }, { yardReviewCount: rating.count, yardRatingTotal: rating.ratingTotal });
    },

    /**
     * Checks a search before it runs: unknown species and towns, impossible tops and forged page
     * tokens are refused with 422. Returns what the search needs.
     */
    checkSearch(input: CatalogueQueryParsed) {
      if (input.species?.some((slug) => !findSpeciesBySlug(slug))) {
        const unknown = input.species.filter((slug) => !findSpeciesBySlug(slug));
        throw new Invalid(`Unknown species: ${unknown.join(", ")}.`, { species: "Choose species from the list." });
      }
      const near = input.near ? findPlace(input.near) : null;
      if (input.near && !near)
        throw new Invalid(`We could not find the town "${input.near}".`, { near: "Choose a town from the list." }, "unknown_place");
      const sort = SORTS[input.sort];
      const top = withFigureErrors(() => wantedTop(input));
      const cursor = input.cursor ? decodeCursor(input.sort, input.cursor) : null;
      const after = cursor && { value: sort.decode(cursor.value), id: cursor.id };
      return { near, top, sort, after };
    },

    /**
     * The SQL of a search: the filters, the capped count, and (for every sort but nearest-first,
     * which walks the yards in order) the page, one row more than asked to know whether another
     * follows. The benchmark runs these strings straight through mysql2.
     */
    async prepareSearch(input: CatalogueQueryParsed) {
      const checked = this.checkSearch(input);
      const { yards, distanceOf } = checked.near ? await yardsByDistance(checked.near) : { yards: null, distanceOf: null };
      // A radius keeps the yards within it (naming them only when it leaves some out); a radius or
      // nearest-first also needs the listing to have a position at all.
      const within = yards && input.radiusKm !== undefined ? yards.filter((yard) => yard.distanceKm <= input.radiusKm!) : yards;
      let limit: YardLimit = null;
      if (within && yards && within.length < yards.length) limit = within.map((yard) => yard.sawyerId);
      else if (within && (input.sort === "nearest" || input.radiusKm !== undefined)) limit = "placed";
      const filters = filterSql(input, checked.top, limit);
      const count = cappedCountSql(filters, COUNT_CAP);
      const page =
        input.sort === "nearest"
          ? null
          : pageSql(filters, { sort: input.sort, direction: checked.sort.direction, after: checked.after, rows: input.limit + 1 });
      return { ...checked, filters, count, page, distanceOf, within };
    },

    /** Whether a live listing matches a search's filters (sort and page aside); on the primary, as the listing has just gone live. */
    async matchesListing(input: CatalogueQueryParsed, listingId: string): Promise<boolean> {
      return (await runOnPrimary(matchesListingSql((await this.prepareSearch(input)).filters, listingId))).length > 0;
    },

    async search(input: CatalogueQueryParsed): Promise<CatalogueResult> {
      return JSON.parse((await this.searchAnswer(input)).body.toString("utf8")) as CatalogueResult;
    },

    /** The answer kept for this exact query string, if a search with it ran in the last few seconds. */
    cachedAnswer(queryString: string): CatalogueAnswer | undefined {
      return caching ? pages.get(`?${queryString}`) : undefined;
    },

    /**
     * The search's answer as the API sends it, and its entity tag (repeated searches come from the
     * cache). Give the query string it was parsed from so a repeat can be found by `cachedAnswer`.
     */
    async searchAnswer(input: CatalogueQueryParsed, queryString?: string): Promise<CatalogueAnswer> {
      const pageKey = queryString === undefined ? JSON.stringify(input) : `?${queryString}`;
      const cachedPage = caching ? pages.get(pageKey) : undefined;
      if (cachedPage !== undefined) return cachedPage;
      const plan = await this.prepareSearch(input);
      const { near, top, sort } = plan;
      const { cursor: _cursor, sort: _sort, limit: _limit, ...filters } = input;
      const countKey = JSON.stringify(filters);
      const countTotal = async () => {
        const cached = caching ? counts.get(countKey) : undefined;
        if (cached) return cached;
        const [row] = await run<{ total: string | number }>(plan.count);
        const found = Number(row?.total ?? 0);
        const value = { total: Math.min(found, COUNT_CAP), capped: found > COUNT_CAP };
        if (caching) counts.set(countKey, value);
        return value;
      };
      const pageRows = async (): Promise<CatalogueRow[]> => {
        if (plan.page) return (await run(plan.page)).map(catalogueRowFromSql);
        const ids = await nearestFirst(
          plan.within ?? [],
          plan.after as { value: number; id: string } | null,
          input.limit + 1,
          nearestBatch(plan.filters),
        );
        const fetched = ids.length ? (await run(rowsByIdSql(ids))).map(catalogueRowFromSql) : [];
        const byId = new Map(fetched.map((row) => [row.listingId, row]));
        return ids.flatMap((id) => byId.get(id) ?? []);
      };
      const [counted, fetchedRows] = await Promise.all([countTotal(), pageRows()]);
      const rows = fetchedRows.map((entity) => ({ entity, distance: near ? (plan.distanceOf?.get(entity.sawyerId) ?? null) : null }));
      const hasMore = rows.length > input.limit;
      const shown = rows.slice(0, input.limit);
      const last = shown.at(-1);
      const result: CatalogueResult = {
        results: shown.map((r) => toCard(r.entity, r.distance, top)),
        total: counted.total,
        totalIsAtLeast: counted.capped,
        nextCursor: hasMore && last ? encodeCursor(input.sort, sort.value(last.entity, last.distance), last.entity.listingId) : null,
        near: near ? { name: near.name, region: near.region, latitude: near.latitude, longitude: near.longitude } : null,
        fitTop: top,
      };
      const body = Buffer.from(JSON.stringify(result), "utf8");
      const answer = { body, etag: `W/"${createHash("sha1").update(body).digest("base64url")}"` };
      if (caching) pages.set(pageKey, answer);
      return answer;
    },

    /**
     * A slab page: live listings for everyone; a listing's own sawyer and admins see it at any stage.
     * Visitors read it from the replica (when there is one); signed-in people from the primary, so
     * a sawyer sees their own change at once.
     */
    async detail(actor: Actor, listingId: string): Promise<CatalogueDetail> {
      if (actor.kind === "account") return this.detailFrom(dataSource.manager, actor, listingId);
      return reads.run((manager) => this.detailFrom(manager, actor, listingId));
    },

    /** A slab page read through `db` (the replica's manager or the primary's). */
    async detailFrom(db: EntityManager, actor: Actor, listingId: string): Promise<CatalogueDetail> {
      const listing = await db.getRepository(ListingEntity).findOneBy({ id: listingId });
      const privileged = actor.kind === "account" && (actor.role === "admin" || actor.accountId === listing?.sawyerId);
      if (!listing || (!["live", "reserved", "sold"].includes(listing.status) && !privileged))
        throw new NotFound("That slab is not for sale here.");
      const links = await db
        .getRepository(ListingSlabEntity)
        .find({ where: { listingId }, relations: { slab: true }, order: { position: "ASC" } });
      const slabs = links.map((l) => l.slab!).filter(Boolean);
      const readings = slabs.length
        ? await db.getRepository(MoistureReadingEntity).find({ where: { slabId: In(slabs.map((s) => s.id)) }, order: { readOn: "ASC" } })
        : [];
      const logId = slabs[0]?.logId ?? null;
      const log = logId ? await db.getRepository(YardLogEntity).findOneBy({ id: logId }) : null;
      const siblings = logId ? await db.getRepository(SlabEntity).find({ where: { logId }, order: { sequenceInLog: "ASC" } }) : [];
      const siblingLinks = siblings.length
        ? await db.getRepository(ListingSlabEntity).find({ where: { slabId: In(siblings.map((s) => s.id)) }, relations: { listing: true } })
        : [];
      const [sawyer, photos, ratings] = await Promise.all([
        db.getRepository(AccountEntity).findOneBy({ id: listing.sawyerId }),
        db.getRepository(ListingPhotoEntity).find({ where: { listingId }, order: { position: "ASC" } }),
        yardRatingTotals(db, [listing.sawyerId]),
      ]);
      const inListing = new Set(slabs.map((s) => s.id));
      return {
        listing: {
          id: listing.id,
          title: listing.title,
          description: listing.description,
          setKind: listing.setKind,
          priceMode: listing.priceMode,
          rateMinor: listing.rateMinor,
          currency: listing.currency,
          pickup: listing.pickup,
          freight: listing.freight,
          status: listing.status,
          offersWelcome: listing.offersWelcome,
          figures: {
            boardFeet: listing.boardFeet,
            volumeM3: listing.volumeM3,
            weightKg: listing.weightKg,
            weightLowKg: listing.weightLowKg,
            weightHighKg: listing.weightHighKg,
            heavyLift: slabs.some((s) => s.weightHighKg > NIOSH_LOAD_CONSTANT_KG),
            priceMinor: listing.priceMinor,
          },
          photos: photos.map(photoView),
          publishedAt: listing.publishedAt?.toISOString() ?? null,
        },
        slabs: slabs.map((s) => ({
          ...toSlab(s, listing.id),
          readings: readings
            .filter((r) => r.slabId === s.id)
            .map((r) => ({ id: r.id, slabId: r.slabId, readOn: r.readOn, moistureContentPct: r.moistureContentPct, method: r.method })),
        })),
        log: log ? toLog(log, siblings.length) : null,
        logPhotos: log
          ? (await db.getRepository(LogPhotoEntity).find({ where: { logId: log.id }, order: { position: "ASC" } })).map(logPhotoView)
          : [],
        otherSlabsFromLog: siblings
          .filter((s) => !inListing.has(s.id))
          .map((s) => {
            const link = siblingLinks.find((l) => l.slabId === s.id && l.listing && l.listing.status !== "withdrawn");
            return {
              id: s.id,
              sequenceInLog: s.sequenceInLog,
              listingId: link && link.listing!.status === "live" ? link.listingId : null,
              status: link?.listing?.status ?? "in_yard",
            };
          }),
        yard: {
          id: listing.sawyerId,
          name: sawyer?.yardName ?? null,
          slug: sawyer?.yardSlug ?? null,
          town: sawyer?.pickupTown ?? null,
          latitude: sawyer?.pickupLatitude ?? null,
          longitude: sawyer?.pickupLongitude ?? null,
          rating: ratingSummary(ratings.get(listing.sawyerId) ?? NO_REVIEWS),
        },
      };
    },
  };
}

export type CatalogueService = ReturnType<typeof createCatalogueService>;
