import { randomUUID } from "node:crypto";
import { taxOn } from "@grainyard/slab-math";
import { In, LessThan, type DataSource, type EntityManager } from "typeorm";
import type { AppConfig } from "../config.ts";
import { AccountEntity, LedgerEntryEntity, ListingEntity, ListingSlabEntity, OrderEntity, PaymentEventEntity } from "../entities/index.ts";
import { Conflict, Forbidden, Invalid, NotFound, ServiceUnavailable } from "../errors.ts";
import { retryOnLockConflict } from "../db/lock-conflicts.ts";
import type { PaymentEvent, PayoutAccountStatus, PaymentsPort } from "../integrations/payments.ts";
import { orderPaidBuyerMail, orderPaidSawyerMail } from "../mail-templates.ts";
import { requireRole, type Actor } from "./actor.ts";
import { toSlab } from "./yard-service.ts";
import { saleEntries } from "./ledger.ts";
import { orderView, partiesOf } from "./order-service.ts";
import type { RefundService } from "./refund-service.ts";
import type { MailQueue } from "./mail-outbox.ts";
import {
  orderSlabSnapshotSchema,
  orderTransitions,
  transitionFrom,
  type CheckoutQuote,
  type Order,
  type OrderTransitionName,
} from "@grainyard/contracts";
import type { DomainEventBus } from "../events.ts";

/** A new order waits for the provider; a paid order moves on through hand-over (see contracts' order-lifecycle.ts). */
const OPEN_PAYMENT = "awaiting_payment" as const;

/**
 * Whether an INSERT … IGNORE added its row. On MariaDB, TypeORM adds RETURNING and answers the
 * returned rows (none when the row was a duplicate); other drivers answer a result header.
 */
function insertedARow(raw: unknown): boolean {
  if (Array.isArray(raw)) return raw.length > 0;
  return (raw as { affectedRows?: number }).affectedRows !== 0;
}

export interface CheckoutInput {
  handover: "pickup" | "freight";
  deliveryAddress?: string | null;
}

/**
 * Price, tax and total of a listing: tax at the configured rate on the price (slab-math's taxOn,
 * half-up once); the platform and processing fees were split by slab-math when the
 * listing was priced and are taken from the sawyer's share, not added for the buyer.
 */
function quoteFor(listing: Pick<ListingEntity, "priceMinor" | "currency">, checkout: Pick<AppConfig["checkout"], "taxRateBps">) {
  const taxMinor = taxOn(listing.priceMinor, checkout.taxRateBps);
  return {
    currency: listing.currency,
    priceMinor: listing.priceMinor,
    taxMinor,
    taxRateBps: checkout.taxRateBps,
    totalMinor: listing.priceMinor + taxMinor,
  };
}

