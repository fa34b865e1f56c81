import {
  canMakeTransition,
  orderStatusesIn,
  orderStatusLabels,
  orderTransitions,
  transitionFrom,
  type CancellationInput,
  type ChooseWindowInput,
  type HandOverInput,
  type Order,
  type OrderSearchInput,
  type OrderSearchPage,
  type OrderStatus,
  type OrderTransitionName,
  type PickupWindowsInput,
  type ProblemReportInput,
  type ShipmentInput,
} from "@grainyard/contracts";
import { randomUUID } from "node:crypto";
import { retryOnLockConflict } from "../db/lock-conflicts.ts";
import { In, IsNull, LessThan, Not, type DataSource, type EntityManager } from "typeorm";
import type { AppConfig } from "../config.ts";
import { AccountEntity, ListingEntity, OrderEntity, OrderProblemEntity } from "../entities/index.ts";
import { Conflict, Forbidden, Invalid, NotFound } from "../errors.ts";
import { orderStepMail, type OrderStep } from "../mail-templates.ts";
import { problemReceivedMail, problemReportedDeskMail, problemReportedSawyerMail } from "../mail-templates-problems.ts";
import { requireRole, requireSignedIn, type Actor } from "./actor.ts";
import { searchOrdersForDesk } from "./order-desk-search.ts";
import { timeZoneAt } from "./places.ts";
import type { RefundService } from "./refund-service.ts";
import type { MailQueue } from "./mail-outbox.ts";
import type { DomainEventBus } from "../events.ts";

/**
 * An order after payment: the sawyer readies it (pickup windows, or freight with a tracking
 * reference), hands it over, and the buyer confirms receipt (or it completes by itself some days
 * after hand-over). Before hand-over either side may cancel: the buyer gets a full refund through
 * the provider and the slab goes back on sale. Every step is a conditional update on the current
 * status (its "from" statuses and who may make it come from contracts' order-lifecycle.ts), so two
 * clicks, two tabs or two API instances can never move an order twice.
 */

const DAY_MS = 86_400_000;

export interface Parties {
  buyerName: string;
  buyerEmail: string;
  yardName: string | null;
  pickupTown: string | null;
  /**
   * The time zone pickup times are read in: the one stored with the windows, else the yard's own
   * (from its town's position, UTC when unknown).
   */
  yardTimeZone: string;
  sawyerName: string;
  sawyerEmail: string;
}

const iso = (date: Date | null) => date?.toISOString() ?? null;

/** The steps the one looking may take now, each the life-cycle transition it makes. */
const actionTransitions: [Order["actions"][number], OrderTransitionName][] = [
  ["propose_pickup_windows", "proposePickupWindows"],
  ["mark_shipped", "markShipped"],
  ["mark_handed_over", "markHandedOver"],
  ["choose_pickup_window", "choosePickupWindow"],
  ["confirm_receipt", "confirmReceipt"],
  ["report_problem", "reportProblem"],
  ["cancel", "cancel"],
];

function actionsFor(order: OrderEntity, viewerIs: Order["viewerIs"]): Order["actions"] {
  if (viewerIs === "other") return [];
  return actionTransitions
    .filter(([, transition]) => canMakeTransition(transition, order, viewerIs))
    .filter(([action]) => action !== "choose_pickup_window" || (order.pickupWindows?.length ?? 0) > 0)
    .map(([action]) => action);
}

/** A reported problem as its buyer, its sawyer and the desk read it. */
export function problemView(problem: OrderProblemEntity): NonNullable<Order["problem"]> {
  return {
    id: problem.id,
    kind: problem.kind,
    comment: problem.comment,
    // A refund being made right now still reads as open until it is through.
    status: problem.status === "settling" ? "open" : problem.status,
    reportedAt: problem.createdAt.toISOString(),
    resolutionNote: problem.resolutionNote,
    resolvedAt: iso(problem.resolvedAt),
    refundedMinor: problem.refundedMinor,
  };
}

/** The problem reported on each order, if any, in one query. */
async function problemsOf(manager: EntityManager | DataSource, orders: OrderEntity[]): Promise<Map<string, OrderProblemEntity>> {
  const ids = orders.map((o) => o.id);
  const rows = ids.length ? await manager.getRepository(OrderProblemEntity).findBy({ orderId: In(ids) }) : [];
  return new Map(rows.map((r) => [r.orderId, r]));
}

