import { createHash, randomUUID } from "node:crypto";
import type {
  DisputeRefund,
  DisputeRefundState,
  Payout,
  PayoutApproval,
  PayoutBatch,
  PayoutBatchResult,
  PayoutDue,
  PayoutLine,
  PayoutsDue,
  SawyerBalance,
  PendingSale,
  SawyerPayouts,
  PayoutAccountState,
} from "@grainyard/contracts";
import { disputeRefundSchema, isOrderStatusIn, payoutApprovalSchema, payoutBatchSchema, type OrderStatus } from "@grainyard/contracts";
import { stringify } from "csv-stringify/sync";
import { In, type DataSource, type EntityManager } from "typeorm";
import type { AppConfig } from "../config.ts";
import {
  AccountEntity,
  LedgerEntryEntity,
  OrderEntity,
  OrderRefundEntity,
  PayoutAccountEntity,
  PayoutEntity,
  PayoutLineEntity,
} from "../entities/index.ts";
import { AppError, Conflict, NotFound, ServiceUnavailable } from "../errors.ts";
import { PaymentsError, PaymentsUnavailable, type PaymentsPort, type PayoutAccountStatus } from "../integrations/payments.ts";
import { disputeRefundMail, payoutSentMail } from "../mail-templates.ts";
import { requireRole, type Actor, type SignedInActor } from "./actor.ts";
import { recordAudit } from "./audit-log.ts";
import type { RefundService } from "./refund-service.ts";
import type { MailQueue } from "./mail-outbox.ts";

const DAY_MS = 24 * 3600_000;

/** What Grainyard still owes a sawyer for one order: the ledger's sawyer entries for it (sale, refunds, payouts), and whether it can be paid now. */
interface OrderOwed {
  orderId: string;
  currency: string;
  owedMinor: number;
  released: boolean;
  listingTitle: string;
  handedOverAt: Date | null;
}

/** The statement's key: the lines and amounts exactly, so a stale or repeated approval is recognised. */
function dueKeyOf(sawyerId: string, currency: string, lines: { orderId: string; amountMinor: number }[]): string {
  const text = [sawyerId, currency, ...lines.map((l) => `${l.orderId}:${l.amountMinor}`).sort()].join("|");
  return createHash("sha256").update(text).digest("base64url");
}

const sawyerAccount = (sawyerId: string) => `sawyer:${sawyerId}`;

/** The provider's words for a failed call, short enough to show and store. */
function providerMessage(error: unknown): string {
  const message = error instanceof Error ? error.message : String(error);
  return message.slice(0, 480);
}

/**
 * Whether an order's money can be paid to the sawyer now: settled one way or the other (a refund
 * after an earlier payout is taken back at once), or handed over and past the hold.
 */
function releasedToSawyer(status: OrderStatus, handedOverAt: Date | null, holdMs: number, at: Date): boolean {
  if (isOrderStatusIn("settled", status)) return true;
  return isOrderStatusIn("handedOver", status) && handedOverAt !== null && handedOverAt.getTime() + holdMs <= at.getTime();
}

