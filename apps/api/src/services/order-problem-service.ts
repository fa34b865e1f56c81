import type { OrderProblemCase, ProblemResolution, orderProblemStatuses } from "@grainyard/contracts";
import { transitionFrom } from "@grainyard/contracts";
import { In, type DataSource, type EntityManager } from "typeorm";
import type { AppConfig } from "../config.ts";
import { AccountEntity, OrderEntity, OrderProblemEntity, OrderRefundEntity } from "../entities/index.ts";
import { Conflict, NotFound } from "../errors.ts";
import { problemSettledMail } from "../mail-templates-problems.ts";
import { requireRole, type Actor, type SignedInActor } from "./actor.ts";
import { recordAudit } from "./audit-log.ts";
import type { MailQueue } from "./mail-outbox.ts";
import { problemView } from "./order-service.ts";
import type { RefundService } from "./refund-service.ts";

/**
 * The desk's side of a problem a buyer reported after hand-over (the buyer's side is the order
 * service's `reportProblem`): the list of cases with the order and both parties, and settling one —
 * a refund of all or part through the refund service (a part leaves the rest of the sale to the
 * sawyer and completes the order; everything makes it refunded), or releasing the sale to the
 * sawyer (completed). Each is audited and mailed to both sides with the desk's note. A case is
 * claimed with a conditional update first, so two admins never settle it twice.
 */
