import type { AuditEntry, AuditPage, AuditSearchInput } from "@grainyard/contracts";
import { auditSearchSchema } from "@grainyard/contracts";
import { stringify } from "csv-stringify/sync";
import type { DataSource, EntityManager } from "typeorm";
import { AccountEntity, AuditEntryEntity } from "../entities/index.ts";
import { requireRole, type Actor, type SignedInActor } from "./actor.ts";
import { auditNames } from "./audit-subjects.ts";

/** What one admin action records. Written with the action's own transaction manager. */
export interface AuditRecord {
  action: string;
  targetKind: string;
  targetId: string;
  before?: unknown;
  after?: unknown;
  reason?: string | null;
}

/**
 * Appends one entry to the audit log inside the caller's transaction: if the action rolls back, so
 * does its entry, and no action commits without one.
 */
export async function recordAudit(manager: EntityManager, actor: SignedInActor | "cli", record: AuditRecord, at: Date): Promise<void> {
  let actorId: string | null = null;
  let actorLabel = "command line";
  if (actor !== "cli") {
    actorId = actor.accountId;
    const account = await manager
      .getRepository(AccountEntity)
      .findOne({ where: { id: actor.accountId }, select: { id: true, email: true } });
    actorLabel = account?.email ?? actor.accountId;
  }
  await manager.getRepository(AuditEntryEntity).insert({
    actorId,
    actorLabel,
    action: record.action,
    targetKind: record.targetKind,
    targetId: record.targetId,
    before: (record.before ?? null) as never,
    after: (record.after ?? null) as never,
    reason: record.reason ?? null,
    createdAt: at,
  });
}

function view(entry: AuditEntryEntity, names?: Awaited<ReturnType<typeof auditNames>>): AuditEntry {
  return {
    id: String(entry.id),
    actorId: entry.actorId,
    actorLabel: entry.actorLabel,
    actorName: names?.actors.get(entry.id) ?? (entry.actorId ? entry.actorLabel : "The command line"),
    subject: names?.subjects.get(entry.id) ?? { name: null, owner: null, currency: null },
    action: entry.action,
    targetKind: entry.targetKind,
    targetId: entry.targetId,
    before: entry.before ?? null,
    after: entry.after ?? null,
    reason: entry.reason,
    createdAt: entry.createdAt.toISOString(),
  };
}

const DEFAULT_PAGE = 50;
const CSV_MAX_ROWS = 50_000;

export function createAuditService(deps: { dataSource: DataSource }) {
  const { dataSource } = deps;

  function query(input: ReturnType<typeof auditSearchSchema.parse>) {
    const q = dataSource.getRepository(AuditEntryEntity).createQueryBuilder("entry").orderBy("entry.id", "DESC");
    if (input.actor) {
      // An account id, or part of the admin's e-mail.
      if (/^[0-9a-f-]{36}$/i.test(input.actor)) q.andWhere("entry.actor_id = :actorId", { actorId: input.actor });
      else q.andWhere("entry.actor_label LIKE :actorLabel", { actorLabel: `%${input.actor.replace(/[\\%_]/g, (c) => `\\${c}`)}%` });
    }
    if (input.action) q.andWhere("entry.action = :action", { action: input.action });
    if (input.target) q.andWhere("entry.target_id = :target", { target: input.target });
    if (input.from) q.andWhere("entry.created_at >= :from", { from: `${input.from} 00:00:00.000` });
    if (input.to) q.andWhere("entry.created_at < DATE_ADD(:to, INTERVAL 1 DAY)", { to: input.to });
    return q;
  }

  return {
    /** Newest first; `cursor` is the id of the last entry of the previous page (keyset paging). */
    async search(actor: Actor, input: AuditSearchInput): Promise<AuditPage> {
      requireRole(actor, "admin");
      const parsed = auditSearchSchema.parse(input);
      const limit = parsed.limit ?? DEFAULT_PAGE;
      const q = query(parsed).take(limit + 1);
      if (parsed.cursor) q.andWhere("entry.id < :cursor", { cursor: parsed.cursor });
      const rows = await q.getMany();
      const page = rows.slice(0, limit);
      const names = await auditNames(dataSource, page);
      return { entries: page.map((entry) => view(entry, names)), nextCursor: rows.length > limit ? String(page.at(-1)!.id) : null };
    },

    /** The same filters as CSV (all pages, newest first), for a spreadsheet or an auditor. */
    async exportCsv(actor: Actor, input: AuditSearchInput): Promise<string> {
      requireRole(actor, "admin");
      const parsed = auditSearchSchema.parse(input);
      const rows = await query(parsed).take(CSV_MAX_ROWS).getMany();
      return stringify(
        rows.map((r) => {
          const v = view(r);
          return {
            ...v,
            before: v.before === null ? "" : JSON.stringify(v.before),
            after: v.after === null ? "" : JSON.stringify(v.after),
            reason: v.reason ?? "",
          };
        }),
        {
          header: true,
          columns: ["id", "createdAt", "actorId", "actorLabel", "action", "targetKind", "targetId", "reason", "before", "after"],
        },
      );
    },
  };
}

export type AuditService = ReturnType<typeof createAuditService>;