export function createCheckoutService(deps: {
  dataSource: DataSource;
  payments: PaymentsPort;
  refunds: RefundService;
  /** E-mails go into the outbox inside the transaction that causes them. */
  mail: MailQueue;
  config: Pick<AppConfig, "publicUrl" | "checkout">;
  log: { error(object: object, message: string): void; info(object: object, message: string): void };
  now?: () => Date;
  /** Where the service announces what changed (the catalogue and alerts listen). */
  events?: DomainEventBus;
  /** A connected (payout) account changed at the provider; true when it is one of ours. */
  onAccountUpdated?: (account: PayoutAccountStatus, manager: EntityManager) => Promise<boolean>;
}) {
  const { dataSource, payments, config } = deps;
  const now = deps.now ?? (() => new Date());
  const changed = (manager: EntityManager, listingId: string) =>
    deps.events?.emitSerial("listingChanged", { manager, listingId }) ?? Promise.resolve();

  async function view(order: OrderEntity, actor: Actor): Promise<Order> {
    const parties = await partiesOf(dataSource, [order]);
    return orderView(order, actor, parties.get(order.id), config.checkout.autoCompleteDays);
  }

  /** Puts a reserved listing back on sale (only if this order still holds it). */
  async function release(
    manager: EntityManager,
    order: Pick<OrderEntity, "id" | "listingId">,
    transition: Extract<OrderTransitionName, "expireReservation" | "dropUnopenedCheckout">,
  ) {
    const updated = await manager
      .getRepository(OrderEntity)
      .update({ id: order.id, status: In(transitionFrom(transition)) }, { status: orderTransitions[transition].to });
    if (updated.affected !== 1) return false;
    await manager.getRepository(ListingEntity).update({ id: order.listingId, status: "reserved" }, { status: "live" });
    await changed(manager, order.listingId);
    return true;
  }

  /** "Paid" e-mails to both sides, written into the outbox in the payment's own transaction. */
  async function mailPaid(manager: EntityManager, order: OrderEntity) {
    const [buyer, sawyer] = await Promise.all([
      manager.getRepository(AccountEntity).findOneBy({ id: order.buyerId }),
      manager.getRepository(AccountEntity).findOneBy({ id: order.sawyerId }),
    ]);
    if (!buyer || !sawyer) return;
    const link = `${config.publicUrl}/orders/${order.id}`;
    await deps.mail.queue(manager, "order_paid", orderPaidBuyerMail(buyer, sawyer, order, link));
    await deps.mail.queue(manager, "order_paid", orderPaidSawyerMail(sawyer, buyer, order, link));
  }

  /**
   * Reserves the listing for this buyer (one winner: a conditional update on its status) and makes
   * the order awaiting payment, with the slabs' figures and the price snapshotted, inside the
   * caller's transaction. An accepted offer passes its agreed price and the fee split of that price.
   */
  async function placeOrder(
    manager: EntityManager,
    buyerId: string,
    listingId: string,
    input: CheckoutInput,
    agreed?: Pick<OrderEntity, "priceMinor" | "platformFeeMinor" | "processingFeeMinor" | "sawyerNetMinor">,
  ): Promise<OrderEntity> {
    if (input.handover === "freight" && !input.deliveryAddress?.trim())
      throw new Invalid("Give the delivery address for freight.", { deliveryAddress: "Where should the freight go?" });
    const listing = await manager.getRepository(ListingEntity).findOneBy({ id: listingId });
    if (!listing) throw new NotFound("That slab is not for sale here.");
    if (listing.sawyerId === buyerId) throw new Forbidden("You cannot buy your own listing.");
    if (input.handover === "pickup" && !listing.pickup)
      throw new Invalid("This listing is not offered for pickup.", { handover: "Choose freight." });
    if (input.handover === "freight" && !listing.freight)
      throw new Invalid("This listing is not offered for freight.", { handover: "Choose pickup." });
    const reserved = await manager.getRepository(ListingEntity).update({ id: listingId, status: "live" }, { status: "reserved" });
    if (reserved.affected !== 1) {
      // Read again, past this transaction's snapshot: another buyer may have won the race a moment ago.
      const current = await manager.getRepository(ListingEntity).findOne({ where: { id: listingId }, lock: { mode: "pessimistic_read" } });
      throw new Conflict(
        current?.status === "reserved"
          ? "Someone else has just reserved this slab. It comes back if they do not pay in time."
          : "This slab is no longer for sale.",
        "listing_not_available",
      );
    }
    const links = await manager
      .getRepository(ListingSlabEntity)
      .find({ where: { listingId }, relations: { slab: true }, order: { position: "ASC" } });
    const price = agreed ?? listing;
    const { taxMinor } = quoteFor({ priceMinor: price.priceMinor, currency: listing.currency }, config.checkout);
    const entity = manager.getRepository(OrderEntity).create({
      id: randomUUID(),
      buyerId,
      sawyerId: listing.sawyerId,
      listingId,
      status: OPEN_PAYMENT,
      title: listing.title,
      slabSnapshot: orderSlabSnapshotSchema.array().parse(links.map((l) => toSlab(l.slab!, listingId))),
      currency: listing.currency,
      priceMinor: price.priceMinor,
      platformFeeMinor: price.platformFeeMinor,
      processingFeeMinor: price.processingFeeMinor,
      sawyerNetMinor: price.sawyerNetMinor,
      taxMinor,
      totalMinor: price.priceMinor + taxMinor,
      handover: input.handover,
      deliveryAddress: input.handover === "freight" ? input.deliveryAddress!.trim() : null,
      checkoutSessionId: null,
      checkoutUrl: null,
      paymentIntentId: null,
      reservedUntil: new Date(now().getTime() + config.checkout.reservationMinutes * 60_000),
      paidAt: null,
    });
    await manager.getRepository(OrderEntity).insert(entity);
    await changed(manager, listingId);
    return entity;
  }

  /**
   * Opens the provider's hosted checkout for an order just placed and remembers it on the order.
   * If the provider cannot be reached, the reservation is released (nothing stays half-made) and
   * the caller gets 503 payments_unavailable.
   */
  async function openPaymentPage(order: OrderEntity): Promise<string> {
    let checkout: { checkoutId: string; url: string };
    try {
      checkout = await payments.startCheckout({
        orderId: order.id,
        listingId: order.listingId,
        currency: order.currency,
        lines: [
          { name: order.title, amountMinor: order.priceMinor },
          ...(order.taxMinor > 0 ? [{ name: "Tax", amountMinor: order.taxMinor }] : []),
        ],
        successUrl: `${config.publicUrl}/orders/${order.id}?paid=1`,
        cancelUrl: `${config.publicUrl}/orders/${order.id}?cancelled=1`,
        // The page stays open a minute past the hold, so a buyer mid-payment is not cut off.
        expiresAt: new Date(order.reservedUntil.getTime() + 60_000),
        idempotencyKey: `checkout-${order.id}`,
      });
    } catch (error) {
      deps.log.error({ err: error, orderId: order.id }, "could not open checkout");
      await dataSource.transaction((manager) => release(manager, order, "dropUnopenedCheckout"));
      throw new ServiceUnavailable(
        "Card payments are not available right now, so nothing was reserved. Please try again in a few minutes.",
        "payments_unavailable",
      );
    }
    await dataSource
      .getRepository(OrderEntity)
      .update({ id: order.id }, { checkoutSessionId: checkout.checkoutId, checkoutUrl: checkout.url });
    return checkout.url;
  }

  return {
    /** What buying this listing costs now: the same figures checkout will snapshot. */
    async quote(listingId: string): Promise<CheckoutQuote> {
      const listing = await dataSource.getRepository(ListingEntity).findOneBy({ id: listingId });
      if (!listing || !["live", "reserved", "sold"].includes(listing.status)) throw new NotFound("That slab is not for sale here.");
      return { ...quoteFor(listing, config.checkout), reservationMinutes: config.checkout.reservationMinutes };
    },

    /**
     * "Buy": reserves the listing for this buyer (one winner: a conditional update), snapshots the
     * figures and price into an order, and opens the provider's hosted checkout. If the provider
     * cannot be reached, the reservation is released and no order is left half-made.
     */
    async checkout(actor: Actor, listingId: string, input: CheckoutInput): Promise<{ order: Order; checkoutUrl: string }> {
      const buyer = requireRole(actor, "buyer");
      const order = await dataSource.transaction((manager) => placeOrder(manager, buyer.accountId, listingId, input));
      const checkoutUrl = await openPaymentPage(order);
      const saved = await dataSource.getRepository(OrderEntity).findOneByOrFail({ id: order.id });
      return { order: await view(saved, actor), checkoutUrl };
    },

    placeOrder,
    openPaymentPage,
    view,

    /**
     * A payment event, already verified by the payments port. Handled once per event id (stored
     * in the same transaction), so duplicates and retries change nothing; out-of-order events are
     * judged by the order's current state.
     */
    async handleEvent(event: PaymentEvent): Promise<"handled" | "duplicate" | "ignored"> {
      const outcome = await dataSource.transaction(async (manager) => {
        const inserted = await manager
          .createQueryBuilder()
          .insert()
          .into(PaymentEventEntity)
          .values({ id: event.eventId, type: event.kind, payload: JSON.stringify(event) })
          .orIgnore()
          .execute();
        if (!insertedARow(inserted.raw)) return "duplicate" as const;
        // A sawyer's payout account changed at the provider (set-up finished, say).
        if (event.kind === "payout_account_updated")
          return (await deps.onAccountUpdated?.(event.account, manager)) ? ("handled" as const) : ("ignored" as const);
        const order = await manager
          .getRepository(OrderEntity)
          .findOne({ where: { id: event.orderId }, lock: { mode: "pessimistic_write" } });
        if (!order) return "ignored" as const;
        switch (event.kind) {
          case "checkout_completed": {
            if (!transitionFrom("confirmPayment").includes(order.status)) return "ignored" as const;
            // Paid after the reservation lapsed and someone else bought it: the money goes back.
            const listing = await manager
              .getRepository(ListingEntity)
              .findOne({ where: { id: order.listingId }, lock: { mode: "pessimistic_write" } });
            const stillOurs = order.status === OPEN_PAYMENT ? listing?.status === "reserved" : listing?.status === "live";
            if (!stillOurs) return (await deps.refunds.refundLatePayment(manager, order, event.paymentId)) ? "handled" : "ignored";
            await manager
              .getRepository(OrderEntity)
              .update(
                { id: order.id, status: In(transitionFrom("confirmPayment")) },
                { status: "paid", paidAt: now(), paymentIntentId: event.paymentId },
              );
            await manager.getRepository(ListingEntity).update({ id: order.listingId }, { status: "sold" });
            await manager.getRepository(LedgerEntryEntity).insert(saleEntries(order, "payment", event.eventId));
            await changed(manager, order.listingId);
            await mailPaid(manager, await manager.getRepository(OrderEntity).findOneByOrFail({ id: order.id }));
            return "handled" as const;
          }
          case "payment_refunded":
            // Our own refund of a cancelled order (the API may have recorded it already: then nothing changes).
            return (await deps.refunds.settleFromProvider(manager, order.id, event.eventId)) ? ("handled" as const) : ("ignored" as const);
          case "checkout_expired":
            return (await release(manager, order, "expireReservation")) ? ("handled" as const) : ("ignored" as const);
          case "payment_failed":
            // A declined card is not the end: the hosted page lets the buyer try another card in the
            // same session, so the order keeps its hold until the reservation runs out (the sweep, or
            // the provider's expiry of the page) or a payment arrives. The event is recorded above.
            return order.status === OPEN_PAYMENT ? ("handled" as const) : ("ignored" as const);
        }
      });
      return outcome;
    },

    /**
     * Asks the provider whether an order's hosted checkout was paid and, if it was, handles that
     * as the provider's "checkout completed" event would (once: its event id is the checkout's).
     * For a payment whose webhook never came; the demo seed pays its orders this way too.
     */
    async reconcilePayment(orderId: string): Promise<"handled" | "duplicate" | "ignored"> {
      const order = await dataSource.getRepository(OrderEntity).findOneBy({ id: orderId });
      if (!order?.checkoutSessionId) return "ignored";
      const state = await payments.checkoutPayment(order.checkoutSessionId);
      if (!state.paid) return "ignored";
      return this.handleEvent({
        kind: "checkout_completed",
        eventId: `reconcile-${order.checkoutSessionId}`,
        orderId,
        checkoutId: order.checkoutSessionId,
        paymentId: state.paymentId,
      });
    },

    /**
     * Releases reservations whose time ran out. Safe on several API instances at once: each
     * release is a conditional update, so only one instance wins each order.
     */
    async sweepExpiredReservations(): Promise<number> {
      const due = await dataSource
        .getRepository(OrderEntity)
        .find({ where: { status: In(transitionFrom("expireReservation")), reservedUntil: LessThan(now()) }, take: 200 });
      let released = 0;
      for (const order of due) {
        const done = await retryOnLockConflict(() => dataSource.transaction((manager) => release(manager, order, "expireReservation")));
        if (done) {
          released += 1;
          if (order.checkoutSessionId) await payments.expireCheckout(order.checkoutSessionId).catch(() => undefined);
        }
      }
      return released;
    },

    /** The ledger's balance per currency (always zero). */
    async ledgerTotals(): Promise<Record<string, number>> {
      const rows = (await dataSource.query("SELECT currency, SUM(amount_minor) AS total FROM ledger_entry GROUP BY currency")) as {
        currency: string;
        total: string;
      }[];
      return Object.fromEntries(rows.map((r) => [r.currency, Number(r.total)]));
    },

    async ordersOfListing(listingId: string) {
      return dataSource.getRepository(OrderEntity).find({ where: { listingId, status: In(["paid", OPEN_PAYMENT]) } });
    },
  };
}

export type CheckoutService = ReturnType<typeof createCheckoutService>;
