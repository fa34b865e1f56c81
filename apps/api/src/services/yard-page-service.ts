import { orderStatusSets, type DryingProjectionView, type YardPage } from "@grainyard/contracts";
import { median, ratingSummary } from "@grainyard/slab-math";
import { In, type DataSource, type EntityManager } from "typeorm";
import { createReplicaReads, type ReplicaReads } from "../db/read-replica.ts";
import { AccountEntity, CatalogueEntryEntity, MoistureReadingEntity, SlabEntity, YardLogEntity } from "../entities/index.ts";
import { NotFound } from "../errors.ts";
import { plainCatalogueCard } from "./catalogue-service.ts";
import { dryingStateOf, projectionView } from "./figures.ts";
import { NO_REVIEWS, yardRatingTotals } from "./yard-rating.ts";

const MINUTE_MS = 60_000;
/** The questions a first-reply time is taken from: the yard's latest threads. */
const FIRST_REPLY_THREADS = 200;

/**
 * A yard's public page: the same for everyone, built only from what a buyer may see — the
 * yard's name, story and town (never its street or its pickup position), its live listings, its
 * logs still drying, and figures from slab-math (rating, first-reply median, drying projection).
 */
export function createYardPageService(deps: { dataSource: DataSource; reads?: ReplicaReads }) {
  /** Read from the replica when one is configured (db/read-replica.ts): the page is the same for everyone. */
  const reads = deps.reads ?? createReplicaReads(deps.dataSource);

  /** Slabs handed over to buyers: a set sold as one order counts each of its slabs. */
  async function slabsSold(db: EntityManager, sawyerId: string): Promise<number> {
    const statuses = orderStatusSets.handedOver;
    const rows = (await db.query(
      `SELECT COUNT(*) AS n FROM buyer_order o JOIN listing_slab ls ON ls.listing_id = o.listing_id
        WHERE o.sawyer_id = ? AND o.status IN (${statuses.map(() => "?").join(", ")})`,
      [sawyerId, ...statuses],
    )) as { n: string | number }[];
    return Number(rows[0]?.n ?? 0);
  }

  /** For each of the latest threads: the buyer's first message, and the sawyer's first message after it. */
  async function firstReply(db: EntityManager, sawyerId: string): Promise<YardPage["yard"]["firstReply"]> {
    const rows = (await db.query(
      `SELECT q.asked_at,
              (SELECT MIN(r.created_at) FROM message r WHERE r.thread_id = q.thread_id AND r.author_id = ? AND r.created_at >= q.asked_at) AS replied_at
         FROM (SELECT m.thread_id, MIN(m.created_at) AS asked_at
                 FROM message_thread t JOIN message m ON m.thread_id = t.id AND m.author_id = t.buyer_id
                WHERE t.sawyer_id = ?
                GROUP BY m.thread_id
                ORDER BY asked_at DESC
                LIMIT ${FIRST_REPLY_THREADS}) q`,
      [sawyerId, sawyerId],
    )) as { asked_at: Date; replied_at: Date | null }[];
    const minutes = rows
      .filter((row) => row.replied_at !== null)
      .map((row) => (new Date(row.replied_at!).getTime() - new Date(row.asked_at).getTime()) / MINUTE_MS);
    const middle = median(minutes);
    return { medianMinutes: middle === null ? null : Math.round(middle), asked: rows.length, answered: minutes.length };
  }

  /** Logs none of whose slabs is listed (in any state but withdrawn) and some of whose slabs are still above the kiln-dried band. */
  async function dryingLogs(db: EntityManager, sawyerId: string): Promise<YardPage["dryingLogs"]> {
    const logs = await db.getRepository(YardLogEntity).find({ where: { sawyerId }, order: { felledOn: "DESC", id: "ASC" } });
    if (logs.length === 0) return [];
    const slabs = await db.getRepository(SlabEntity).find({ where: { logId: In(logs.map((l) => l.id)) } });
    const listed = new Set(
      (
        (await db.query(
          `SELECT DISTINCT ls.slab_id FROM listing_slab ls JOIN listing l ON l.id = ls.listing_id
            WHERE l.sawyer_id = ? AND l.status <> 'withdrawn'`,
          [sawyerId],
        )) as { slab_id: string }[]
      ).map((row) => row.slab_id),
    );
    const slabsByLog = new Map<string, SlabEntity[]>();
    for (const slab of slabs) if (slab.logId) slabsByLog.set(slab.logId, [...(slabsByLog.get(slab.logId) ?? []), slab]);
    const drying = logs.filter((log) => {
      const own = slabsByLog.get(log.id) ?? [];
      return own.length > 0 && own.every((s) => !listed.has(s.id)) && own.some((s) => dryingStateOf(s.lastMoisturePct) === "drying");
    });
    if (drying.length === 0) return [];
    const dryingSlabs = drying.flatMap((log) => slabsByLog.get(log.id)!.filter((s) => dryingStateOf(s.lastMoisturePct) === "drying"));
    const readings = await db.getRepository(MoistureReadingEntity).find({
      where: { slabId: In(dryingSlabs.map((s) => s.id)) },
      order: { readOn: "ASC" },
    });
    const readingsBySlab = new Map<string, MoistureReadingEntity[]>();
    for (const reading of readings) readingsBySlab.set(reading.slabId, [...(readingsBySlab.get(reading.slabId) ?? []), reading]);

    return drying.map((log) => {
      const own = slabsByLog.get(log.id)!;
      const stillDrying = own.filter((s) => dryingStateOf(s.lastMoisturePct) === "drying");
      const projections = stillDrying.map((s) => projectionView(readingsBySlab.get(s.id) ?? []));
      const wettest = stillDrying.reduce((a, b) => ((b.lastMoisturePct ?? 0) > (a.lastMoisturePct ?? 0) ? b : a));
      return {
        id: log.id,
        speciesSlug: log.speciesSlug,
        siteTown: log.siteTown,
        siteNeighbourhood: log.siteNeighbourhood,
        felledOn: log.felledOn,
        milledOn: log.milledOn,
        slabCount: own.length,
        thicknessMm: Math.max(...own.map((s) => s.thicknessMm)),
        lastMoisturePct: wettest.lastMoisturePct,
        lastReadOn: wettest.lastReadOn,
        projection: slowest(projections),
      };
    });
  }

  return {
    page(slug: string): Promise<YardPage> {
      return reads.run((db) => pageFrom(db, slug));
    },
  };

  async function pageFrom(db: EntityManager, slug: string): Promise<YardPage> {
    const yard = await db.getRepository(AccountEntity).findOneBy({ yardSlug: slug, role: "sawyer" });
    // A suspended yard has no page, as its listings are hidden.
    if (!yard || !yard.yardName || yard.suspendedAt) throw new NotFound("No yard at that address.");
    const [sold, reply, ratings, entries, logs] = await Promise.all([
      slabsSold(db, yard.id),
      firstReply(db, yard.id),
      yardRatingTotals(db, [yard.id]),
      db.getRepository(CatalogueEntryEntity).find({ where: { sawyerId: yard.id }, order: { publishedAt: "DESC", listingId: "ASC" } }),
      dryingLogs(db, yard.id),
    ]);
    return {
      yard: {
        id: yard.id,
        slug: yard.yardSlug!,
        name: yard.yardName,
        story: yard.yardStory,
        town: yard.pickupTown,
        memberSince: yard.createdAt.toISOString(),
        slabsSold: sold,
        firstReply: reply,
        rating: ratingSummary(ratings.get(yard.id) ?? NO_REVIEWS),
      },
      liveSlabs: entries.map(plainCatalogueCard),
      dryingLogs: logs,
    };
  }
}

export type YardPageService = ReturnType<typeof createYardPageService>;

/** A log is ready when its last slab is: the latest projected date; any slab that cannot be projected makes the log's projection its. */
function slowest(projections: DryingProjectionView[]): DryingProjectionView {
  const unprojected = projections.find((p) => p.status !== "projected");
  if (unprojected) return unprojected;
  return projections.reduce((a, b) => ((b.projectedDate ?? "") > (a.projectedDate ?? "") ? b : a));
}
