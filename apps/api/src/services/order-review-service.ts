import { randomUUID } from "node:crypto";
import {
  REVIEW_EDIT_DAYS,
  isOrderStatusIn,
  orderStatusLabels,
  reviewInputSchema,
  type OrderReview,
  type OrderReviewState,
  type PublicReview,
  type ReviewAction,
  type ReviewAnswerInput,
  type ReviewInput,
  type YardReviews,
} from "@grainyard/contracts";
import { ratingSummary } from "@grainyard/slab-math";
import { In, IsNull, MoreThan, Not, type DataSource, type EntityManager } from "typeorm";
import type { AppConfig } from "../config.ts";
import { AccountEntity, OrderEntity, OrderReviewEntity } from "../entities/index.ts";
import { Conflict, Forbidden, NotFound } from "../errors.ts";
import type { MailQueue } from "./mail-outbox.ts";
import { reviewAnsweredMail, reviewHiddenMail, reviewWrittenMail } from "../mail-templates-reviews.ts";
import { requireRole, requireSignedIn, type Actor, type SignedInActor } from "./actor.ts";
import type { DomainEventBus } from "../events.ts";
import { recordAudit } from "./audit-log.ts";
import { NO_REVIEWS, yardRatingTotals } from "./yard-rating.ts";

/*
 * Reviews of completed orders (see contracts' order-reviews.ts for the rules in words). Every
 * change is a conditional update on the review's state, inside a transaction that also brings
 * the yard's rating on its catalogue rows up to date (the `yardRatingChanged` event), so two tabs or two
 * API instances can never write two reviews, answer twice or edit after the days are over.
 */

const DAY_MS = 86_400_000;
/** MariaDB's "duplicate entry" (the unique index on order_id). */
const DUPLICATE_KEY = 1062;

const iso = (date: Date | null) => date?.toISOString() ?? null;

/** "Ana and Theo Brandt" → "Ana and Theo B.": enough to tell reviews apart, not enough to find the person. */
export function buyerLabel(displayName: string): string {
  const words = displayName.trim().split(/\s+/).filter(Boolean);
  if (words.length <= 1) return words[0] ?? "A buyer";
  return `${words.slice(0, -1).join(" ")} ${words.at(-1)![0]!.toUpperCase()}.`;
}

function isDuplicateKey(error: unknown): boolean {
  const errno = (error as { errno?: number } | null)?.errno ?? (error as { driverError?: { errno?: number } } | null)?.driverError?.errno;
  return errno === DUPLICATE_KEY;
}

function editableUntil(review: Pick<OrderReviewEntity, "createdAt">): Date {
  return new Date(review.createdAt.getTime() + REVIEW_EDIT_DAYS * DAY_MS);
}

function publicView(review: OrderReviewEntity, title: string, buyerName: string): PublicReview {
  return {
    id: review.id,
    listingId: review.listingId,
    title,
    buyerLabel: buyerLabel(buyerName),
    rating: review.rating,
    matchedListing: review.matchedListing,
    matchedListingComment: review.matchedListingComment,
    handoverWentWell: review.handoverWentWell,
    handoverComment: review.handoverComment,
    body: review.body,
    createdAt: review.createdAt.toISOString(),
    editedAt: iso(review.editedAt),
    answer: review.answer && review.answeredAt ? { body: review.answer, answeredAt: review.answeredAt.toISOString() } : null,
  };
}

