import { transitionFrom, type AdminUser, type AdminUserSearchInput, type RestoreInput, type SuspendInput } from "@grainyard/contracts";
import { Brackets, In, IsNull, type DataSource, type EntityManager } from "typeorm";
import type { AppConfig } from "../config.ts";
import { AccountEntity, ListingEntity, OrderEntity, SessionRecordEntity } from "../entities/index.ts";
import { Conflict, Forbidden, NotFound } from "../errors.ts";
import { accountRestoredMail, accountSuspendedMail } from "../mail-templates-operator.ts";
import { requireRole, type Actor, type SignedInActor } from "./actor.ts";
import { recordAudit } from "./audit-log.ts";
import { toAccount } from "./account-service.ts";
import type { DomainEventBus } from "../events.ts";
import type { MailQueue } from "./mail-outbox.ts";

export interface AccountModerationDependencies {
  dataSource: DataSource;
  /** E-mails go into the outbox inside the transaction that causes them. */
  mail: MailQueue;
  config: Pick<AppConfig, "publicUrl">;
  now?: () => Date;
  /** The catalogue's refresh, called inside the transaction for every listing whose state changed. */
  /** Where the service announces what changed (the catalogue and alerts listen). */
  events?: DomainEventBus;
}

/**
 * Suspension and the admin's view of users. A suspended account cannot sign in, its sessions are
 * revoked, its live listings are hidden ("suspended") and the slabs it had reserved as a buyer
 * are released. Restore brings back only the listings that were live.
 */
