import { randomUUID } from "node:crypto";
import type Stripe from "stripe";
import { roundHalfUp } from "@grainyard/slab-math";
import { In, LessThan, type DataSource, type EntityManager } from "typeorm";
import type { AppConfig } from "../config.ts";
import { AccountEntity, LedgerEntryEntity, ListingEntity, ListingSlabEntity, OrderEntity, PaymentEventEntity } from "../entities/index.ts";
import { Conflict, Forbidden, Invalid, NotFound, ServiceUnavailable } from "../errors.ts";
import { retryOnLockConflict } from "../db/lock-conflicts.ts";
import type { Mailer } from "../integrations/mail.ts";
import type { Payments } from "../integrations/payments.ts";
import { orderPaidBuyerMail, orderPaidSawyerMail } from "../mail-templates.ts";
import { requireRole, type Actor } from "./actor.ts";
import { toSlab } from "./yard-service.ts";
import { saleEntries } from "./ledger.ts";
import { orderView, partiesOf, recordRefund } from "./order-service.ts";
import type { CheckoutQuote, Order } from "@grainyard/contracts";

/** Orders waiting for the provider; a paid order moves on through hand-over. */
const OPEN_PAYMENT = "awaiting_payment" as const;

export interface CheckoutInput {
  handover: "pickup" | "freight";
  deliveryAddress?: string | null;
}

/**
 * Price, tax and total of a listing: tax at the configured rate on the price, rounded half-up once
 * (slab-math's money rule); the platform and processing fees were split by slab-math when the
 * listing was priced and are taken from the sawyer's share, not added for the buyer.
 */