export function createOrderReviewService(deps: {
  dataSource: DataSource;
  /** E-mails go into the outbox inside the transaction that causes them. */
  mail: MailQueue;
  config: Pick<AppConfig, "publicUrl">;
  now?: () => Date;
  /** Where the service announces that a yard's visible reviews changed (the catalogue follows, in the same transaction). */
  events?: DomainEventBus;
}) {
  const { dataSource } = deps;
  const now = deps.now ?? (() => new Date());
  const ratingChanged = (manager: EntityManager, sawyerId: string) =>
    deps.events?.emitSerial("yardRatingChanged", { manager, sawyerId }) ?? Promise.resolve();
  const orderLink = (orderId: string) => `${deps.config.publicUrl}/orders/${orderId}`;

  /** Reviews as their buyer, sawyer or an admin sees them (names and titles read in two queries). */
  async function views(rows: OrderReviewEntity[]): Promise<OrderReview[]> {
    if (rows.length === 0) return [];
    const [orders, accounts] = await Promise.all([
      dataSource.getRepository(OrderEntity).find({ where: { id: In(rows.map((r) => r.orderId)) }, select: { id: true, title: true } }),
      dataSource.getRepository(AccountEntity).find({
        where: { id: In([...new Set(rows.flatMap((r) => [r.buyerId, r.sawyerId]))]) },
        select: { id: true, displayName: true, yardName: true },
      }),
    ]);
    const titleOf = new Map(orders.map((o) => [o.id, o.title]));
    const accountOf = new Map(accounts.map((a) => [a.id, a]));
    return rows.map((review) => {
      const buyerName = accountOf.get(review.buyerId)?.displayName ?? "A buyer";
      return {
        ...publicView(review, titleOf.get(review.orderId) ?? "", buyerName),
        orderId: review.orderId,
        sawyerId: review.sawyerId,
        yardName: accountOf.get(review.sawyerId)?.yardName ?? null,
        buyerName,
        editableUntil: editableUntil(review).toISOString(),
        hidden: review.hiddenAt && review.hiddenReason ? { reason: review.hiddenReason, hiddenAt: review.hiddenAt.toISOString() } : null,
      };
    });
  }

  /** The order, for its buyer, its sawyer or an admin; anyone else is refused. */
  async function orderFor(actor: SignedInActor, orderId: string): Promise<OrderEntity> {
    const order = await dataSource.getRepository(OrderEntity).findOneBy({ id: orderId });
    if (!order) throw new NotFound("No order with that id.");
    if (actor.role !== "admin" && actor.accountId !== order.buyerId && actor.accountId !== order.sawyerId)
      throw new Forbidden("That order is not yours.");
    return order;
  }

  function actionsFor(actor: SignedInActor, order: OrderEntity, review: OrderReviewEntity | null): ReviewAction[] {
    const at = now().getTime();
    const actions: ReviewAction[] = [];
    if (actor.accountId === order.buyerId) {
      if (!review && isOrderStatusIn("reviewable", order.status)) actions.push("write");
      if (review && !review.hiddenAt && editableUntil(review).getTime() > at) actions.push("edit");
    }
    if (actor.accountId === order.sawyerId && review && !review.hiddenAt && !review.answer) actions.push("answer");
    if (actor.role === "admin" && review) actions.push(review.hiddenAt ? "show" : "hide");
    return actions;
  }

  async function stateOf(actor: SignedInActor, order: OrderEntity): Promise<OrderReviewState> {
    const review = await dataSource.getRepository(OrderReviewEntity).findOneBy({ orderId: order.id });
    return { review: review ? (await views([review]))[0]! : null, actions: actionsFor(actor, order, review) };
  }

  /** Hides a review inside the caller's transaction (the desk's button, or a report's resolution), audited there too. */
  async function hideWith(
    manager: EntityManager,
    admin: SignedInActor,
    reviewId: string,
    reason: string,
    at: Date,
  ): Promise<OrderReviewEntity> {
    const review = await manager.getRepository(OrderReviewEntity).findOne({ where: { id: reviewId }, lock: { mode: "pessimistic_write" } });
    if (!review) throw new NotFound("No review with that id.");
    if (review.hiddenAt) throw new Conflict("That review is hidden already.", "review_hidden");
    await manager
      .getRepository(OrderReviewEntity)
      .update({ id: review.id }, { hiddenAt: at, hiddenBy: admin.accountId, hiddenReason: reason });
    await recordAudit(
      manager,
      admin,
      {
        action: "review.hide",
        targetKind: "review",
        targetId: review.id,
        before: { hidden: false },
        after: { hidden: true, orderId: review.orderId, sawyerId: review.sawyerId, rating: review.rating },
        reason,
      },
      at,
    );
    await ratingChanged(manager, review.sawyerId);
    await queueHiddenMail(manager, review, reason);
    return manager.getRepository(OrderReviewEntity).findOneByOrFail({ id: review.id });
  }

  /** Tells the buyer their review was hidden, and why (into the outbox, with the hiding). */
  async function queueHiddenMail(manager: EntityManager, review: OrderReviewEntity, reason: string) {
    const [buyer, order] = await Promise.all([
      manager.getRepository(AccountEntity).findOneBy({ id: review.buyerId }),
      manager.getRepository(OrderEntity).findOneBy({ id: review.orderId }),
    ]);
    if (buyer && order) await deps.mail.queue(manager, "review_hidden", reviewHiddenMail(buyer, order.title, reason, orderLink(order.id)));
  }

  return {
    hideWith,

    /** An order's review and what the one looking may do with it (its buyer, its sawyer, an admin). */
    async state(actor: Actor, orderId: string): Promise<OrderReviewState> {
      const signedIn = requireSignedIn(actor);
      return stateOf(signedIn, await orderFor(signedIn, orderId));
    },

    /** The buyer of a completed order reviews it, once. */
    async write(actor: Actor, orderId: string, input: ReviewInput): Promise<OrderReviewState> {
      const buyer = requireRole(actor, "buyer");
      const fields = reviewInputSchema.parse(input);
      const order = await orderFor(buyer, orderId);
      if (order.buyerId !== buyer.accountId) throw new Forbidden("Only the buyer of this order can review it.");
      try {
        await dataSource.transaction(async (manager) => {
          // The order row is the lock: a second write for the same order waits here, then finds the first.
          const locked = await manager.getRepository(OrderEntity).findOne({ where: { id: orderId }, lock: { mode: "pessimistic_write" } });
          if (!locked || !isOrderStatusIn("reviewable", locked.status))
            throw new Conflict(
              `This order is ${orderStatusLabels[locked?.status ?? order.status].toLowerCase()}: only a completed order can be reviewed.`,
              "order_state",
            );
          if (await manager.getRepository(OrderReviewEntity).existsBy({ orderId }))
            throw new Conflict("You reviewed this order already; you can change your review instead.", "review_exists");
          await manager.getRepository(OrderReviewEntity).insert({
            id: randomUUID(),
            orderId,
            buyerId: order.buyerId,
            sawyerId: order.sawyerId,
            listingId: order.listingId,
            ...fields,
            createdAt: now(),
            editedAt: null,
            answer: null,
            answeredAt: null,
            hiddenAt: null,
            hiddenBy: null,
            hiddenReason: null,
          });
          await ratingChanged(manager, order.sawyerId);
          const [buyerAccount, sawyer] = await Promise.all([
            manager.getRepository(AccountEntity).findOneBy({ id: order.buyerId }),
            manager.getRepository(AccountEntity).findOneBy({ id: order.sawyerId }),
          ]);
          if (sawyer && buyerAccount)
            await deps.mail.queue(
              manager,
              "review_written",
              reviewWrittenMail(sawyer, fields, buyerAccount.displayName, order.title, orderLink(order.id)),
            );
        });
      } catch (error) {
        if (isDuplicateKey(error))
          throw new Conflict("You reviewed this order already; you can change your review instead.", "review_exists");
        throw error;
      }
      return stateOf(buyer, order);
    },

    /** The buyer changes their review, until REVIEW_EDIT_DAYS after writing it (not once it is hidden). */
    async edit(actor: Actor, orderId: string, input: ReviewInput): Promise<OrderReviewState> {
      const buyer = requireRole(actor, "buyer");
      const fields = reviewInputSchema.parse(input);
      const order = await orderFor(buyer, orderId);
      if (order.buyerId !== buyer.accountId) throw new Forbidden("Only the buyer of this order can change its review.");
      const review = await dataSource.getRepository(OrderReviewEntity).findOneBy({ orderId });
      if (!review) throw new NotFound("This order has no review yet.");
      const at = now();
      await dataSource.transaction(async (manager) => {
        const updated = await manager.getRepository(OrderReviewEntity).update(
          // Written less than REVIEW_EDIT_DAYS ago, and not hidden: decided by the row, not by what was read above.
          { id: review.id, hiddenAt: IsNull(), createdAt: MoreThan(new Date(at.getTime() - REVIEW_EDIT_DAYS * DAY_MS)) },
          { ...fields, editedAt: at },
        );
        if (updated.affected !== 1)
          throw new Conflict(
            review.hiddenAt
              ? "An admin hid this review, so it cannot be changed."
              : `A review can be changed for ${REVIEW_EDIT_DAYS} days after writing it; this one's days are over.`,
            "review_edit_closed",
          );
        await ratingChanged(manager, review.sawyerId);
      });
      return stateOf(buyer, order);
    },

    /** The sawyer answers the review of their sale, once. */
    async answer(actor: Actor, orderId: string, input: ReviewAnswerInput): Promise<OrderReviewState> {
      const sawyer = requireRole(actor, "sawyer");
      const order = await orderFor(sawyer, orderId);
      if (order.sawyerId !== sawyer.accountId) throw new Forbidden("Only the sawyer of this order can answer its review.");
      const review = await dataSource.getRepository(OrderReviewEntity).findOneBy({ orderId });
      if (!review) throw new NotFound("This order has no review yet.");
      if (review.hiddenAt) throw new Conflict("An admin hid this review, so it cannot be answered.", "review_hidden");
      await dataSource.transaction(async (manager) => {
        const updated = await manager
          .getRepository(OrderReviewEntity)
          .update({ id: review.id, answer: IsNull(), hiddenAt: IsNull() }, { answer: input.body, answeredAt: now() });
        if (updated.affected !== 1) {
          const current = await manager.getRepository(OrderReviewEntity).findOneByOrFail({ id: review.id });
          if (current.hiddenAt) throw new Conflict("An admin hid this review, so it cannot be answered.", "review_hidden");
          throw new Conflict("You answered this review already (one answer per review).", "review_answered");
        }
        const [buyer, yard] = await Promise.all([
          manager.getRepository(AccountEntity).findOneBy({ id: order.buyerId }),
          manager.getRepository(AccountEntity).findOneBy({ id: order.sawyerId }),
        ]);
        if (buyer && yard)
          await deps.mail.queue(
            manager,
            "review_answered",
            reviewAnsweredMail(buyer, yard.yardName ?? yard.displayName, order.title, input.body, orderLink(order.id)),
          );
      });
      return stateOf(sawyer, order);
    },

    /** A yard's visible reviews, newest first (keyset pages: "<created ms>.<id>"), with its rating. Anyone may read them. */
    async yardReviews(sawyerId: string, query: { cursor?: string; limit: number }): Promise<YardReviews> {
      const sawyer = await dataSource.getRepository(AccountEntity).findOneBy({ id: sawyerId, role: "sawyer" });
      if (!sawyer) throw new NotFound("No yard with that id.");
      const q = dataSource
        .getRepository(OrderReviewEntity)
        .createQueryBuilder("review")
        .where("review.sawyer_id = :sawyerId AND review.hidden_at IS NULL", { sawyerId })
        .orderBy("review.created_at", "DESC")
        .addOrderBy("review.id", "DESC")
        .take(query.limit + 1);
      if (query.cursor) {
        const [ms, id] = query.cursor.split(".") as [string, string];
        const after = new Date(Number(ms));
        q.andWhere("(review.created_at < :after OR (review.created_at = :after AND review.id < :id))", { after, id });
      }
      const rows = await q.getMany();
      const page = rows.slice(0, query.limit);
      const [reviews, totals] = await Promise.all([views(page), yardRatingTotals(dataSource, [sawyerId])]);
      const last = page.at(-1);
      return {
        yard: { id: sawyer.id, name: sawyer.yardName, town: sawyer.pickupTown },
        rating: ratingSummary(totals.get(sawyerId) ?? NO_REVIEWS),
        reviews: reviews.map(({ orderId: _o, sawyerId: _s, yardName: _y, buyerName: _b, editableUntil: _e, hidden: _h, ...rest }) => rest),
        nextCursor: rows.length > query.limit && last ? `${last.createdAt.getTime()}.${last.id}` : null,
      };
    },

    /** The desk's list: the latest 100 reviews, visible or hidden ones. */
    async listForDesk(actor: Actor, hidden?: "yes" | "no"): Promise<OrderReview[]> {
      requireRole(actor, "admin");
      const where = hidden === "yes" ? { hiddenAt: Not(IsNull()) } : hidden === "no" ? { hiddenAt: IsNull() } : {};
      return views(await dataSource.getRepository(OrderReviewEntity).find({ where, order: { createdAt: "DESC" }, take: 100 }));
    },

    /** An admin hides a review for a stated reason: audited, out of the yard's rating, and the buyer is told why. */
    async hide(actor: Actor, reviewId: string, reason: string): Promise<OrderReview> {
      const admin = requireRole(actor, "admin");
      const hidden = await dataSource.transaction((manager) => hideWith(manager, admin, reviewId, reason, now()));
      return (await views([hidden]))[0]!;
    },

    /** An admin shows a hidden review again, with a reason (audited). */
    async show(actor: Actor, reviewId: string, reason: string): Promise<OrderReview> {
      const admin = requireRole(actor, "admin");
      const at = now();
      const shown = await dataSource.transaction(async (manager) => {
        const review = await manager
          .getRepository(OrderReviewEntity)
          .findOne({ where: { id: reviewId }, lock: { mode: "pessimistic_write" } });
        if (!review) throw new NotFound("No review with that id.");
        if (!review.hiddenAt) throw new Conflict("That review is not hidden.", "review_not_hidden");
        await manager.getRepository(OrderReviewEntity).update({ id: review.id }, { hiddenAt: null, hiddenBy: null, hiddenReason: null });
        await recordAudit(
          manager,
          admin,
          {
            action: "review.show",
            targetKind: "review",
            targetId: review.id,
            before: { hidden: true, reason: review.hiddenReason },
            after: { hidden: false },
            reason,
          },
          at,
        );
        await ratingChanged(manager, review.sawyerId);
        return manager.getRepository(OrderReviewEntity).findOneByOrFail({ id: review.id });
      });
      return (await views([shown]))[0]!;
    },
  };
}

export type OrderReviewService = ReturnType<typeof createOrderReviewService>;
