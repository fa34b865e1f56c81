import { createHmac, randomUUID, timingSafeEqual } from "node:crypto";
import type { CatalogueQueryParsed, SavedSearch, SavedSearchInput, SavedSearchUpdate } from "@grainyard/contracts";
import { buyerEndpoints, catalogueQuerySchema, fieldMessages, savedSearchIgnoredKeys, savedSearchInputSchema } from "@grainyard/contracts";
import { In, IsNull, type DataSource, type EntityManager } from "typeorm";
import type { AppConfig } from "../config.ts";
import { AccountEntity, CatalogueEntryEntity, SavedSearchEntity, SavedSearchMatchEntity } from "../entities/index.ts";
import { AppError, Conflict, Forbidden, Invalid, NotFound } from "../errors.ts";
import type { MailQueue } from "./mail-outbox.ts";
import { savedSearchAlertMail } from "../mail-templates.ts";
import { requireRole, type Actor } from "./actor.ts";
import type { CatalogueService } from "./catalogue-service.ts";

/** At most one alert e-mail per saved search in this window. */
const ALERT_INTERVAL_MS = 24 * 3600_000;
/** Enough for anyone; keeps the per-listing matching work bounded. */
const MAX_SAVED_SEARCHES = 50;

const QUERY_KEYS = Object.keys(catalogueQuerySchema.shape).filter((key) => !(savedSearchIgnoredKeys as readonly string[]).includes(key));
const prefixed = (fields: Record<string, string> | undefined) =>
  Object.fromEntries(Object.entries(fields ?? {}).map(([key, message]) => [`query.${key}`, message]));

/**
 * Reads a catalogue query string as the catalogue would, without its paging parts (cursor, sort,
 * limit) or keys the catalogue does not know; empty values are left out. Returns the parsed
 * query and the normalised text that is stored.
 */
function parseSavedQuery(text: string): { parsed: CatalogueQueryParsed; normalised: string } {
  const given = new URLSearchParams(text.trim().replace(/^\?/, ""));
  const raw: Record<string, string> = {};
  for (const [key, value] of given) if (QUERY_KEYS.includes(key) && value.trim() !== "") raw[key] = value;
  const result = catalogueQuerySchema.safeParse(raw);
  if (!result.success) throw new Invalid("That search has filters that need another look.", prefixed(fieldMessages(result.error)));
  const normalised = new URLSearchParams(
    QUERY_KEYS.filter((key) => key in raw).map((key): [string, string] => [key, raw[key]!]),
  ).toString();
  return { parsed: result.data, normalised };
}

const UNSUBSCRIBE_PURPOSE = "saved-search-unsubscribe";

function unsubscribeSignature(secret: string, savedSearchId: string): string {
  return createHmac("sha256", secret).update(`${UNSUBSCRIBE_PURPOSE}:${savedSearchId}`).digest("base64url");
}

/** The token of an alert e-mail's unsubscribe link: the saved search id, signed with the session secret. */
export function unsubscribeToken(secret: string, savedSearchId: string): string {
  return `${savedSearchId}.${unsubscribeSignature(secret, savedSearchId)}`;
}

/** The saved search id of a genuine token, or null when it was changed or is not one of ours. */
function savedSearchIdOfToken(secret: string, token: string): string | null {
  const dot = token.lastIndexOf(".");
  if (dot <= 0) return null;
  const id = token.slice(0, dot);
  const expected = Buffer.from(unsubscribeSignature(secret, id));
  const given = Buffer.from(token.slice(dot + 1));
  return expected.length === given.length && timingSafeEqual(expected, given) ? id : null;
}

export interface SavedSearchServiceDependencies {
  dataSource: DataSource;
  /** E-mails go into the outbox inside the transaction that causes them. */
  mail: MailQueue;
  catalogue: Pick<CatalogueService, "checkSearch" | "matchesListing">;
  config: Pick<AppConfig, "publicUrl" | "sessionSecret">;
  log: { error(object: object, message: string): void };
  now?: () => Date;
}

