import { randomUUID } from "node:crypto";
import { transitionFrom } from "@grainyard/contracts";
import { In, IsNull, type DataSource, type EntityManager } from "typeorm";
import { LedgerEntryEntity, OrderEntity, OrderRefundEntity } from "../entities/index.ts";
import type { OrderRefundKind } from "../entities/order-refund.ts";
import { Conflict, Invalid, ServiceUnavailable } from "../errors.ts";
import { PaymentsUnavailable, type PaymentsPort, type RefundMade } from "../integrations/payments.ts";
import { disputeRefundEntries, reversalEntries } from "./ledger.ts";

/**
 * Every refund goes through here, whichever path asks for it:
 * - a payment that arrived for an order that could no longer be honoured (the slab was sold to
 *   someone else after the hold ran out): the checkout service, inside the webhook's transaction;
 * - a cancellation before hand-over, and the sweep that retries the ones the provider could not
 *   take: the order service;
 * - an admin's dispute refund, all or part: the payout service.
 *
 * Each refund is recorded (an `order_refund` row keyed by the idempotency key the provider is
 * given), asked of the payments port, and then written to the ledger (the sale reversed, or the
 * dispute's share per account) with the order's status moved by the life-cycle's transitions.
 * The same key never refunds twice, at the provider or here.
 */