export function createAccountModeration(deps: AccountModerationDependencies) {
  const { dataSource } = deps;
  const now = deps.now ?? (() => new Date());
  const changed = (manager: EntityManager, listingId: string) =>
    deps.events?.emitSerial("listingChanged", { manager, listingId }) ?? Promise.resolve();

  async function counts(accountIds: string[]): Promise<Map<string, { listings: number; orders: number }>> {
    const result = new Map(accountIds.map((id) => [id, { listings: 0, orders: 0 }]));
    if (accountIds.length === 0) return result;
    const listings: { id: string; n: string }[] = await dataSource.query(
      "SELECT sawyer_id AS id, COUNT(*) AS n FROM listing WHERE sawyer_id IN (?) GROUP BY sawyer_id",
      [accountIds],
    );
    for (const row of listings) result.get(row.id)!.listings = Number(row.n);
    const buyers: { id: string; n: string }[] = await dataSource.query(
      "SELECT buyer_id AS id, COUNT(*) AS n FROM buyer_order WHERE buyer_id IN (?) GROUP BY buyer_id",
      [accountIds],
    );
    for (const row of buyers) result.get(row.id)!.orders += Number(row.n);
    const sawyers: { id: string; n: string }[] = await dataSource.query(
      "SELECT sawyer_id AS id, COUNT(*) AS n FROM buyer_order WHERE sawyer_id IN (?) GROUP BY sawyer_id",
      [accountIds],
    );
    for (const row of sawyers) result.get(row.id)!.orders += Number(row.n);
    return result;
  }

  function userView(entity: AccountEntity, count: { listings: number; orders: number }): AdminUser {
    return {
      account: toAccount(entity),
      suspended: entity.suspendedAt !== null,
      suspendedAt: entity.suspendedAt?.toISOString() ?? null,
      suspensionReason: entity.suspensionReason,
      listingsCount: count.listings,
      ordersCount: count.orders,
    };
  }

  async function oneUser(accountId: string): Promise<AdminUser> {
    const entity = await dataSource.getRepository(AccountEntity).findOneBy({ id: accountId });
    if (!entity) throw new NotFound("No account with that id.");
    return userView(entity, (await counts([entity.id])).get(entity.id)!);
  }

  /** The suspension itself, inside the caller's transaction (also used when resolving a report). */
  async function suspendWith(
    manager: EntityManager,
    admin: SignedInActor,
    accountId: string,
    reason: string,
    at: Date,
  ): Promise<AccountEntity> {
    const account = await manager.getRepository(AccountEntity).findOne({ where: { id: accountId }, lock: { mode: "pessimistic_write" } });
    if (!account) throw new NotFound("No account with that id.");
    if (account.role === "admin") throw new Forbidden("Admin accounts cannot be suspended from the desk.", "admin_not_suspendable");
    if (account.suspendedAt) throw new Conflict("That account is suspended already.", "already_suspended");
    await manager.getRepository(AccountEntity).update({ id: accountId }, { suspendedAt: at, suspensionReason: reason });
    const sessions = await manager.getRepository(SessionRecordEntity).update({ accountId, revokedAt: IsNull() }, { revokedAt: at });

    // Their live listings leave the catalogue (a conditional update each, so a sale in progress keeps its state).
    const live = await manager.getRepository(ListingEntity).find({ where: { sawyerId: accountId, status: "live" }, select: { id: true } });
    const hidden: string[] = [];
    for (const { id } of live) {
      const done = await manager.getRepository(ListingEntity).update({ id, status: "live" }, { status: "suspended" });
      if (done.affected === 1) {
        hidden.push(id);
        await changed(manager, id);
      }
    }

    // Slabs they reserved as a buyer go back on sale, as the reservation sweep does: the order
    // expires only if it is still waiting for payment, and the listing returns only if it is still reserved.
    const open = await manager
      .getRepository(OrderEntity)
      .find({ where: { buyerId: accountId, status: In(transitionFrom("expireReservation")) } });
    const released: string[] = [];
    for (const order of open) {
      const expired = await manager
        .getRepository(OrderEntity)
        .update({ id: order.id, status: In(transitionFrom("expireReservation")) }, { status: "expired" });
      if (expired.affected !== 1) continue;
      released.push(order.id);
      await manager.getRepository(ListingEntity).update({ id: order.listingId, status: "reserved" }, { status: "live" });
      await changed(manager, order.listingId);
    }
    await recordAudit(
      manager,
      admin,
      {
        action: "account.suspend",
        targetKind: "account",
        targetId: accountId,
        before: { suspended: false },
        after: { suspended: true, sessionsRevoked: sessions.affected ?? 0, listingsHidden: hidden, ordersExpired: released },
        reason,
      },
      at,
    );
    return account;
  }

  return {
    suspendWith,

    async suspend(actor: Actor, accountId: string, input: SuspendInput): Promise<AdminUser> {
      const admin = requireRole(actor, "admin");
      if (admin.accountId === accountId) throw new Forbidden("You cannot suspend your own account.");
      await dataSource.transaction(async (manager) => {
        const account = await suspendWith(manager, admin, accountId, input.reason, now());
        await deps.mail.queue(manager, "account_suspended", accountSuspendedMail(account.email, account.displayName, input.reason));
      });
      return oneUser(accountId);
    },

    async restore(actor: Actor, accountId: string, input: RestoreInput): Promise<AdminUser> {
      const admin = requireRole(actor, "admin");
      await dataSource.transaction(async (manager) => {
        const found = await manager.getRepository(AccountEntity).findOne({ where: { id: accountId }, lock: { mode: "pessimistic_write" } });
        if (!found) throw new NotFound("No account with that id.");
        if (!found.suspendedAt) throw new Conflict("That account is not suspended.", "not_suspended");
        const at = now();
        await manager.getRepository(AccountEntity).update({ id: accountId }, { suspendedAt: null, suspensionReason: null });
        // Only listings hidden by the suspension come back; taken-down, withdrawn or sold ones stay as they are.
        const hidden = await manager
          .getRepository(ListingEntity)
          .find({ where: { sawyerId: accountId, status: "suspended" }, select: { id: true } });
        for (const { id } of hidden) {
          await manager.getRepository(ListingEntity).update({ id, status: "suspended" }, { status: "live" });
          await changed(manager, id);
        }
        await recordAudit(
          manager,
          admin,
          {
            action: "account.restore",
            targetKind: "account",
            targetId: accountId,
            before: { suspended: true, reason: found.suspensionReason },
            after: { suspended: false, listingsReturned: hidden.map((l) => l.id) },
            reason: input.reason,
          },
          at,
        );
        await deps.mail.queue(
          manager,
          "account_restored",
          accountRestoredMail(found.email, found.displayName, `${deps.config.publicUrl}/sign-in`),
        );
      });
      return oneUser(accountId);
    },

    /** Admin search over users: e-mail, name or yard; role; suspended or not; with listing and order counts. */
    async searchUsers(actor: Actor, input: AdminUserSearchInput): Promise<AdminUser[]> {
      requireRole(actor, "admin");
      const query = dataSource.getRepository(AccountEntity).createQueryBuilder("account").orderBy("account.created_at", "DESC").limit(100);
      if (input.role) query.andWhere("account.role = :role", { role: input.role });
      if (input.suspended === "yes") query.andWhere("account.suspended_at IS NOT NULL");
      if (input.suspended === "no") query.andWhere("account.suspended_at IS NULL");
      if (input.query) {
        const like = `%${input.query.replace(/[\\%_]/g, (c) => `\\${c}`)}%`;
        query.andWhere(
          new Brackets((where) => {
            where
              .where("account.email LIKE :like", { like })
              .orWhere("account.display_name LIKE :like", { like })
              .orWhere("account.yard_name LIKE :like", { like });
          }),
        );
      }
      const accounts = await query.getMany();
      const countsById = await counts(accounts.map((a) => a.id));
      return accounts.map((a) => userView(a, countsById.get(a.id)!));
    },

    async getUser(actor: Actor, accountId: string): Promise<AdminUser> {
      requireRole(actor, "admin");
      return oneUser(accountId);
    },

    /** For the dashboard. */
    async suspendedCount(): Promise<number> {
      return dataSource.getRepository(AccountEntity).createQueryBuilder("a").where("a.suspended_at IS NOT NULL").getCount();
    },
  };
}

export type AccountModeration = ReturnType<typeof createAccountModeration>;
