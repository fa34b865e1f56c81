import { randomUUID } from "node:crypto";
import type { Log, LogInput, LogUpdate, MoistureReading, MoistureReadingInput, Slab, SlabInput, SlabUpdate } from "@grainyard/contracts";
import { logInputSchema, slabInputSchema } from "@grainyard/contracts";
import { findSpeciesBySlug } from "@grainyard/slab-math";
import { In, Not, type DataSource, type EntityManager } from "typeorm";
import { type ListingEntity, ListingSlabEntity, MoistureReadingEntity, SlabEntity, YardLogEntity } from "../entities/index.ts";
import { Conflict, Forbidden, Invalid, NotFound } from "../errors.ts";
import { requireRole, type Actor } from "./actor.ts";
import { computeSlabFigures, dryingStateOf, projectionView, slabFiguresView } from "./figures.ts";
import type { DomainEventBus } from "../events.ts";
import { countOf } from "@grainyard/contracts";

/** Listing states in which a slab's measurements are locked (a reviewer or buyer relies on them). */
const LOCKING_STATUSES = ["in_review", "live", "reserved", "sold"] as const;
/** Listing states that hold a slab (it cannot be offered in a second listing). */
export const HOLDING_STATUSES = ["draft", "in_review", "sent_back", "live", "reserved", "sold"] as const;

function requireKnownSpecies(slug: string): void {
  if (!findSpeciesBySlug(slug)) throw new Invalid("Choose the species from the list.", { speciesSlug: "Unknown species." });
}

export function toLog(entity: YardLogEntity, slabCount: number): Log {
  return {
    id: entity.id,
    speciesSlug: entity.speciesSlug,
    siteTown: entity.siteTown,
    siteNeighbourhood: entity.siteNeighbourhood,
    siteKind: entity.siteKind,
    fellingReason: entity.fellingReason,
    felledOn: entity.felledOn,
    milledOn: entity.milledOn,
    lengthMm: entity.lengthMm,
    diameterMm: entity.diameterMm,
    notes: entity.notes,
    slabCount,
    createdAt: entity.createdAt.toISOString(),
  };
}

export function toSlab(entity: SlabEntity, listingId: string | null): Slab {
  return {
    id: entity.id,
    logId: entity.logId,
    sequenceInLog: entity.sequenceInLog,
    speciesSlug: entity.speciesSlug,
    // DECIMAL columns: a slab loaded through a relation (listing → slab) arrives as text despite the
    // column's transformer, so read them as numbers here, where every answer is made.
    lengthMm: Number(entity.lengthMm),
    thicknessMm: Number(entity.thicknessMm),
    widthStationsMm: entity.widthStationsMm,
    liveEdge: entity.liveEdge,
    surfacing: entity.surfacing,
    features: entity.features,
    defects: entity.defects,
    dryingMethod: entity.dryingMethod,
    kilnCompletedOn: entity.kilnCompletedOn,
    heatTreated: entity.heatTreated,
    heatTreatmentTemperatureC: entity.heatTreatmentTemperatureC,
    heatTreatmentMinutes: entity.heatTreatmentMinutes,
    notes: entity.notes,
    figures: slabFiguresView(entity),
    lastMoisturePct: entity.lastMoisturePct,
    lastReadOn: entity.lastReadOn,
    dryingState: dryingStateOf(entity.lastMoisturePct),
    listingId,
    createdAt: entity.createdAt.toISOString(),
  };
}

function toReading(entity: MoistureReadingEntity): MoistureReading {
  return {
    id: entity.id,
    slabId: entity.slabId,
    readOn: entity.readOn,
    moistureContentPct: entity.moistureContentPct,
    method: entity.method,
  };
}

export interface YardServiceDependencies {
  dataSource: DataSource;
  /** Called inside the transaction whenever a slab's figures change, so listings stay in step. */
  /** Where the service announces what changed (the catalogue and alerts listen). */
  events?: DomainEventBus;
}