/** The order as this actor sees it: fees and the sawyer's net only for the sawyer and admins. */
export function orderView(
  order: OrderEntity,
  actor: Actor,
  parties: Parties | undefined,
  autoCompleteDays: number,
  problem: OrderProblemEntity | null = null,
): Order {
  const viewerIs: Order["viewerIs"] =
    actor.kind !== "account"
      ? "other"
      : actor.accountId === order.buyerId
        ? "buyer"
        : actor.accountId === order.sawyerId
          ? "sawyer"
          : "other";
  const seesShare = actor.kind === "account" && (actor.role === "admin" || actor.accountId === order.sawyerId);
  return {
    id: order.id,
    status: order.status,
    listingId: order.listingId,
    title: order.title,
    currency: order.currency,
    priceMinor: order.priceMinor,
    taxMinor: order.taxMinor,
    totalMinor: order.totalMinor,
    handover: order.handover,
    deliveryAddress: order.deliveryAddress,
    reservedUntil: order.reservedUntil.toISOString(),
    paymentPageUrl: viewerIs === "buyer" && order.status === "awaiting_payment" ? order.checkoutUrl : null,
    paidAt: iso(order.paidAt),
    slabs: order.slabSnapshot,
    sawyerShare: seesShare
      ? { platformFeeMinor: order.platformFeeMinor, processingFeeMinor: order.processingFeeMinor, sawyerNetMinor: order.sawyerNetMinor }
      : null,
    createdAt: order.createdAt.toISOString(),
    viewerIs,
    parties: { buyerName: parties?.buyerName ?? "The buyer", yardName: parties?.yardName ?? null, pickupTown: parties?.pickupTown ?? null },
    pickupWindows: order.pickupWindows ?? [],
    pickupTimeZone: parties?.yardTimeZone ?? "UTC",
    pickupAddress: order.pickupAddress,
    chosenPickupWindow:
      order.pickupStartsAt && order.pickupEndsAt
        ? { startsAt: order.pickupStartsAt.toISOString(), endsAt: order.pickupEndsAt.toISOString() }
        : null,
    carrier: order.carrier,
    trackingReference: order.trackingReference,
    steps: {
      paidAt: iso(order.paidAt),
      readyForPickupAt: iso(order.readyForPickupAt),
      pickupChosenAt: iso(order.pickupChosenAt),
      shippedAt: iso(order.shippedAt),
      handedOverAt: iso(order.handedOverAt),
      completedAt: iso(order.completedAt),
      cancelledAt: iso(order.cancelledAt),
      refundedAt: iso(order.refundedAt),
    },
    completedBy: order.completedBy,
    cancelledBy: order.cancelledBy,
    cancelReason: order.cancelReason,
    handOverNote: order.handOverNote,
    autoCompleteAt:
      order.status === "handed_over" && order.handedOverAt
        ? new Date(order.handedOverAt.getTime() + autoCompleteDays * DAY_MS).toISOString()
        : null,
    problem: problem ? problemView(problem) : null,
    actions: actionsFor(order, viewerIs),
  };
}

/** Buyer and sawyer of each order, read in one query. */
export async function partiesOf(manager: EntityManager | DataSource, orders: OrderEntity[]): Promise<Map<string, Parties>> {
  const ids = [...new Set(orders.flatMap((o) => [o.buyerId, o.sawyerId]))];
  const accounts = ids.length ? await manager.getRepository(AccountEntity).findBy({ id: In(ids) }) : [];
  const byId = new Map(accounts.map((a) => [a.id, a]));
  return new Map(
    orders.map((o) => {
      const buyer = byId.get(o.buyerId);
      const sawyer = byId.get(o.sawyerId);
      return [
        o.id,
        {
          buyerName: buyer?.displayName ?? "The buyer",
          buyerEmail: buyer?.email ?? "",
          yardName: sawyer?.yardName ?? null,
          pickupTown: sawyer?.pickupTown ?? null,
          yardTimeZone: o.pickupTimeZone ?? timeZoneAt(sawyer?.pickupLatitude ?? null, sawyer?.pickupLongitude ?? null),
          sawyerName: sawyer?.displayName ?? "The sawyer",
          sawyerEmail: sawyer?.email ?? "",
        },
      ];
    }),
  );
}