export function createRefundService(deps: {
  dataSource: DataSource;
  payments: PaymentsPort;
  log: { error(object: object, message: string): void };
  now?: () => Date;
}) {
  const { dataSource, payments } = deps;
  const now = deps.now ?? (() => new Date());

  /** The refund's row, once per idempotency key (a retry finds the one made before). */
  async function record(
    manager: EntityManager,
    row: { orderId: string; kind: OrderRefundKind; amountMinor: number; reason: string; createdBy: string | null; idempotencyKey: string },
  ): Promise<OrderRefundEntity> {
    await manager
      .createQueryBuilder()
      .insert()
      .into(OrderRefundEntity)
      .values({ id: randomUUID(), ...row, reason: row.reason.slice(0, 1000), providerRefundId: null, createdAt: now() })
      .orIgnore()
      .execute();
    return manager.getRepository(OrderRefundEntity).findOneByOrFail({ idempotencyKey: row.idempotencyKey });
  }

  async function answered(manager: EntityManager, refundRow: OrderRefundEntity, made: RefundMade) {
    await manager.getRepository(OrderRefundEntity).update({ id: refundRow.id }, { providerRefundId: made.refundId });
  }

  /**
   * A cancelled order's full refund is in: cancelled → refunded once, the sale reversed in the
   * ledger (if it got there). Whichever arrives second — the provider's answer or its
   * `payment_refunded` event — changes nothing but filling in the refund's id.
   */
  async function settleCancellation(manager: EntityManager, orderId: string, refundId: string | null, sourceId: string): Promise<boolean> {
    const updated = await manager
      .getRepository(OrderEntity)
      .update(
        { id: orderId, status: In(transitionFrom("recordCancellationRefund")) },
        { status: "refunded", refundedAt: now(), ...(refundId ? { refundId } : {}) },
      );
    if (updated.affected !== 1) {
      if (refundId) await manager.getRepository(OrderEntity).update({ id: orderId, status: "refunded", refundId: IsNull() }, { refundId });
      return false;
    }
    const order = await manager.getRepository(OrderEntity).findOneByOrFail({ id: orderId });
    // An order cancelled before its sale reached the ledger has nothing to reverse.
    const sold = await manager.getRepository(LedgerEntryEntity).countBy({ orderId, kind: "payment" });
    if (sold > 0) await manager.getRepository(LedgerEntryEntity).insert(reversalEntries(order, sourceId));
    return true;
  }

  return {
    /**
     * The buyer paid after the hold ran out and the slab was sold to someone else: the order
     * becomes refunded and the whole payment goes back. Runs inside the webhook's transaction (the
     * order locked): if the provider does not take the refund, the whole event rolls back and its
     * retry tries again. Nothing reaches the ledger: the sale was never recorded.
     */
    async refundLatePayment(manager: EntityManager, order: OrderEntity, paymentId: string | null): Promise<boolean> {
      const updated = await manager
        .getRepository(OrderEntity)
        .update(
          { id: order.id, status: In(transitionFrom("refundLatePayment")) },
          { status: "refunded", paymentIntentId: paymentId, refundedAt: now() },
        );
      if (updated.affected !== 1) return false;
      if (!paymentId) return true;
      const idempotencyKey = `late-${order.id}`;
      const row = await record(manager, {
        orderId: order.id,
        kind: "sold_elsewhere",
        amountMinor: order.totalMinor,
        reason: "Paid after the hold ran out, when the slab had been sold to someone else.",
        createdBy: null,
        idempotencyKey,
      });
      const made = await payments.refund({ paymentId, orderId: order.id, cause: "sold_elsewhere", idempotencyKey });
      await answered(manager, row, made);
      await manager.getRepository(OrderEntity).update({ id: order.id }, { refundId: made.refundId });
      return true;
    },

    /**
     * A cancelled order's full refund, idempotent on the order (a retry never refunds twice).
     * False when it could not be made now (the provider unreachable or refusing): the order stays
     * cancelled and the retry sweep asks again with the same key.
     */
    async refundCancelledOrder(order: OrderEntity): Promise<boolean> {
      if (!order.paymentIntentId) {
        deps.log.error({ orderId: order.id }, "cancelled order has no payment to refund");
        return false;
      }
      const paymentId = order.paymentIntentId;
      const idempotencyKey = `refund-${order.id}`;
      try {
        const row = await record(dataSource.manager, {
          orderId: order.id,
          kind: "cancellation",
          amountMinor: order.totalMinor,
          reason: order.cancelReason ?? "Cancelled before hand-over.",
          createdBy: order.cancelledBy === "sawyer" ? order.sawyerId : order.cancelledBy === "buyer" ? order.buyerId : null,
          idempotencyKey,
        });
        const made = await payments.refund({
          paymentId,
          orderId: order.id,
          cause: "cancellation",
          references: { cancelledBy: order.cancelledBy ?? "" },
          idempotencyKey,
        });
        await dataSource.transaction(async (manager) => {
          await answered(manager, row, made);
          await settleCancellation(manager, order.id, made.refundId, made.refundId);
        });
        return true;
      } catch (error) {
        deps.log.error({ err: error, orderId: order.id }, "refund not made yet; the sweep tries again");
        return false;
      }
    },

    /** The provider says a payment was refunded: for a cancelled order, that is its refund (if the API has not recorded it yet). */
    async settleFromProvider(manager: EntityManager, orderId: string, eventId: string): Promise<boolean> {
      return settleCancellation(manager, orderId, null, eventId);
    },

    /**
     * An admin's dispute refund of all or part of what the buyer paid. The amount is reserved
     * first (the order locked), so two admins at once cannot refund more than was paid; if the
     * provider does not take it, the reservation goes and nothing changed. Then, in one
     * transaction, the ledger's shares, the order refunded when nothing is left, and whatever the
     * caller records with it (the audit entry).
     */
    async refundDispute(
      order: OrderEntity,
      request: { amountMinor: number; reason: string; adminId: string },
      alongside: (
        manager: EntityManager,
        done: { refundedBefore: number; refundId: string; shares: Record<string, number> },
      ) => Promise<void>,
    ): Promise<{ refundedMinor: number; refundableMinor: number }> {
      const { amountMinor, reason, adminId } = request;
      const paymentId = order.paymentIntentId;
      if (!paymentId) throw new Conflict("This order has no payment to refund.", "order_not_refundable");
      const rowId = randomUUID();
      const idempotencyKey = `dispute-${rowId}`;
      const refundedBefore = await dataSource.transaction(async (manager) => {
        const locked = await manager.getRepository(OrderEntity).findOne({ where: { id: order.id }, lock: { mode: "pessimistic_write" } });
        const given = Number((await manager.getRepository(OrderRefundEntity).sum("amountMinor", { orderId: order.id })) ?? 0);
        const refundable = locked!.totalMinor - given;
        if (amountMinor > refundable)
          throw new Invalid(`At most ${(refundable / 100).toFixed(2)} ${locked!.currency} can still be refunded on this order.`, {
            amountMinor: "More than is left to refund.",
          });
        await manager.getRepository(OrderRefundEntity).insert({
          id: rowId,
          orderId: order.id,
          kind: "dispute",
          amountMinor,
          reason,
          idempotencyKey,
          providerRefundId: null,
          createdBy: adminId,
          createdAt: now(),
        });
        return given;
      });
      let made: RefundMade;
      try {
        made = await payments.refund({
          paymentId,
          orderId: order.id,
          cause: "dispute",
          amountMinor,
          references: { disputeRefundId: rowId },
          idempotencyKey,
        });
      } catch (error) {
        // Nothing was refunded: take the reservation back, so the amount can be refunded later.
        await dataSource.getRepository(OrderRefundEntity).delete({ id: rowId });
        if (error instanceof PaymentsUnavailable)
          throw new ServiceUnavailable(
            "The payment provider is not answering; nothing was refunded. Try again in a minute.",
            "payments_unavailable",
          );
        const message = (error instanceof Error ? error.message : String(error)).slice(0, 480);
        throw new Conflict(`The payment provider refused the refund: ${message}`, "refund_refused");
      }
      await dataSource.transaction(async (manager) => {
        await manager.getRepository(OrderRefundEntity).update({ id: rowId }, { providerRefundId: made.refundId });
        const { entries, shares } = disputeRefundEntries(order, amountMinor, made.refundId);
        await manager.getRepository(LedgerEntryEntity).insert(entries);
        if (refundedBefore + amountMinor === order.totalMinor)
          await manager
            .getRepository(OrderEntity)
            .update(
              { id: order.id, status: In(transitionFrom("refundInFull")) },
              { status: "refunded", refundedAt: now(), refundId: made.refundId },
            );
        await alongside(manager, { refundedBefore, refundId: made.refundId, shares });
      });
      return { refundedMinor: refundedBefore + amountMinor, refundableMinor: order.totalMinor - refundedBefore - amountMinor };
    },
  };
}

export type RefundService = ReturnType<typeof createRefundService>;