export function createYardService(deps: YardServiceDependencies) {
  const { dataSource } = deps;

  async function ownLog(manager: EntityManager, sawyerId: string, logId: string): Promise<YardLogEntity> {
    const log = await manager.getRepository(YardLogEntity).findOneBy({ id: logId });
    if (!log) throw new NotFound("No log with that id in your yard.");
    if (log.sawyerId !== sawyerId) throw new Forbidden("That log belongs to another yard.");
    return log;
  }

  async function ownSlab(manager: EntityManager, sawyerId: string, slabId: string, lock = false): Promise<SlabEntity> {
    const slab = await manager
      .getRepository(SlabEntity)
      .findOne({ where: { id: slabId }, ...(lock ? { lock: { mode: "pessimistic_write" as const } } : {}) });
    if (!slab) throw new NotFound("No slab with that id in your yard.");
    if (slab.sawyerId !== sawyerId) throw new Forbidden("That slab belongs to another yard.");
    return slab;
  }

  /** The listing (not withdrawn) each slab is in, if any. */
  async function holdingListings(manager: EntityManager, slabIds: string[]): Promise<Map<string, ListingEntity>> {
    if (slabIds.length === 0) return new Map();
    const links = await manager.getRepository(ListingSlabEntity).find({ where: { slabId: In(slabIds) }, relations: { listing: true } });
    const map = new Map<string, ListingEntity>();
    for (const link of links) if (link.listing && link.listing.status !== "withdrawn") map.set(link.slabId, link.listing);
    return map;
  }

  async function checkLogPlacement(
    manager: EntityManager,
    sawyerId: string,
    slab: { logId: string | null; sequenceInLog: number | null },
    exceptSlabId?: string,
  ) {
    if (!slab.logId) return;
    await ownLog(manager, sawyerId, slab.logId);
    if (slab.sequenceInLog == null) return;
    const clash = await manager.getRepository(SlabEntity).findOneBy({
      logId: slab.logId,
      sequenceInLog: slab.sequenceInLog,
      ...(exceptSlabId ? { id: Not(exceptSlabId) } : {}),
    });
    if (clash)
      throw new Invalid(`Slab number ${slab.sequenceInLog} of this log is already recorded.`, {
        sequenceInLog: "That number is taken in this log.",
      });
  }

  /** Recomputes a slab's figures (after its measurements or readings change) and tells listings. */
  async function refreshFigures(manager: EntityManager, slab: SlabEntity): Promise<void> {
    Object.assign(slab, computeSlabFigures(slab));
    await manager.getRepository(SlabEntity).save(slab);
    await deps.events?.emitSerial("slabFiguresChanged", { manager, slabIds: [slab.id] });
  }

  async function refreshLastReading(manager: EntityManager, slab: SlabEntity): Promise<void> {
    const last = await manager
      .getRepository(MoistureReadingEntity)
      .findOne({ where: { slabId: slab.id }, order: { readOn: "DESC", createdAt: "DESC" } });
    slab.lastMoisturePct = last?.moistureContentPct ?? null;
    slab.lastReadOn = last?.readOn ?? null;
    await refreshFigures(manager, slab);
  }

  async function slabViews(manager: EntityManager, slabs: SlabEntity[]): Promise<Slab[]> {
    const holding = await holdingListings(
      manager,
      slabs.map((s) => s.id),
    );
    return slabs.map((s) => toSlab(s, holding.get(s.id)?.id ?? null));
  }

  return {
    async listLogs(actor: Actor): Promise<Log[]> {
      const sawyer = requireRole(actor, "sawyer");
      const logs = await dataSource
        .getRepository(YardLogEntity)
        .find({ where: { sawyerId: sawyer.accountId }, order: { createdAt: "DESC" } });
      const counts = await dataSource
        .getRepository(SlabEntity)
        .createQueryBuilder("slab")
        .select("slab.log_id", "logId")
        .addSelect("COUNT(*)", "count")
        .where("slab.sawyer_id = :sawyerId", { sawyerId: sawyer.accountId })
        .andWhere("slab.log_id IS NOT NULL")
        .groupBy("slab.log_id")
        .getRawMany<{ logId: string; count: string }>();
      const byLog = new Map(counts.map((c) => [c.logId, Number(c.count)]));
      return logs.map((log) => toLog(log, byLog.get(log.id) ?? 0));
    },

    async createLog(actor: Actor, input: LogInput): Promise<Log> {
      const sawyer = requireRole(actor, "sawyer");
      const parsed = logInputSchema.parse(input);
      requireKnownSpecies(parsed.speciesSlug);
      const repository = dataSource.getRepository(YardLogEntity);
      const id = randomUUID();
      await repository.insert({ id, sawyerId: sawyer.accountId, ...parsed });
      return toLog(await repository.findOneByOrFail({ id }), 0);
    },

    async getLog(actor: Actor, logId: string): Promise<{ log: Log; slabs: Slab[] }> {
      const sawyer = requireRole(actor, "sawyer");
      const log = await ownLog(dataSource.manager, sawyer.accountId, logId);
      const slabs = await dataSource
        .getRepository(SlabEntity)
        .find({ where: { logId }, order: { sequenceInLog: "ASC", createdAt: "ASC" } });
      return { log: toLog(log, slabs.length), slabs: await slabViews(dataSource.manager, slabs) };
    },

    async updateLog(actor: Actor, logId: string, input: LogUpdate): Promise<Log> {
      const sawyer = requireRole(actor, "sawyer");
      return dataSource.transaction(async (manager) => {
        const log = await ownLog(manager, sawyer.accountId, logId);
        const merged = logInputSchema.safeParse({ ...toLog(log, 0), ...input });
        if (!merged.success)
          throw new Invalid(
            "Some fields need another look.",
            Object.fromEntries(merged.error.issues.map((i) => [i.path.join("."), i.message])),
          );
        requireKnownSpecies(merged.data.speciesSlug);
        await manager.getRepository(YardLogEntity).update({ id: logId }, merged.data);
        const slabCount = await manager.getRepository(SlabEntity).countBy({ logId });
        return toLog(await manager.getRepository(YardLogEntity).findOneByOrFail({ id: logId }), slabCount);
      });
    },

    async deleteLog(actor: Actor, logId: string): Promise<void> {
      const sawyer = requireRole(actor, "sawyer");
      await dataSource.transaction(async (manager) => {
        await ownLog(manager, sawyer.accountId, logId);
        const slabCount = await manager.getRepository(SlabEntity).countBy({ logId });
        if (slabCount > 0)
          throw new Conflict(`This log still has ${countOf(slabCount, "slab", "slabs")}. Delete or move them first.`, "log_has_slabs");
        await manager.getRepository(YardLogEntity).delete({ id: logId });
      });
    },

    async listSlabs(actor: Actor): Promise<Slab[]> {
      const sawyer = requireRole(actor, "sawyer");
      const slabs = await dataSource
        .getRepository(SlabEntity)
        .find({ where: { sawyerId: sawyer.accountId }, order: { createdAt: "DESC" } });
      return slabViews(dataSource.manager, slabs);
    },

    async createSlab(actor: Actor, input: SlabInput, manager: EntityManager = dataSource.manager): Promise<Slab> {
      const sawyer = requireRole(actor, "sawyer");
      const parsed = slabInputSchema.parse(input);
      requireKnownSpecies(parsed.speciesSlug);
      const run = async (m: EntityManager) => {
        await checkLogPlacement(m, sawyer.accountId, parsed);
        const id = randomUUID();
        const figures = computeSlabFigures({ ...parsed, lastMoisturePct: null });
        await m
          .getRepository(SlabEntity)
          .insert({ id, sawyerId: sawyer.accountId, ...parsed, ...figures, lastMoisturePct: null, lastReadOn: null });
        return toSlab(await m.getRepository(SlabEntity).findOneByOrFail({ id }), null);
      };
      return manager.queryRunner?.isTransactionActive ? run(manager) : dataSource.transaction(run);
    },

    async getSlab(actor: Actor, slabId: string) {
      const sawyer = requireRole(actor, "sawyer");
      const slab = await ownSlab(dataSource.manager, sawyer.accountId, slabId);
      const readings = await dataSource
        .getRepository(MoistureReadingEntity)
        .find({ where: { slabId }, order: { readOn: "ASC", createdAt: "ASC" } });
      const [view] = await slabViews(dataSource.manager, [slab]);
      return { slab: view!, readings: readings.map(toReading), projection: projectionView(readings) };
    },

    async updateSlab(actor: Actor, slabId: string, input: SlabUpdate): Promise<Slab> {
      const sawyer = requireRole(actor, "sawyer");
      return dataSource.transaction(async (manager) => {
        const slab = await ownSlab(manager, sawyer.accountId, slabId, true);
        const holding = (await holdingListings(manager, [slabId])).get(slabId);
        if (holding && (LOCKING_STATUSES as readonly string[]).includes(holding.status)) {
          throw new Conflict(
            "This slab is in a listing that is under review or live. Withdraw the listing to change its measurements.",
            "slab_locked",
          );
        }
        const merged = slabInputSchema.safeParse({ ...toSlab(slab, null), ...input });
        if (!merged.success)
          throw new Invalid(
            "Some fields need another look.",
            Object.fromEntries(merged.error.issues.map((i) => [i.path.join("."), i.message])),
          );
        requireKnownSpecies(merged.data.speciesSlug);
        await checkLogPlacement(manager, sawyer.accountId, merged.data, slabId);
        Object.assign(slab, merged.data);
        await refreshFigures(manager, slab);
        return toSlab(slab, holding?.id ?? null);
      });
    },

    async deleteSlab(actor: Actor, slabId: string): Promise<void> {
      const sawyer = requireRole(actor, "sawyer");
      await dataSource.transaction(async (manager) => {
        await ownSlab(manager, sawyer.accountId, slabId, true);
        const holding = (await holdingListings(manager, [slabId])).get(slabId);
        if (holding) throw new Conflict("This slab is in a listing. Withdraw the listing or take the slab out of it first.", "slab_listed");
        await manager.getRepository(SlabEntity).delete({ id: slabId });
      });
    },

    async addReading(actor: Actor, slabId: string, input: MoistureReadingInput): Promise<MoistureReading> {
      const sawyer = requireRole(actor, "sawyer");
      return dataSource.transaction(async (manager) => {
        const slab = await ownSlab(manager, sawyer.accountId, slabId, true);
        const id = randomUUID();
        await manager.getRepository(MoistureReadingEntity).insert({ id, slabId, ...input });
        await refreshLastReading(manager, slab);
        return toReading(await manager.getRepository(MoistureReadingEntity).findOneByOrFail({ id }));
      });
    },

    /** One reading for every slab cut from a log (a sawyer often meters a whole stack at once). */
    async addReadingToLog(actor: Actor, logId: string, input: MoistureReadingInput): Promise<{ count: number }> {
      const sawyer = requireRole(actor, "sawyer");
      return dataSource.transaction(async (manager) => {
        await ownLog(manager, sawyer.accountId, logId);
        const slabs = await manager.getRepository(SlabEntity).find({ where: { logId }, lock: { mode: "pessimistic_write" } });
        if (slabs.length === 0) throw new Conflict("This log has no slabs yet.", "log_has_no_slabs");
        for (const slab of slabs) {
          await manager.getRepository(MoistureReadingEntity).insert({ id: randomUUID(), slabId: slab.id, ...input });
          await refreshLastReading(manager, slab);
        }
        return { count: slabs.length };
      });
    },

    async deleteReading(actor: Actor, readingId: string): Promise<void> {
      const sawyer = requireRole(actor, "sawyer");
      await dataSource.transaction(async (manager) => {
        const reading = await manager.getRepository(MoistureReadingEntity).findOneBy({ id: readingId });
        if (!reading) throw new NotFound("No reading with that id.");
        const slab = await ownSlab(manager, sawyer.accountId, reading.slabId, true);
        await manager.getRepository(MoistureReadingEntity).delete({ id: readingId });
        await refreshLastReading(manager, slab);
      });
    },

    ownSlab,
    holdingListings,
  };
}

export type YardService = ReturnType<typeof createYardService>;