export function createSavedSearchService(deps: SavedSearchServiceDependencies) {
  const { dataSource, config, log } = deps;
  const now = deps.now ?? (() => new Date());
  const searches = () => dataSource.getRepository(SavedSearchEntity);

  async function pendingCounts(ids: string[]): Promise<Map<string, number>> {
    if (ids.length === 0) return new Map();
    const rows = (await dataSource
      .getRepository(SavedSearchMatchEntity)
      .createQueryBuilder("match")
      .select("match.saved_search_id", "id")
      .addSelect("COUNT(*)", "pending")
      .where("match.saved_search_id IN (:...ids)", { ids })
      .andWhere("match.alerted_at IS NULL")
      .groupBy("match.saved_search_id")
      .getRawMany()) as { id: string; pending: string | number }[];
    return new Map(rows.map((row) => [row.id, Number(row.pending)]));
  }

  function view(entity: SavedSearchEntity, pending: number): SavedSearch {
    return {
      id: entity.id,
      name: entity.name,
      query: entity.query,
      alerts: entity.alerts,
      lastAlertAt: entity.lastAlertAt?.toISOString() ?? null,
      pendingMatches: pending,
      createdAt: entity.createdAt.toISOString(),
    };
  }

  async function viewOne(entity: SavedSearchEntity): Promise<SavedSearch> {
    return view(entity, (await pendingCounts([entity.id])).get(entity.id) ?? 0);
  }

  /** Checks the query as the catalogue search would (species and towns too); field keys start with "query.". */
  function checkedQuery(text: string): { parsed: CatalogueQueryParsed; normalised: string } {
    const result = parseSavedQuery(text);
    try {
      deps.catalogue.checkSearch(result.parsed);
    } catch (error) {
      if (error instanceof Invalid) throw new Invalid(error.message, prefixed(error.fields), error.code);
      throw error;
    }
    return result;
  }

  async function ownSearch(manager: EntityManager, accountId: string, id: string, lock = false): Promise<SavedSearchEntity> {
    const found = await manager
      .getRepository(SavedSearchEntity)
      .findOne({ where: { id }, ...(lock ? { lock: { mode: "pessimistic_write" as const } } : {}) });
    if (!found) throw new NotFound("No saved search with that id.");
    if (found.accountId !== accountId) throw new Forbidden("That saved search belongs to someone else.");
    return found;
  }

  /** Turns alerts off and forgets matches still waiting to be mailed (they would be stale when alerts come back). */
  async function alertsOff(manager: EntityManager, id: string) {
    await manager.getRepository(SavedSearchEntity).update({ id }, { alerts: false });
    await manager.getRepository(SavedSearchMatchEntity).delete({ savedSearchId: id, alertedAt: IsNull() });
  }

  /** Does this saved query find this (live) listing? Runs the catalogue's own search restricted to it. */
  async function matches(search: SavedSearchEntity, listingId: string): Promise<boolean> {
    let parsed: CatalogueQueryParsed;
    try {
      parsed = parseSavedQuery(search.query).parsed;
      return await deps.catalogue.matchesListing(parsed, listingId);
    } catch (error) {
      // A stored query the catalogue no longer accepts (say, a town dropped from the places list) matches nothing.
      if (error instanceof AppError) return false;
      throw error;
    }
  }

  /**
   * Mails one saved search's pending matches if its daily alert is due. Inside one transaction
   * with the saved search locked, so two callers never both send; the e-mail is written into the
   * outbox in that transaction, so it exists exactly when the matches are marked alerted.
   */
  async function sendDueAlert(savedSearchId: string, at: Date): Promise<boolean> {
    return dataSource.transaction(async (manager) => {
      const search = await manager
        .getRepository(SavedSearchEntity)
        .findOne({ where: { id: savedSearchId }, lock: { mode: "pessimistic_write" } });
      if (!search || !search.alerts) return false;
      if (search.lastAlertAt && at.getTime() - search.lastAlertAt.getTime() < ALERT_INTERVAL_MS) return false;
      const pending = await manager
        .getRepository(SavedSearchMatchEntity)
        .find({ where: { savedSearchId, alertedAt: IsNull() }, order: { matchedAt: "ASC", id: "ASC" } });
      if (pending.length === 0) return false;
      const entries = await manager.getRepository(CatalogueEntryEntity).findBy({ listingId: In(pending.map((m) => m.listingId)) });
      const live = pending.flatMap((match) => entries.filter((entry) => entry.listingId === match.listingId));
      // Every pending match is settled now: mailed, or gone from the catalogue meanwhile.
      await manager.getRepository(SavedSearchMatchEntity).update({ savedSearchId, alertedAt: IsNull() }, { alertedAt: at });
      if (live.length === 0) return false;
      await manager.getRepository(SavedSearchEntity).update({ id: savedSearchId }, { lastAlertAt: at });
      const owner = await manager.getRepository(AccountEntity).findOneBy({ id: search.accountId });
      if (!owner) return false;
      await deps.mail.queue(
        manager,
        "saved_search_alert",
        savedSearchAlertMail(
          owner.email,
          owner.displayName,
          search.name,
          live.map((entry) => ({
            title: entry.title,
            priceMinor: entry.priceMinor,
            currency: entry.currency,
            town: entry.town,
            url: `${config.publicUrl}/slabs/${entry.listingId}`,
          })),
          `${config.publicUrl}/browse${search.query ? `?${search.query}` : ""}`,
          `${config.publicUrl}${buyerEndpoints.unsubscribeSavedSearch.path}?token=${encodeURIComponent(unsubscribeToken(config.sessionSecret, search.id))}`,
        ),
      );
      return true;
    });
  }

  /**
   * Sends every due alert: saved searches with alerts on, pending matches, and no alert in the
   * last 24 hours before `at`. Safe to call from a timer on every instance. Returns how many
   * e-mails went out.
   */
  async function processPendingAlerts(at: Date = now()): Promise<{ sent: number }> {
    const due = await searches()
      .createQueryBuilder("search")
      .select("search.id", "id")
      .where("search.alerts = 1")
      .andWhere("(search.last_alert_at IS NULL OR search.last_alert_at <= :cutoff)", { cutoff: new Date(at.getTime() - ALERT_INTERVAL_MS) })
      .andWhere(
        "EXISTS (SELECT 1 FROM saved_search_match pending WHERE pending.saved_search_id = search.id AND pending.alerted_at IS NULL)",
      )
      .getRawMany<{ id: string }>();
    let sent = 0;
    for (const { id } of due) {
      try {
        if (await sendDueAlert(id, at)) sent++;
      } catch (error) {
        log.error({ err: error, savedSearchId: id }, "could not send a saved-search alert");
      }
    }
    return { sent };
  }

  return {
    async list(actor: Actor): Promise<SavedSearch[]> {
      const buyer = requireRole(actor, "buyer");
      const found = await searches().find({ where: { accountId: buyer.accountId }, order: { createdAt: "DESC", id: "ASC" } });
      const pending = await pendingCounts(found.map((s) => s.id));
      return found.map((s) => view(s, pending.get(s.id) ?? 0));
    },

    async create(actor: Actor, input: SavedSearchInput): Promise<SavedSearch> {
      const buyer = requireRole(actor, "buyer");
      const fields = savedSearchInputSchema.parse(input);
      const { normalised } = checkedQuery(fields.query);
      const id = randomUUID();
      await dataSource.transaction(async (manager) => {
        // Lock the buyer's row so two parallel saves cannot both pass the limit.
        await manager.getRepository(AccountEntity).findOne({ where: { id: buyer.accountId }, lock: { mode: "pessimistic_write" } });
        if ((await manager.getRepository(SavedSearchEntity).countBy({ accountId: buyer.accountId })) >= MAX_SAVED_SEARCHES) {
          throw new Conflict(
            `You can keep up to ${MAX_SAVED_SEARCHES} saved searches. Delete one you no longer use.`,
            "too_many_saved_searches",
          );
        }
        await manager.getRepository(SavedSearchEntity).insert({
          id,
          accountId: buyer.accountId,
          name: fields.name,
          query: normalised,
          alerts: fields.alerts,
          lastAlertAt: null,
          createdAt: now(),
        });
      });
      return viewOne(await searches().findOneByOrFail({ id }));
    },

    async update(actor: Actor, id: string, input: SavedSearchUpdate): Promise<SavedSearch> {
      const buyer = requireRole(actor, "buyer");
      await dataSource.transaction(async (manager) => {
        const search = await ownSearch(manager, buyer.accountId, id, true);
        if (input.name !== undefined) await manager.getRepository(SavedSearchEntity).update({ id }, { name: input.name });
        if (input.alerts === false && search.alerts) await alertsOff(manager, id);
        if (input.alerts === true && !search.alerts) await manager.getRepository(SavedSearchEntity).update({ id }, { alerts: true });
      });
      return viewOne(await searches().findOneByOrFail({ id }));
    },

    async remove(actor: Actor, id: string): Promise<void> {
      const buyer = requireRole(actor, "buyer");
      await dataSource.transaction(async (manager) => {
        await ownSearch(manager, buyer.accountId, id, true);
        await manager.getRepository(SavedSearchEntity).delete({ id }); // matches go with it (cascade)
      });
    },

    /** The mailed unsubscribe link: no session needed, the signed token is the proof. */
    async unsubscribe(token: string): Promise<{ name: string }> {
      const id = savedSearchIdOfToken(config.sessionSecret, token);
      if (!id)
        throw new Invalid(
          "That unsubscribe link is not valid. Open the link from the e-mail exactly as it was sent.",
          { token: "Invalid link." },
          "link_invalid",
        );
      return dataSource.transaction(async (manager) => {
        const search = await manager.getRepository(SavedSearchEntity).findOne({ where: { id }, lock: { mode: "pessimistic_write" } });
        if (!search) throw new NotFound("That saved search was deleted, so no more alerts come from it.");
        if (search.alerts) await alertsOff(manager, id);
        return { name: search.name };
      });
    },

    /**
     * A listing just went live (called after the approval committed): records it against every
     * saved search with alerts that finds it, then sends whatever alerts are due. Never throws —
     * the approval has happened; a failure here is logged.
     */
    async onListingLive(listingId: string): Promise<void> {
      try {
        const at = now();
        const alerting = await searches().find({ where: { alerts: true } });
        const found: SavedSearchEntity[] = [];
        for (const search of alerting) if (await matches(search, listingId)) found.push(search);
        if (found.length > 0) {
          await dataSource
            .createQueryBuilder()
            .insert()
            .into(SavedSearchMatchEntity)
            .values(found.map((search) => ({ savedSearchId: search.id, listingId, matchedAt: at, alertedAt: null })))
            .orIgnore()
            .execute();
        }
        await processPendingAlerts(at);
      } catch (error) {
        log.error({ err: error, listingId }, "could not match saved searches to a new listing");
      }
    },
    processPendingAlerts,
  };
}

export type SavedSearchService = ReturnType<typeof createSavedSearchService>;