export function createOrderProblemService(deps: {
  dataSource: DataSource;
  refunds: RefundService;
  mail: MailQueue;
  config: Pick<AppConfig, "publicUrl">;
  now?: () => Date;
}) {
  const { dataSource, config } = deps;
  const now = deps.now ?? (() => new Date());
  const problems = () => dataSource.getRepository(OrderProblemEntity);

  async function cases(rows: OrderProblemEntity[]): Promise<OrderProblemCase[]> {
    const orderIds = rows.map((r) => r.orderId);
    const orders = orderIds.length ? await dataSource.getRepository(OrderEntity).findBy({ id: In(orderIds) }) : [];
    const orderById = new Map(orders.map((o) => [o.id, o]));
    const accountIds = [...new Set(orders.flatMap((o) => [o.buyerId, o.sawyerId]))];
    const accounts = accountIds.length ? await dataSource.getRepository(AccountEntity).findBy({ id: In(accountIds) }) : [];
    const byId = new Map(accounts.map((a) => [a.id, a]));
    return rows.flatMap((row) => {
      const order = orderById.get(row.orderId);
      if (!order) return [];
      const buyer = byId.get(order.buyerId);
      const sawyer = byId.get(order.sawyerId);
      return [
        {
          ...problemView(row),
          orderId: order.id,
          title: order.title,
          orderStatus: order.status,
          currency: order.currency,
          totalMinor: order.totalMinor,
          handover: order.handover,
          handedOverAt: order.handedOverAt?.toISOString() ?? null,
          buyer: { id: order.buyerId, displayName: buyer?.displayName ?? "(gone)", email: buyer?.email ?? "" },
          sawyer: {
            id: order.sawyerId,
            displayName: sawyer?.displayName ?? "(gone)",
            yardName: sawyer?.yardName ?? null,
            email: sawyer?.email ?? "",
          },
        },
      ];
    });
  }

  async function mailBoth(manager: EntityManager, order: OrderEntity, outcome: { refundedMinor: number | null; note: string }) {
    const people = await manager.getRepository(AccountEntity).findBy({ id: In([order.buyerId, order.sawyerId]) });
    const link = `${config.publicUrl}/orders/${order.id}`;
    for (const person of people) {
      const side = person.id === order.buyerId ? "buyer" : "sawyer";
      await deps.mail.queue(manager, "order_problem_settled", problemSettledMail(person, side, order, outcome, link));
    }
  }

  /** The case's order, still waiting for the desk (anything else: 409). */
  async function waitingOrder(problem: OrderProblemEntity): Promise<OrderEntity> {
    const order = await dataSource.getRepository(OrderEntity).findOneByOrFail({ id: problem.orderId });
    if (!transitionFrom("settleProblem").includes(order.status))
      throw new Conflict("This order is no longer waiting for the desk.", "order_state");
    return order;
  }

  async function release(admin: SignedInActor, problem: OrderProblemEntity, note: string) {
    const order = await waitingOrder(problem);
    const at = now();
    await dataSource.transaction(async (manager) => {
      const claimed = await manager
        .getRepository(OrderProblemEntity)
        .update(
          { id: problem.id, status: "open" },
          { status: "released", resolvedBy: admin.accountId, resolutionNote: note, resolvedAt: at },
        );
      if (claimed.affected !== 1) throw new Conflict("Another admin settled this problem a moment ago.", "problem_resolved");
      const moved = await manager
        .getRepository(OrderEntity)
        .update(
          { id: order.id, status: In(transitionFrom("settleProblem")) },
          { status: "completed", completedAt: at, completedBy: "desk" },
        );
      if (moved.affected !== 1) throw new Conflict("This order is no longer waiting for the desk.", "order_state");
      await recordAudit(
        manager,
        admin,
        {
          action: "order.problem_release",
          targetKind: "order",
          targetId: order.id,
          before: { status: order.status, problem: "open" },
          after: { status: "completed", problem: "released" },
          reason: note,
        },
        at,
      );
      await mailBoth(manager, order, { refundedMinor: null, note });
    });
  }

  async function refund(admin: SignedInActor, problem: OrderProblemEntity, note: string, amountMinor: number | undefined) {
    const order = await waitingOrder(problem);
    if (!order.paymentIntentId) throw new Conflict("This order has no payment to refund.", "order_not_refundable");
    const given = Number((await dataSource.getRepository(OrderRefundEntity).sum("amountMinor", { orderId: order.id })) ?? 0);
    const amount = amountMinor ?? order.totalMinor - given;
    if (amount <= 0) throw new Conflict("Nothing is left to refund on this order.", "order_not_refundable");
    // Claim the case while the provider is asked; a failed refund gives it back.
    const claimed = await problems().update({ id: problem.id, status: "open" }, { status: "settling" });
    if (claimed.affected !== 1) throw new Conflict("Another admin is settling this problem now.", "problem_resolved");
    const at = now();
    try {
      await deps.refunds.refundDispute(order, { amountMinor: amount, reason: note, adminId: admin.accountId }, async (manager, done) => {
        const whole = done.refundedBefore + amount === order.totalMinor;
        // A part back: the rest of the sale is the sawyer's and the order completes (everything back: the refund service made it refunded).
        if (!whole)
          await manager
            .getRepository(OrderEntity)
            .update(
              { id: order.id, status: In(transitionFrom("settleProblem")) },
              { status: "completed", completedAt: at, completedBy: "desk" },
            );
        await manager
          .getRepository(OrderProblemEntity)
          .update(
            { id: problem.id },
            { status: "refunded", refundedMinor: amount, resolvedBy: admin.accountId, resolutionNote: note, resolvedAt: at },
          );
        await recordAudit(
          manager,
          admin,
          {
            action: "order.problem_refund",
            targetKind: "order",
            targetId: order.id,
            before: { status: order.status, problem: "open", refundedMinor: done.refundedBefore },
            after: {
              status: whole ? "refunded" : "completed",
              problem: "refunded",
              refundedMinor: done.refundedBefore + amount,
              refundId: done.refundId,
              shares: done.shares,
            },
            reason: note,
          },
          at,
        );
        await mailBoth(manager, order, { refundedMinor: amount, note });
      });
    } catch (error) {
      await problems().update({ id: problem.id, status: "settling" }, { status: "open" });
      throw error;
    }
  }

  return {
    /** The desk's cases: open ones oldest first (the default), or settled ones newest first. */
    async list(actor: Actor, status: (typeof orderProblemStatuses)[number] = "open"): Promise<OrderProblemCase[]> {
      requireRole(actor, "admin");
      const rows = await problems().find({
        where: { status: status === "open" ? In(["open", "settling"]) : status },
        order: { createdAt: status === "open" ? "ASC" : "DESC" },
        take: 200,
      });
      return cases(rows);
    },

    async resolve(actor: Actor, problemId: string, input: ProblemResolution): Promise<OrderProblemCase> {
      const admin = requireRole(actor, "admin");
      const problem = await problems().findOneBy({ id: problemId });
      if (!problem) throw new NotFound("No reported problem with that id.");
      if (problem.status !== "open") throw new Conflict("This problem is settled already (or being settled now).", "problem_resolved");
      if (input.resolution === "release") await release(admin, problem, input.note);
      else await refund(admin, problem, input.note, input.amountMinor);
      return (await cases([await problems().findOneByOrFail({ id: problemId })]))[0]!;
    },
  };
}

export type OrderProblemService = ReturnType<typeof createOrderProblemService>;