function quoteFor(listing: Pick<ListingEntity, "priceMinor" | "currency">, checkout: Pick<AppConfig["checkout"], "taxRateBps">) {
  const taxMinor = roundHalfUp((listing.priceMinor * checkout.taxRateBps) / 10_000);
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
  payments: Payments;
  mailer: Mailer;
  config: Pick<AppConfig, "publicUrl" | "checkout">;
  log: { error(object: object, message: string): void; info(object: object, message: string): void };
  now?: () => Date;
  onListingChanged?: (manager: EntityManager, listingId: string) => Promise<void>;
  /** A connected (payout) account changed at the provider; true when it is one of ours. */
  onAccountUpdated?: (account: Stripe.Account, manager: EntityManager) => Promise<boolean>;
}) {
  const { dataSource, payments, config } = deps;
  const now = deps.now ?? (() => new Date());
  const changed = (manager: EntityManager, listingId: string) => deps.onListingChanged?.(manager, listingId) ?? Promise.resolve();

  async function view(order: OrderEntity, actor: Actor): Promise<Order> {
    const parties = await partiesOf(dataSource, [order]);
    return orderView(order, actor, parties.get(order.id), config.checkout.autoCompleteDays);
  }

  /** Puts a reserved listing back on sale (only if this order still holds it). */
  async function release(manager: EntityManager, order: OrderEntity, status: OrderEntity["status"]) {
    const updated = await manager.getRepository(OrderEntity).update({ id: order.id, status: OPEN_PAYMENT }, { status });
    if (updated.affected !== 1) return false;
    await manager.getRepository(ListingEntity).update({ id: order.listingId, status: "reserved" }, { status: "live" });
    await changed(manager, order.listingId);
    return true;
  }

  async function mailPaid(order: OrderEntity) {
    const [buyer, sawyer] = await Promise.all([
      dataSource.getRepository(AccountEntity).findOneBy({ id: order.buyerId }),
      dataSource.getRepository(AccountEntity).findOneBy({ id: order.sawyerId }),
    ]);
    const link = `${config.publicUrl}/orders/${order.id}`;
    for (const mail of [
      buyer && sawyer ? orderPaidBuyerMail(buyer, sawyer, order, link) : null,
      sawyer && buyer ? orderPaidSawyerMail(sawyer, buyer, order, link) : null,
    ]) {
      if (!mail) continue;
      try {
        await deps.mailer.send(mail);
      } catch (error) {
        deps.log.error({ err: error, orderId: order.id }, "could not send order e-mail");
      }
    }
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
      if (input.handover === "freight" && !input.deliveryAddress?.trim())
        throw new Invalid("Give the delivery address for freight.", { deliveryAddress: "Where should the freight go?" });
      const order = await dataSource.transaction(async (manager) => {
        const listing = await manager.getRepository(ListingEntity).findOneBy({ id: listingId });
        if (!listing) throw new NotFound("That slab is not for sale here.");
        if (listing.sawyerId === buyer.accountId) throw new Forbidden("You cannot buy your own listing.");
        if (input.handover === "pickup" && !listing.pickup)
          throw new Invalid("This listing is not offered for pickup.", { handover: "Choose freight." });
        if (input.handover === "freight" && !listing.freight)
          throw new Invalid("This listing is not offered for freight.", { handover: "Choose pickup." });
        const reserved = await manager.getRepository(ListingEntity).update({ id: listingId, status: "live" }, { status: "reserved" });
        if (reserved.affected !== 1) {
          // Read again, past this transaction's snapshot: another buyer may have won the race a moment ago.
          const current = await manager
            .getRepository(ListingEntity)
            .findOne({ where: { id: listingId }, lock: { mode: "pessimistic_read" } });
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
        const { taxMinor } = quoteFor(listing, config.checkout);
        const entity = manager.getRepository(OrderEntity).create({
          id: randomUUID(),
          buyerId: buyer.accountId,
          sawyerId: listing.sawyerId,
          listingId,
          status: OPEN_PAYMENT,
          title: listing.title,
          slabSnapshot: links.map((l) => toSlab(l.slab!, listingId) as unknown as Record<string, unknown>),
          currency: listing.currency,
          priceMinor: listing.priceMinor,
          platformFeeMinor: listing.platformFeeMinor,
          processingFeeMinor: listing.processingFeeMinor,
          sawyerNetMinor: listing.sawyerNetMinor,
          taxMinor,
          totalMinor: listing.priceMinor + taxMinor,
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
      });

      let session: Stripe.Checkout.Session;
      try {
        const lineItems: Stripe.Checkout.SessionCreateParams.LineItem[] = [
          {
            quantity: 1,
            price_data: { currency: order.currency.toLowerCase(), unit_amount: order.priceMinor, product_data: { name: order.title } },
          },
        ];
        if (order.taxMinor > 0)
          lineItems.push({
            quantity: 1,
            price_data: { currency: order.currency.toLowerCase(), unit_amount: order.taxMinor, product_data: { name: "Tax" } },
          });
        session = await payments.sdk.checkout.sessions.create(
          {
            mode: "payment",
            line_items: lineItems,
            success_url: `${config.publicUrl}/orders/${order.id}?paid=1`,
            cancel_url: `${config.publicUrl}/orders/${order.id}?cancelled=1`,
            client_reference_id: order.id,
            metadata: { order_id: order.id, listing_id: listingId },
            payment_intent_data: { metadata: { order_id: order.id } },
            expires_at: Math.floor(order.reservedUntil.getTime() / 1000) + 60,
          },
          { idempotencyKey: `checkout-${order.id}` },
        );
      } catch (error) {
        deps.log.error({ err: error, orderId: order.id }, "could not open checkout");
        await dataSource.transaction((manager) => release(manager, order, "cancelled"));
        throw new ServiceUnavailable(
          "Card payments are not available right now, so nothing was reserved. Please try again in a few minutes.",
          "payments_unavailable",
        );
      }
      await dataSource.getRepository(OrderEntity).update({ id: order.id }, { checkoutSessionId: session.id, checkoutUrl: session.url });
      const saved = await dataSource.getRepository(OrderEntity).findOneByOrFail({ id: order.id });
      return { order: await view(saved, actor), checkoutUrl: session.url! };
    },

    /**
     * A provider event, already verified. Handled once per event id (stored in the same
     * transaction), so duplicates and retries change nothing; out-of-order events are judged by
     * the order's current state.
     */
    async handleEvent(event: Stripe.Event): Promise<"handled" | "duplicate" | "ignored"> {
      let paidOrder: OrderEntity | null = null;
      const outcome = await dataSource.transaction(async (manager) => {
        const inserted = await manager
          .createQueryBuilder()
          .insert()
          .into(PaymentEventEntity)
          .values({ id: event.id, type: event.type, payload: JSON.stringify(event) })
          .orIgnore()
          .execute();
        if ((inserted.raw as { affectedRows?: number }).affectedRows === 0) return "duplicate" as const;
        // A sawyer's payout account changed at the provider (set-up finished, say).
        if (event.type === "account.updated")
          return (await deps.onAccountUpdated?.(event.data.object as Stripe.Account, manager))
            ? ("handled" as const)
            : ("ignored" as const);
        const object = event.data.object as { id: string; metadata?: Record<string, string>; payment_intent?: string | null };
        const orderId = object.metadata?.order_id;
        if (!orderId) return "ignored" as const;
        const order = await manager.getRepository(OrderEntity).findOne({ where: { id: orderId }, lock: { mode: "pessimistic_write" } });
        if (!order) return "ignored" as const;
        switch (event.type) {
          case "checkout.session.completed": {
            if (order.status !== OPEN_PAYMENT && order.status !== "payment_failed" && order.status !== "expired") return "ignored" as const;
            // Paid after the reservation lapsed and someone else bought it: the money goes back.
            const listing = await manager
              .getRepository(ListingEntity)
              .findOne({ where: { id: order.listingId }, lock: { mode: "pessimistic_write" } });
            const stillOurs = order.status === OPEN_PAYMENT ? listing?.status === "reserved" : listing?.status === "live";
            if (!stillOurs) {
              await manager
                .getRepository(OrderEntity)
                .update({ id: order.id }, { status: "refunded", paymentIntentId: object.payment_intent ?? null });
              if (object.payment_intent)
                await payments.sdk.refunds.create(
                  { payment_intent: object.payment_intent, metadata: { order_id: order.id, reason: "sold_elsewhere" } },
                  { idempotencyKey: `late-${order.id}` },
                );
              return "handled" as const;
            }
            await manager
              .getRepository(OrderEntity)
              .update({ id: order.id }, { status: "paid", paidAt: now(), paymentIntentId: object.payment_intent ?? null });
            await manager.getRepository(ListingEntity).update({ id: order.listingId }, { status: "sold" });
            await manager.getRepository(LedgerEntryEntity).insert(saleEntries(order, "payment", event.id));
            await changed(manager, order.listingId);
            paidOrder = await manager.getRepository(OrderEntity).findOneByOrFail({ id: order.id });
            return "handled" as const;
          }
          case "charge.refunded":
            // Our own refund of a cancelled order (the API may have recorded it already: then nothing changes).
            return (await recordRefund(manager, order.id, null, event.id, now())) ? ("handled" as const) : ("ignored" as const);
          case "checkout.session.expired":
            return (await release(manager, order, "expired")) ? ("handled" as const) : ("ignored" as const);
          case "payment_intent.payment_failed":
            return (await release(manager, order, "payment_failed")) ? ("handled" as const) : ("ignored" as const);
          default:
            return "ignored" as const;
        }
      });
      if (event.type === "payment_intent.payment_failed" && outcome === "handled") {
        // The hosted page would let the buyer try another card; the slab is free again, so close it.
        const order = await dataSource
          .getRepository(OrderEntity)
          .findOneBy({ id: (event.data.object as { metadata?: Record<string, string> }).metadata?.order_id ?? "" });
        if (order?.checkoutSessionId) await payments.sdk.checkout.sessions.expire(order.checkoutSessionId).catch(() => undefined);
      }
      if (paidOrder) await mailPaid(paidOrder);
      return outcome;
    },

    /**
     * Releases reservations whose time ran out. Safe on several API instances at once: each
     * release is a conditional update, so only one instance wins each order.
     */
    async sweepExpiredReservations(): Promise<number> {
      const due = await dataSource
        .getRepository(OrderEntity)
        .find({ where: { status: OPEN_PAYMENT, reservedUntil: LessThan(now()) }, take: 200 });
      let released = 0;
      for (const order of due) {
        const done = await retryOnLockConflict(() => dataSource.transaction((manager) => release(manager, order, "expired")));
        if (done) {
          released += 1;
          if (order.checkoutSessionId) await payments.sdk.checkout.sessions.expire(order.checkoutSessionId).catch(() => undefined);
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