export function createPayoutService(deps: {
  dataSource: DataSource;
  payments: PaymentsPort;
  refunds: RefundService;
  /** E-mails go into the outbox inside the transaction that causes them. */
  mail: MailQueue;
  config: Pick<AppConfig, "publicUrl">;
  /** Hold days after hand-over (an admin setting). */
  holdDays: () => number;
  log: { error(object: object, message: string): void };
  now?: () => Date;
}) {
  const { dataSource, payments, config } = deps;
  const now = deps.now ?? (() => new Date());

  /** Per order: what is still owed to this sawyer (sales − refunds − payouts sent − payouts being sent). */
  async function owedByOrder(manager: EntityManager, sawyerId: string, at: Date): Promise<OrderOwed[]> {
    const rows = (await manager.query(
      `SELECT e.order_id AS orderId, e.currency AS currency, -SUM(e.amount_minor) AS owed,
              o.status AS status, o.handed_over_at AS handedOverAt, o.title AS title,
              (SELECT COALESCE(SUM(l.amount_minor), 0) FROM payout_line l JOIN payout p ON p.id = l.payout_id
                 WHERE l.order_id = e.order_id AND p.status = 'sending') AS inFlight
         FROM ledger_entry e JOIN buyer_order o ON o.id = e.order_id
        WHERE e.account = ? AND e.order_id IS NOT NULL
        GROUP BY e.order_id, e.currency, o.status, o.handed_over_at, o.title`,
      [sawyerAccount(sawyerId)],
    )) as {
      orderId: string;
      currency: string;
      owed: string | number;
      status: OrderStatus;
      handedOverAt: Date | null;
      title: string;
      inFlight: string | number;
    }[];
    const holdMs = deps.holdDays() * DAY_MS;
    return rows
      .map((row) => {
        const handedOverAt = row.handedOverAt ? new Date(row.handedOverAt) : null;
        const released = releasedToSawyer(row.status, handedOverAt, holdMs, at);
        return {
          orderId: row.orderId,
          currency: row.currency,
          owedMinor: Number(row.owed) - Number(row.inFlight),
          released,
          listingTitle: row.title,
          handedOverAt,
        };
      })
      .filter((row) => row.owedMinor !== 0);
  }

  function lineOf(row: OrderOwed): PayoutLine {
    return {
      orderId: row.orderId,
      listingTitle: row.listingTitle,
      handedOverAt: row.handedOverAt?.toISOString() ?? null,
      amountMinor: row.owedMinor,
    };
  }

  /** The payout that could be approved now per currency (only when the released total is above zero). */
  async function dueFor(
    manager: EntityManager,
    sawyerId: string,
    at: Date,
  ): Promise<{ currency: string; lines: PayoutLine[]; amountMinor: number; dueKey: string }[]> {
    const released = (await owedByOrder(manager, sawyerId, at)).filter((row) => row.released);
    const currencies = [...new Set(released.map((row) => row.currency))].sort();
    return currencies
      .map((currency) => {
        const lines = released
          .filter((row) => row.currency === currency)
          .map(lineOf)
          .sort((a, b) => (a.handedOverAt ?? "").localeCompare(b.handedOverAt ?? "") || a.orderId.localeCompare(b.orderId));
        const amountMinor = lines.reduce((sum, line) => sum + line.amountMinor, 0);
        return { currency, lines, amountMinor, dueKey: dueKeyOf(sawyerId, currency, lines) };
      })
      .filter((due) => due.amountMinor > 0);
  }

  function accountState(account: PayoutAccountEntity | null): PayoutAccountState {
    if (!account) return "none";
    return account.payoutsEnabled ? "ready" : "unfinished";
  }

  function blockedReason(state: PayoutAccountState): string | null {
    if (state === "none") return "Set up a payout account so Grainyard can send you money. Your listings stay on sale meanwhile.";
    if (state === "unfinished") return "Your payout account set-up is not finished yet. Finish it to receive money.";
    return null;
  }

  async function present(manager: EntityManager, payouts: PayoutEntity[]): Promise<Payout[]> {
    if (payouts.length === 0) return [];
    const ids = payouts.map((p) => p.id);
    const lines = await manager.getRepository(PayoutLineEntity).findBy({ payoutId: In(ids) });
    const orders = lines.length
      ? await manager
          .getRepository(OrderEntity)
          .find({ where: { id: In([...new Set(lines.map((l) => l.orderId))]) }, select: { id: true, title: true, handedOverAt: true } })
      : [];
    const people = await manager.getRepository(AccountEntity).find({
      where: { id: In([...new Set(payouts.flatMap((p) => [p.sawyerId, p.approvedBy].filter((v): v is string => !!v)))]) },
      select: { id: true, displayName: true, yardName: true, email: true },
    });
    const person = new Map(people.map((p) => [p.id, p]));
    const order = new Map(orders.map((o) => [o.id, o]));
    return payouts.map((p) => ({
      id: p.id,
      sawyerId: p.sawyerId,
      sawyerName: person.get(p.sawyerId)?.displayName ?? "",
      yardName: person.get(p.sawyerId)?.yardName ?? null,
      currency: p.currency,
      amountMinor: p.amountMinor,
      status: p.status,
      failureReason: p.failureReason,
      transferId: p.transferId,
      approvedBy: p.approvedBy ? (person.get(p.approvedBy)?.email ?? null) : null,
      createdAt: p.createdAt.toISOString(),
      sentAt: p.sentAt?.toISOString() ?? null,
      lines: lines
        .filter((l) => l.payoutId === p.id)
        .map((l) => ({
          orderId: l.orderId,
          listingTitle: order.get(l.orderId)?.title ?? "",
          handedOverAt: order.get(l.orderId)?.handedOverAt?.toISOString() ?? null,
          amountMinor: l.amountMinor,
        })),
    }));
  }

  /**
   * Sends one payout attempt's transfer and records the outcome. The idempotency key is the
   * payout id, so sending the same attempt again (a retry after a crash, a double click) reaches
   * the provider as one transfer.
   */
  async function send(payoutId: string): Promise<PayoutEntity> {
    const payout = await dataSource.getRepository(PayoutEntity).findOneByOrFail({ id: payoutId });
    if (payout.status !== "sending") return payout;
    const account = await dataSource.getRepository(PayoutAccountEntity).findOneBy({ sawyerId: payout.sawyerId });
    let transfer: { transferId: string } | null = null;
    let failure: string | null = null;
    if (!account) failure = "The sawyer has no payout account.";
    else {
      try {
        transfer = await payments.transfer({
          amountMinor: payout.amountMinor,
          currency: payout.currency,
          accountId: account.providerAccountId,
          payoutId: payout.id,
          sawyerId: payout.sawyerId,
          idempotencyKey: `payout-${payout.id}`,
        });
      } catch (error) {
        // A provider that cannot be reached leaves the attempt open: approving again retries it with the same key.
        if (error instanceof PaymentsUnavailable)
          throw new ServiceUnavailable(
            "The payment provider is not answering; the payout was not sent. Try again in a minute.",
            "payments_unavailable",
          );
        failure = providerMessage(error);
      }
    }
    const at = now();
    await dataSource.transaction(async (manager) => {
      if (transfer) {
        const updated = await manager
          .getRepository(PayoutEntity)
          .update({ id: payout.id, status: "sending" }, { status: "sent", transferId: transfer.transferId, sentAt: at });
        if (updated.affected !== 1) return;
        // One pair of entries per order: the sawyer's balance for it goes down, the money leaves the provider account.
        const lines = await manager.getRepository(PayoutLineEntity).findBy({ payoutId: payout.id });
        await manager.getRepository(LedgerEntryEntity).insert(
          lines.flatMap((line) => [
            {
              orderId: line.orderId,
              account: sawyerAccount(payout.sawyerId),
              amountMinor: line.amountMinor,
              currency: payout.currency,
              kind: "payout",
              providerEventId: transfer!.transferId,
            },
            {
              orderId: line.orderId,
              account: "provider_clearing",
              amountMinor: -line.amountMinor,
              currency: payout.currency,
              kind: "payout",
              providerEventId: transfer!.transferId,
            },
          ]),
        );
        const sawyer = await manager.getRepository(AccountEntity).findOneBy({ id: payout.sawyerId });
        const sent = await manager.getRepository(PayoutEntity).findOneByOrFail({ id: payout.id });
        if (sawyer)
          await deps.mail.queue(manager, "payout_sent", payoutSentMail(sawyer, sent, lines.length, `${config.publicUrl}/yard/payouts`));
      } else {
        // Nothing reaches the ledger: the sawyer's balance stays as it was, and the reason is kept to show.
        await manager
          .getRepository(PayoutEntity)
          .update({ id: payout.id, status: "sending" }, { status: "failed", failureReason: failure });
      }
    });
    return dataSource.getRepository(PayoutEntity).findOneByOrFail({ id: payout.id });
  }

  /** Creates (or finds) the attempt for an approval, inside one transaction with the sawyer's payout account locked. */
  async function openAttempt(admin: SignedInActor, approval: PayoutApproval, at: Date): Promise<{ payoutId: string; created: boolean }> {
    const adminId = admin.accountId;
    return dataSource.transaction(async (manager) => {
      const account = await manager
        .getRepository(PayoutAccountEntity)
        .findOne({ where: { sawyerId: approval.sawyerId }, lock: { mode: "pessimistic_write" } });
      const attempts = await manager.getRepository(PayoutEntity).find({ where: { dueKey: approval.dueKey }, order: { attempt: "DESC" } });
      const open = attempts.find((p) => p.status !== "failed");
      // The same statement approved again: the money goes (or went) once.
      if (open) return { payoutId: open.id, created: false };
      if (!account) throw new Conflict("This sawyer has not set up a payout account yet.", "payout_account_missing");
      if (!account.payoutsEnabled)
        throw new Conflict("This sawyer's payout account is not finished yet, so it cannot receive money.", "payout_account_unfinished");
      const due = (await dueFor(manager, approval.sawyerId, at)).find((d) => d.currency === approval.currency.toUpperCase());
      if (!due || due.dueKey !== approval.dueKey)
        throw new Conflict(
          "This payout changed since the list was loaded (a sale or refund moved). Look at it again before approving.",
          "payout_changed",
        );
      const payoutId = randomUUID();
      await manager.getRepository(PayoutEntity).insert({
        id: payoutId,
        sawyerId: approval.sawyerId,
        currency: due.currency,
        amountMinor: due.amountMinor,
        status: "sending",
        dueKey: due.dueKey,
        attempt: (attempts[0]?.attempt ?? 0) + 1,
        transferId: null,
        failureReason: null,
        approvedBy: adminId,
        createdAt: at,
        sentAt: null,
      });
      await manager
        .getRepository(PayoutLineEntity)
        .insert(due.lines.map((line) => ({ payoutId, orderId: line.orderId, amountMinor: line.amountMinor })));
      await recordAudit(
        manager,
        admin,
        {
          action: "payout.approve",
          targetKind: "account",
          targetId: approval.sawyerId,
          after: {
            payoutId,
            currency: due.currency,
            amountMinor: due.amountMinor,
            orders: due.lines.length,
            attempt: (attempts[0]?.attempt ?? 0) + 1,
          },
        },
        at,
      );
      return { payoutId, created: true };
    });
  }

  async function approveOne(actor: Actor, input: PayoutApproval): Promise<Payout> {
    const admin = requireRole(actor, "admin");
    const approval = payoutApprovalSchema.parse(input);
    const { payoutId } = await openAttempt(admin, approval, now());
    const payout = await send(payoutId);
    return (await present(dataSource.manager, [payout]))[0]!;
  }

  /** Owed per currency for a sawyer: pending, available, paid. */
  async function balancesOf(manager: EntityManager, sawyerId: string, at: Date): Promise<SawyerBalance[]> {
    const owed = await owedByOrder(manager, sawyerId, at);
    const paidRows = (await manager.query(
      "SELECT currency, SUM(amount_minor) AS paid FROM ledger_entry WHERE account = ? AND kind = 'payout' GROUP BY currency",
      [sawyerAccount(sawyerId)],
    )) as { currency: string; paid: string }[];
    const inFlight = (await manager.query(
      "SELECT currency, SUM(amount_minor) AS sending FROM payout WHERE sawyer_id = ? AND status = 'sending' GROUP BY currency",
      [sawyerId],
    )) as { currency: string; sending: string }[];
    const currencies = [
      ...new Set([...owed.map((o) => o.currency), ...paidRows.map((p) => p.currency), ...inFlight.map((p) => p.currency)]),
    ].sort();
    return currencies.map((currency) => ({
      currency,
      pendingMinor: owed.filter((o) => o.currency === currency && !o.released).reduce((sum, o) => sum + o.owedMinor, 0),
      availableMinor: owed.filter((o) => o.currency === currency && o.released).reduce((sum, o) => sum + o.owedMinor, 0),
      // Money on its way counts as paid for the sawyer's view (it left their available balance).
      paidMinor:
        Number(paidRows.find((p) => p.currency === currency)?.paid ?? 0) +
        Number(inFlight.find((p) => p.currency === currency)?.sending ?? 0),
    }));
  }

  /** The pending balance sale by sale, with the day each one's hold ends (soonest first; not handed over yet last). */
  async function pendingOf(manager: EntityManager, sawyerId: string, at: Date): Promise<PendingSale[]> {
    const holdMs = deps.holdDays() * DAY_MS;
    return (await owedByOrder(manager, sawyerId, at))
      .filter((row) => !row.released)
      .map((row) => ({
        orderId: row.orderId,
        listingTitle: row.listingTitle,
        currency: row.currency,
        amountMinor: row.owedMinor,
        availableFrom: row.handedOverAt ? new Date(row.handedOverAt.getTime() + holdMs).toISOString() : null,
      }))
      .sort((a, b) => (a.availableFrom ?? "~").localeCompare(b.availableFrom ?? "~") || a.orderId.localeCompare(b.orderId));
  }

  return {
    /** The sawyer's payouts page: account state, balances, past payouts. */
    async mine(actor: Actor): Promise<SawyerPayouts> {
      const sawyer = requireRole(actor, "sawyer");
      const manager = dataSource.manager;
      const account = await manager.getRepository(PayoutAccountEntity).findOneBy({ sawyerId: sawyer.accountId });
      const state = accountState(account);
      const payouts = await manager
        .getRepository(PayoutEntity)
        .find({ where: { sawyerId: sawyer.accountId }, order: { createdAt: "DESC" }, take: 100 });
      return {
        account: { state, updatedAt: account?.updatedAt.toISOString() ?? null },
        blockedReason: blockedReason(state),
        holdDays: deps.holdDays(),
        balances: await balancesOf(manager, sawyer.accountId, now()),
        pending: await pendingOf(manager, sawyer.accountId, now()),
        payouts: await present(manager, payouts),
      };
    },

    /** Starts (or continues) the provider's hosted set-up of the sawyer's payout account; answers its address. */
    async onboardingLink(actor: Actor): Promise<{ url: string }> {
      const sawyer = requireRole(actor, "sawyer");
      const me = await dataSource.getRepository(AccountEntity).findOneByOrFail({ id: sawyer.accountId });
      try {
        let account = await dataSource.getRepository(PayoutAccountEntity).findOneBy({ sawyerId: sawyer.accountId });
        if (!account) {
          const created = await payments.createPayoutAccount({
            sawyerId: me.id,
            email: me.email,
            businessName: me.yardName ?? me.displayName,
            idempotencyKey: `payout-account-${me.id}`,
          });
          await dataSource
            .createQueryBuilder()
            .insert()
            .into(PayoutAccountEntity)
            .values({ sawyerId: me.id, providerAccountId: created.accountId, payoutsEnabled: false, detailsSubmitted: false })
            .orIgnore()
            .execute();
          account = await dataSource.getRepository(PayoutAccountEntity).findOneByOrFail({ sawyerId: me.id });
        }
        return await payments.onboardingLink({
          accountId: account.providerAccountId,
          returnUrl: `${config.publicUrl}/yard/payouts?setup=returned`,
          refreshUrl: `${config.publicUrl}/yard/payouts?setup=again`,
        });
      } catch (error) {
        if (!(error instanceof PaymentsError)) throw error;
        deps.log.error({ err: error }, "payout account set-up failed");
        throw new ServiceUnavailable(
          "The payment provider is not answering, so payout set-up cannot start. Try again in a minute.",
          "payments_unavailable",
        );
      }
    },

    /** Asks the provider where the account stands (after the sawyer comes back from set-up); never trusts the redirect alone. */
    async refreshAccount(actor: Actor): Promise<SawyerPayouts> {
      const sawyer = requireRole(actor, "sawyer");
      const account = await dataSource.getRepository(PayoutAccountEntity).findOneBy({ sawyerId: sawyer.accountId });
      if (!account) throw new NotFound("There is no payout account to check yet. Start the set-up first.");
      let remote: PayoutAccountStatus;
      try {
        remote = await payments.payoutAccount(account.providerAccountId);
      } catch (error) {
        if (!(error instanceof PaymentsError)) throw error;
        throw new ServiceUnavailable("The payment provider is not answering; try again in a minute.", "payments_unavailable");
      }
      await this.recordAccount(remote);
      return this.mine(actor);
    },

    /** The provider's word on an account (from its `payout_account_updated` event or a fresh read). */
    async recordAccount(remote: PayoutAccountStatus, manager: EntityManager = dataSource.manager): Promise<boolean> {
      const updated = await manager
        .getRepository(PayoutAccountEntity)
        .update(
          { providerAccountId: remote.accountId },
          { payoutsEnabled: remote.payoutsEnabled, detailsSubmitted: remote.detailsSubmitted },
        );
      return (updated.affected ?? 0) > 0;
    },

    /** The sawyer's statement: every ledger movement of their balance, with a running total, as CSV. */
    async statementCsv(actor: Actor): Promise<string> {
      const sawyer = requireRole(actor, "sawyer");
      const rows = (await dataSource.query(
        `SELECT e.created_at AS at, e.kind AS kind, e.order_id AS orderId, o.title AS title, e.currency AS currency, -e.amount_minor AS amount
           FROM ledger_entry e LEFT JOIN buyer_order o ON o.id = e.order_id
          WHERE e.account = ? ORDER BY e.created_at, e.id`,
        [sawyerAccount(sawyer.accountId)],
      )) as { at: Date; kind: string; orderId: string | null; title: string | null; currency: string; amount: string | number }[];
      const running = new Map<string, number>();
      const words: Record<string, string> = {
        payment: "sale",
        refund: "refund",
        dispute_refund: "refund (dispute)",
        payout: "paid out to you",
      };
      const lines = rows.map((row) => {
        const amount = Number(row.amount);
        const total = (running.get(row.currency) ?? 0) + amount;
        running.set(row.currency, total);
        return [
          new Date(row.at).toISOString(),
          words[row.kind] ?? row.kind,
          row.orderId ?? "",
          row.title ?? "",
          row.currency,
          (amount / 100).toFixed(2),
          (total / 100).toFixed(2),
        ];
      });
      return stringify(lines, { header: true, columns: ["date", "what", "order", "listing", "currency", "amount", "owed to you after"] });
    },

    /** Payouts an admin can approve now, oldest sales first. */
    async due(actor: Actor): Promise<PayoutsDue> {
      requireRole(actor, "admin");
      const at = now();
      const sawyerIds = (
        (await dataSource.query("SELECT DISTINCT SUBSTRING(account, 8) AS id FROM ledger_entry WHERE account LIKE 'sawyer:%'")) as {
          id: string;
        }[]
      ).map((r) => r.id);
      if (sawyerIds.length === 0) return { due: [], holdDays: deps.holdDays() };
      const people = await dataSource
        .getRepository(AccountEntity)
        .find({ where: { id: In(sawyerIds) }, select: { id: true, displayName: true, yardName: true } });
      const accounts = await dataSource.getRepository(PayoutAccountEntity).findBy({ sawyerId: In(sawyerIds) });
      const result: PayoutDue[] = [];
      for (const person of people) {
        const state = accountState(accounts.find((a) => a.sawyerId === person.id) ?? null);
        for (const due of await dueFor(dataSource.manager, person.id, at)) {
          const failed = await dataSource
            .getRepository(PayoutEntity)
            .findOne({ where: { dueKey: due.dueKey, status: "failed" }, order: { attempt: "DESC" } });
          result.push({
            sawyerId: person.id,
            sawyerName: person.displayName,
            yardName: person.yardName,
            currency: due.currency,
            amountMinor: due.amountMinor,
            dueKey: due.dueKey,
            accountState: state,
            blockedReason: state === "ready" ? null : blockedReason(state),
            lines: due.lines,
            lastFailure: failed?.failureReason ?? null,
          });
        }
      }
      result.sort(
        (a, b) =>
          (a.lines[0]?.handedOverAt ?? "").localeCompare(b.lines[0]?.handedOverAt ?? "") || a.sawyerName.localeCompare(b.sawyerName),
      );
      return { due: result, holdDays: deps.holdDays() };
    },

    approve: approveOne,

    /** Approves several payouts; each on its own (one failing does not stop the others). */
    async approveBatch(actor: Actor, input: PayoutBatch): Promise<PayoutBatchResult> {
      requireRole(actor, "admin");
      const { payouts } = payoutBatchSchema.parse(input);
      const results: PayoutBatchResult["results"] = [];
      for (const approval of payouts) {
        try {
          results.push({
            sawyerId: approval.sawyerId,
            currency: approval.currency,
            payout: await approveOne(actor, approval),
            error: null,
          });
        } catch (error) {
          if (!(error instanceof AppError)) throw error;
          results.push({ sawyerId: approval.sawyerId, currency: approval.currency, payout: null, error: error.message });
        }
      }
      return { results };
    },

    async list(actor: Actor, query: { status?: Payout["status"]; sawyerId?: string }): Promise<Payout[]> {
      requireRole(actor, "admin");
      const { status, sawyerId } = query;
      const payouts = await dataSource
        .getRepository(PayoutEntity)
        .find({ where: { ...(status ? { status } : {}), ...(sawyerId ? { sawyerId } : {}) }, order: { createdAt: "DESC" }, take: 200 });
      return present(dataSource.manager, payouts);
    },

    /** One payout with its statement: for the admin (`desk`), or for the sawyer it was paid to. */
    async one(actor: Actor, payoutId: string, side: "desk" | "yard"): Promise<Payout> {
      const signedIn = side === "desk" ? requireRole(actor, "admin") : requireRole(actor, "sawyer");
      const payout = await dataSource.getRepository(PayoutEntity).findOneBy({ id: payoutId });
      if (!payout || (signedIn.role === "sawyer" && payout.sawyerId !== signedIn.accountId)) throw new NotFound("No payout with that id.");
      return (await present(dataSource.manager, [payout]))[0]!;
    },

    /** An order's dispute refunds so far and what is left to refund (the admin's refund form starts from it). */
    async refundState(actor: Actor, orderId: string): Promise<DisputeRefundState> {
      requireRole(actor, "admin");
      const order = await dataSource.getRepository(OrderEntity).findOneBy({ id: orderId });
      if (!order) throw new NotFound("No order with that id.");
      const refunds = await dataSource
        .getRepository(OrderRefundEntity)
        .find({ where: { orderId, kind: "dispute" }, order: { createdAt: "ASC" } });
      const refundedMinor = refunds.reduce((sum, r) => sum + r.amountMinor, 0);
      const refundableMinor = Math.max(0, order.totalMinor - refundedMinor);
      return {
        orderId,
        currency: order.currency,
        totalMinor: order.totalMinor,
        refundedMinor,
        refundableMinor,
        canRefund:
          isOrderStatusIn("refundable", order.status) &&
          !isOrderStatusIn("withTheDesk", order.status) &&
          !!order.paymentIntentId &&
          refundableMinor > 0,
        refunds: refunds.map((r) => ({ amountMinor: r.amountMinor, reason: r.reason, createdAt: r.createdAt.toISOString() })),
      };
    },

    /**
     * An admin's refund on a disputed order: all or part of what the buyer paid, through the
     * refund service (the provider idempotent per request; the ledger split across tax, platform
     * fee, processing and the sawyer's share in proportion), with the reason mailed to both
     * parties and written in the audit log.
     */
    async disputeRefund(actor: Actor, orderId: string, input: DisputeRefund): Promise<{ refundedMinor: number; refundableMinor: number }> {
      const admin = requireRole(actor, "admin");
      const { amountMinor, reason } = disputeRefundSchema.parse(input);
      const order = await dataSource.getRepository(OrderEntity).findOneBy({ id: orderId });
      if (!order) throw new NotFound("No order with that id.");
      if (isOrderStatusIn("withTheDesk", order.status))
        throw new Conflict(
          "Its buyer reported a problem: settle it from the desk's problems list (refund or release).",
          "order_not_refundable",
        );
      if (!isOrderStatusIn("refundable", order.status) || !order.paymentIntentId) {
        throw new Conflict(
          "Only a paid order can be refunded for a dispute (cancelled and refunded orders are settled already).",
          "order_not_refundable",
        );
      }
      const at = now();
      const result = await deps.refunds.refundDispute(
        order,
        { amountMinor, reason, adminId: admin.accountId },
        async (manager, { refundedBefore, refundId, shares }) => {
          await recordAudit(
            manager,
            admin,
            {
              action: "order.dispute_refund",
              targetKind: "order",
              targetId: order.id,
              before: { refundedMinor: refundedBefore },
              after: { refundedMinor: refundedBefore + amountMinor, refundId, shares },
              reason,
            },
            at,
          );
          // Both sides hear of it, with the reason, in the refund's own transaction.
          const people = await manager.getRepository(AccountEntity).findBy({ id: In([order.buyerId, order.sawyerId]) });
          for (const person of people) {
            const side = person.id === order.buyerId ? "buyer" : "sawyer";
            const link = `${config.publicUrl}/orders/${order.id}`;
            await deps.mail.queue(manager, "dispute_refund", disputeRefundMail(person, side, order, amountMinor, reason, link));
          }
        },
      );
      return result;
    },
  };
}

export type PayoutService = ReturnType<typeof createPayoutService>;