export function createOrderService(deps: {
  dataSource: DataSource;
  refunds: RefundService;
  /** E-mails go into the outbox inside the transaction that causes them. */
  mail: MailQueue;
  config: Pick<AppConfig, "publicUrl" | "checkout">;
  log: { error(object: object, message: string): void; info(object: object, message: string): void };
  now?: () => Date;
  /** Where the service announces what changed (the catalogue and alerts listen). */
  events?: DomainEventBus;
}) {
  const { dataSource, config } = deps;
  const now = deps.now ?? (() => new Date());
  const orders = () => dataSource.getRepository(OrderEntity);

  /** The yard's own time zone, from the position of its pickup town. */
  async function yardTimeZoneOf(sawyerId: string): Promise<string> {
    const sawyer = await dataSource.getRepository(AccountEntity).findOneBy({ id: sawyerId });
    return timeZoneAt(sawyer?.pickupLatitude ?? null, sawyer?.pickupLongitude ?? null);
  }

  async function present(order: OrderEntity, actor: Actor): Promise<Order> {
    const [parties, problems] = await Promise.all([partiesOf(dataSource, [order]), problemsOf(dataSource, [order])]);
    return orderView(order, actor, parties.get(order.id), config.checkout.autoCompleteDays, problems.get(order.id));
  }

  /** The order, if this actor is its sawyer or buyer (as the step needs). */
  async function orderFor(actor: Actor, orderId: string, who: "sawyer" | "buyer" | "either"): Promise<OrderEntity> {
    const signedIn = requireSignedIn(actor);
    const order = await orders().findOneBy({ id: orderId });
    if (!order) throw new NotFound("No order with that id.");
    const isSawyer = signedIn.accountId === order.sawyerId;
    const isBuyer = signedIn.accountId === order.buyerId;
    if (who === "sawyer" && !isSawyer) throw new Forbidden(isBuyer ? "Only the sawyer can do this step." : "That order is not yours.");
    if (who === "buyer" && !isBuyer) throw new Forbidden(isSawyer ? "Only the buyer can do this step." : "That order is not yours.");
    if (who === "either" && !isSawyer && !isBuyer) throw new Forbidden("That order is not yours.");
    return order;
  }

  function wrongState(status: OrderStatus, doing: string): Conflict {
    return new Conflict(`This order is ${orderStatusLabels[status].toLowerCase()}, so it cannot ${doing} now.`, "order_state");
  }

  /**
   * One step: the life-cycle transition as a conditional update from its allowed statuses to its
   * status; anything else is a 409 naming the current state.
   */
  async function step(
    order: OrderEntity,
    transition: OrderTransitionName,
    changes: Partial<OrderEntity>,
    doing: string,
    manager: EntityManager = dataSource.manager,
  ): Promise<OrderEntity> {
    const from = transitionFrom(transition);
    if (!from.includes(order.status)) throw wrongState(order.status, doing);
    const updated = await manager
      .getRepository(OrderEntity)
      .update({ id: order.id, status: In(from) }, { ...changes, status: orderTransitions[transition].to });
    if (updated.affected !== 1) {
      const current = await manager.getRepository(OrderEntity).findOneByOrFail({ id: order.id });
      throw wrongState(current.status, doing);
    }
    return manager.getRepository(OrderEntity).findOneByOrFail({ id: order.id });
  }

  /** E-mails to the buyer and the sawyer about a step, written into the outbox with the step itself. */
  async function mailBoth(manager: EntityManager, order: OrderEntity, stepName: OrderStep) {
    const parties = (await partiesOf(manager, [order])).get(order.id)!;
    const link = `${config.publicUrl}/orders/${order.id}`;
    for (const [email, displayName, role] of [
      [parties.buyerEmail, parties.buyerName, "buyer"],
      [parties.sawyerEmail, parties.sawyerName, "sawyer"],
    ] as const) {
      await deps.mail.queue(
        manager,
        `order_${stepName}`,
        orderStepMail({ email, displayName }, role, stepName, order, parties, link, config.checkout.autoCompleteDays),
      );
    }
  }

  /** A step and its e-mails in one transaction. */
  function stepAndMail(
    order: OrderEntity,
    transition: OrderTransitionName,
    changes: Partial<OrderEntity>,
    doing: string,
    stepName: OrderStep,
  ): Promise<OrderEntity> {
    return dataSource.transaction(async (manager) => {
      const updated = await step(order, transition, changes, doing, manager);
      await mailBoth(manager, updated, stepName);
      return updated;
    });
  }

  return {
    get: async (actor: Actor, orderId: string): Promise<Order> => {
      const signedIn = requireSignedIn(actor);
      const order = await orders().findOneBy({ id: orderId });
      if (!order) throw new NotFound("No order with that id.");
      if (signedIn.role !== "admin" && signedIn.accountId !== order.buyerId && signedIn.accountId !== order.sawyerId)
        throw new Forbidden("That order is not yours.");
      return present(order, actor);
    },

    /** A buyer's orders, the sales of a sawyer's yard, or for an admin every order (newest first, the latest 100). */
    async listOwn(actor: Actor): Promise<Order[]> {
      const signedIn = requireSignedIn(actor);
      const where =
        signedIn.role === "admin"
          ? {}
          : signedIn.role === "sawyer"
            ? { sawyerId: signedIn.accountId, status: In(orderStatusesIn("sold")) }
            : { buyerId: signedIn.accountId };
      const list = await orders().find({ where, order: { createdAt: "DESC" }, take: 100 });
      const [parties, problems] = await Promise.all([partiesOf(dataSource, list), problemsOf(dataSource, list)]);
      return list.map((o) => orderView(o, actor, parties.get(o.id), config.checkout.autoCompleteDays, problems.get(o.id)));
    },

    /** The operator desk's order search (admins only): words, newest first, keyset pages. */
    async searchForDesk(actor: Actor, input: OrderSearchInput): Promise<OrderSearchPage> {
      requireRole(actor, "admin");
      const found = await searchOrdersForDesk(dataSource, input);
      const [parties, problems] = await Promise.all([partiesOf(dataSource, found.orders), problemsOf(dataSource, found.orders)]);
      return {
        orders: found.orders.map((o) => orderView(o, actor, parties.get(o.id), config.checkout.autoCompleteDays, problems.get(o.id))),
        nextCursor: found.nextCursor,
      };
    },

    /** Pickup orders: the sawyer proposes 1–5 windows (again, if none suits) and where to come. */
    async proposePickupWindows(actor: Actor, orderId: string, input: PickupWindowsInput): Promise<Order> {
      const order = await orderFor(actor, orderId, "sawyer");
      if (order.handover !== "pickup")
        throw new Conflict("This order goes by freight: add the carrier and tracking reference instead.", "order_state");
      const at = now();
      const windows = input.windows
        .map((w) => ({ startsAt: new Date(w.startsAt), endsAt: new Date(w.endsAt) }))
        .sort((a, b) => a.startsAt.getTime() - b.startsAt.getTime());
      const fields: Record<string, string> = {};
      windows.forEach((w, index) => {
        if (w.startsAt.getTime() <= at.getTime()) fields[`windows.${index}.startsAt`] = "Choose a time in the future.";
        if (w.endsAt.getTime() - w.startsAt.getTime() > 12 * 3_600_000)
          fields[`windows.${index}.endsAt`] = "Keep a window to 12 hours or less.";
        if (w.startsAt.getTime() - at.getTime() > 60 * DAY_MS)
          fields[`windows.${index}.startsAt`] = "Propose times within the next 60 days.";
        if (index > 0 && w.startsAt.getTime() === windows[index - 1]!.startsAt.getTime())
          fields[`windows.${index}.startsAt`] = "Two windows start at the same time.";
      });
      if (Object.keys(fields).length) throw new Invalid("Some pickup windows need a change.", fields);
      const updated = await stepAndMail(
        order,
        "proposePickupWindows",
        {
          pickupWindows: windows.map((w) => ({ startsAt: w.startsAt.toISOString(), endsAt: w.endsAt.toISOString() })),
          // The yard's zone as it is now: the windows are read in it even if the yard moves later.
          pickupTimeZone: await yardTimeZoneOf(order.sawyerId),
          pickupAddress: input.pickupAddress,
          readyForPickupAt: order.readyForPickupAt ?? at,
          pickupStartsAt: null,
          pickupEndsAt: null,
          pickupChosenAt: null,
        },
        "get pickup windows",
        "pickup_windows_proposed",
      );
      return present(updated, actor);
    },

    /** The buyer picks one of the proposed windows. */
    async choosePickupWindow(actor: Actor, orderId: string, input: ChooseWindowInput): Promise<Order> {
      const order = await orderFor(actor, orderId, "buyer");
      if (!transitionFrom("choosePickupWindow").includes(order.status)) throw wrongState(order.status, "have a pickup window chosen");
      const wanted = Date.parse(input.startsAt);
      const window = (order.pickupWindows ?? []).find((w) => Date.parse(w.startsAt) === wanted);
      if (!window)
        throw new Invalid("Choose one of the windows the sawyer proposed.", { startsAt: "That is not one of the proposed windows." });
      const updated = await stepAndMail(
        order,
        "choosePickupWindow",
        { pickupStartsAt: new Date(window.startsAt), pickupEndsAt: new Date(window.endsAt), pickupChosenAt: now() },
        "have a pickup window chosen",
        "pickup_window_chosen",
      );
      return present(updated, actor);
    },

    /** Freight orders: the sawyer sends it and gives the carrier and tracking reference. */
    async markShipped(actor: Actor, orderId: string, input: ShipmentInput): Promise<Order> {
      const order = await orderFor(actor, orderId, "sawyer");
      if (order.handover !== "freight")
        throw new Conflict("This order is collected at the yard: propose pickup windows instead.", "order_state");
      const updated = await stepAndMail(
        order,
        "markShipped",
        { carrier: input.carrier, trackingReference: input.trackingReference, shippedAt: now() },
        "be marked as shipped",
        "shipped",
      );
      return present(updated, actor);
    },

    /** The slab left the sawyer's hands: collected at the yard, or delivered by the carrier. */
    async markHandedOver(actor: Actor, orderId: string, input: HandOverInput = {}): Promise<Order> {
      const order = await orderFor(actor, orderId, "sawyer");
      const reason = input.reason?.trim() ?? "";
      // Asked only of an order that can be handed over now (otherwise the state answers: 409).
      const early =
        transitionFrom("markHandedOver").includes(order.status) &&
        order.handover === "pickup" &&
        order.pickupStartsAt !== null &&
        now() < order.pickupStartsAt;
      if (early && reason.length < 3)
        throw new Invalid("The booked pickup time has not come yet: say why it is handed over now.", {
          reason: "Say why it is handed over before the booked time (the buyer reads this).",
        });
      const updated = await stepAndMail(
        order,
        "markHandedOver",
        { handedOverAt: now(), handOverNote: early ? reason : null },
        "be marked as handed over",
        "handed_over",
      );
      return present(updated, actor);
    },

    /** The buyer has the slab and says so. */
    async confirmReceipt(actor: Actor, orderId: string): Promise<Order> {
      const order = await orderFor(actor, orderId, "buyer");
      const updated = await stepAndMail(
        order,
        "confirmReceipt",
        { completedAt: now(), completedBy: "buyer" },
        "be confirmed as received",
        "completed",
      );
      return present(updated, actor);
    },

    /**
     * After hand-over, instead of confirming receipt, the buyer says there is a problem (not
     * received, or not as described) in their own words. Once per order: the step moves it to
     * problem_reported (so the completion sweep leaves it alone) and the case is opened for the
     * desk in the same transaction (one row per order); the sawyer, every admin and the buyer are
     * e-mailed through the outbox with it.
     */
    async reportProblem(actor: Actor, orderId: string, input: ProblemReportInput): Promise<Order> {
      const order = await orderFor(actor, orderId, "buyer");
      const updated = await dataSource.transaction(async (manager) => {
        const moved = await step(order, "reportProblem", {}, "have a problem reported", manager);
        const problem: OrderProblemEntity = {
          id: randomUUID(),
          orderId: order.id,
          buyerId: order.buyerId,
          kind: input.kind,
          comment: input.comment,
          status: "open",
          resolvedBy: null,
          resolutionNote: null,
          refundedMinor: null,
          resolvedAt: null,
          createdAt: now(),
        };
        await manager.getRepository(OrderProblemEntity).insert(problem);
        const parties = (await partiesOf(manager, [moved])).get(moved.id)!;
        const link = `${config.publicUrl}/orders/${order.id}`;
        await deps.mail.queue(
          manager,
          "order_problem_received",
          problemReceivedMail({ email: parties.buyerEmail, displayName: parties.buyerName }, moved, problem, link),
        );
        await deps.mail.queue(
          manager,
          "order_problem_sawyer",
          problemReportedSawyerMail(
            { email: parties.sawyerEmail, displayName: parties.sawyerName },
            parties.buyerName,
            moved,
            problem,
            link,
          ),
        );
        const admins = await manager.getRepository(AccountEntity).find({ where: { role: "admin", suspendedAt: IsNull() } });
        for (const admin of admins)
          await deps.mail.queue(
            manager,
            "order_problem_desk",
            problemReportedDeskMail(
              admin,
              { buyerName: parties.buyerName, yardName: parties.yardName ?? parties.sawyerName },
              moved,
              problem,
              `${config.publicUrl}/admin/problems`,
            ),
          );
        return moved;
      });
      return present(updated, actor);
    },

    /**
     * Either side calls it off before hand-over: the order is cancelled and the slab goes back on
     * sale in one transaction; then the provider refunds the whole payment (idempotent on the
     * order, so a retry never refunds twice) and the ledger reverses the sale.
     */
    async cancel(actor: Actor, orderId: string, input: CancellationInput): Promise<Order> {
      const order = await orderFor(actor, orderId, "either");
      const by = requireSignedIn(actor).accountId === order.sawyerId ? "sawyer" : "buyer";
      const cancelled = await dataSource.transaction(async (manager) => {
        const updated = await step(
          order,
          "cancel",
          { cancelledAt: now(), cancelledBy: by, cancelReason: input.reason },
          "be cancelled",
          manager,
        );
        await manager.getRepository(ListingEntity).update({ id: order.listingId, status: "sold" }, { status: "live" });
        await deps.events?.emitSerial("listingChanged", { manager, listingId: order.listingId });
        await mailBoth(manager, updated, "cancelled");
        return updated;
      });
      await deps.refunds.refundCancelledOrder(cancelled);
      return present(await orders().findOneByOrFail({ id: orderId }), actor);
    },

    /**
     * Orders handed over more than AUTO_COMPLETE_DAYS ago complete by themselves. Safe on several
     * API instances at once: each completion is a conditional update, so only one instance wins.
     */
    async completeDueOrders(): Promise<number> {
      const cutoff = new Date(now().getTime() - config.checkout.autoCompleteDays * DAY_MS);
      const from = transitionFrom("completeAutomatically");
      const due = await orders().find({ where: { status: In(from), handedOverAt: LessThan(cutoff) }, take: 200 });
      let completed = 0;
      for (const order of due) {
        const done = await retryOnLockConflict(() =>
          dataSource.transaction(async (manager) => {
            const updated = await manager
              .getRepository(OrderEntity)
              .update(
                { id: order.id, status: In(from) },
                { status: orderTransitions.completeAutomatically.to, completedAt: now(), completedBy: "automatic" },
              );
            if (updated.affected !== 1) return false;
            await mailBoth(manager, await manager.getRepository(OrderEntity).findOneByOrFail({ id: order.id }), "completed");
            return true;
          }),
        );
        if (done) completed += 1;
      }
      return completed;
    },

    /** Cancelled orders whose refund did not go through (provider unreachable) are tried again. */
    async retryPendingRefunds(): Promise<number> {
      const pending = await orders().find({
        where: { status: In(transitionFrom("recordCancellationRefund")), paymentIntentId: Not("") },
        take: 50,
      });
      let done = 0;
      for (const order of pending) if (order.paymentIntentId && (await deps.refunds.refundCancelledOrder(order))) done += 1;
      return done;
    },
  };
}

export type OrderService = ReturnType<typeof createOrderService>;
