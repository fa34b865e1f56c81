import { randomUUID } from "node:crypto";
import {
  OFFER_HOURS,
  OFFER_ROUNDS,
  acceptCounterInputSchema,
  canMakeOfferTransition,
  offerAmountInputSchema,
  offerDeclineInputSchema,
  offerInputSchema,
  offerSettingsSchema,
  offerTransitionFrom,
  offerTransitions,
  openOfferStatuses,
  type AcceptCounterInput,
  type Offer,
  type OfferAction,
  type OfferAmountInput,
  type OfferDeclineInput,
  type OfferInput,
  type OfferSettings,
  type OfferSettingsInput,
  type OfferStatus,
  type OfferStep,
  type Order,
} from "@grainyard/contracts";
import { feeBreakdown, formatMoney, type FeeSettings } from "@grainyard/slab-math";
import { In, LessThan, MoreThan, Not, type DataSource, type EntityManager } from "typeorm";
import type { AppConfig } from "../config.ts";
import { retryOnLockConflict } from "../db/lock-conflicts.ts";
import { AccountEntity, ListingEntity, OfferEntity, OrderEntity } from "../entities/index.ts";
import { Conflict, Forbidden, Invalid, NotFound, ServiceUnavailable } from "../errors.ts";
import {
  counterAcceptedSawyerMail,
  offerAcceptedBuyerMail,
  offerBelowFloorMail,
  offerCounteredMail,
  offerDeclinedMail,
  offerExpiredMail,
  offerReceivedMail,
  offerWithdrawnMail,
} from "../mail-templates-offers.ts";
import { requireRole, type Actor, type SignedInActor } from "./actor.ts";
import type { CheckoutService } from "./checkout-service.ts";
import type { MailQueue } from "./mail-outbox.ts";

/*
 * Offers on listings (the rules in words: contracts' offers.ts). Every status change is a
 * conditional update whose from-statuses come from `offerTransitions`, guarded by the round and
 * the expiry too, so two tabs, two instances or the expiry sweep can never move one offer twice.
 * Accepting reserves the slab with checkout's own conditional update (the listing row first, then
 * the offers, in every path: no lock cycles) and makes the order at the agreed price.
 */

const HOUR_MS = 3_600_000;
/** Listings whose settings may still change (not once they are sold or ended). */
const SETTINGS_OPEN = ["draft", "in_review", "sent_back", "live", "reserved", "suspended"];

export function createOfferService(deps: {
  dataSource: DataSource;
  checkout: CheckoutService;
  /** E-mails go into the outbox inside the transaction that causes them. */
  mail: MailQueue;
  config: Pick<AppConfig, "publicUrl">;
  /** The fees in force: an agreed price is split by slab-math like a listed one. */
  fees: () => FeeSettings;
  log: { error(object: object, message: string): void };
  now?: () => Date;
}) {
  const { dataSource } = deps;
  const now = deps.now ?? (() => new Date());
  const offersLink = (party: "buyer" | "sawyer") => `${deps.config.publicUrl}/${party === "buyer" ? "offers" : "yard/offers"}`;
  const orderLink = (orderId: string) => `${deps.config.publicUrl}/orders/${orderId}`;
  const slabLink = (listingId: string) => `${deps.config.publicUrl}/slabs/${listingId}`;
  const later = (from: Date) => new Date(from.getTime() + OFFER_HOURS * HOUR_MS);

  /** An offer past its time reads as expired even before the sweep gets to it. */
  function effectiveStatus(offer: OfferEntity, at: Date): OfferStatus {
    const waiting = (openOfferStatuses as readonly OfferStatus[]).includes(offer.status);
    return waiting && offer.expiresAt && offer.expiresAt.getTime() <= at.getTime() ? "expired" : offer.status;
  }

  function actionsFor(offer: OfferEntity, status: OfferStatus, viewer: "buyer" | "sawyer"): OfferAction[] {
    const can = (name: keyof typeof offerTransitions) => canMakeOfferTransition(name, status, viewer);
    if (viewer === "sawyer") return [...(can("accept") ? (["accept", "counter", "decline"] as const) : [])];
    const actions: OfferAction[] = [];
    if (can("acceptCounter")) actions.push("accept_counter");
    if (can("offerAgain") && offer.round < OFFER_ROUNDS) actions.push("offer_again");
    if (can("withdraw")) actions.push("withdraw");
    return actions;
  }

  async function views(rows: OfferEntity[], viewer: SignedInActor): Promise<Offer[]> {
    if (rows.length === 0) return [];
    const [listings, accounts] = await Promise.all([
      dataSource.getRepository(ListingEntity).find({
        where: { id: In([...new Set(rows.map((r) => r.listingId))]) },
        select: { id: true, title: true, priceMinor: true },
      }),
      dataSource.getRepository(AccountEntity).find({
        where: { id: In([...new Set(rows.flatMap((r) => [r.buyerId, r.sawyerId]))]) },
        select: { id: true, displayName: true, yardName: true },
      }),
    ]);
    const listingOf = new Map(listings.map((l) => [l.id, l]));
    const accountOf = new Map(accounts.map((a) => [a.id, a]));
    const at = now();
    return rows.map((offer) => {
      const status = effectiveStatus(offer, at);
      const viewerIs = viewer.accountId === offer.sawyerId ? "sawyer" : "buyer";
      const sawyer = accountOf.get(offer.sawyerId);
      return {
        id: offer.id,
        listingId: offer.listingId,
        listingTitle: listingOf.get(offer.listingId)?.title ?? "",
        listingPriceMinor: listingOf.get(offer.listingId)?.priceMinor ?? 0,
        currency: offer.currency,
        status,
        declineReason: offer.declineReason,
        amountMinor: offer.amountMinor,
        counterMinor: offer.counterMinor,
        agreedMinor: offer.agreedMinor,
        round: offer.round,
        roundsLeft: Math.max(0, OFFER_ROUNDS - offer.round),
        steps: offer.steps,
        handover: offer.handover,
        expiresAt: status === offer.status ? (offer.expiresAt?.toISOString() ?? null) : null,
        orderId: offer.orderId,
        buyerName: accountOf.get(offer.buyerId)?.displayName ?? "A buyer",
        yardName: sawyer?.yardName ?? sawyer?.displayName ?? null,
        viewerIs,
        actions: actionsFor(offer, status, viewerIs),
        createdAt: offer.createdAt.toISOString(),
        updatedAt: offer.updatedAt.toISOString(),
      };
    });
  }

  const viewOne = async (offerId: string, viewer: SignedInActor) =>
    (await views([await dataSource.getRepository(OfferEntity).findOneByOrFail({ id: offerId })], viewer))[0]!;

  /** The offer, for its buyer or the listing's sawyer; anyone else is refused. */
  async function offerFor(actor: SignedInActor, offerId: string, party?: "buyer" | "sawyer"): Promise<OfferEntity> {
    const offer = await dataSource.getRepository(OfferEntity).findOneBy({ id: offerId });
    if (!offer) throw new NotFound("No offer with that id.");
    const mine = party === "buyer" ? offer.buyerId : party === "sawyer" ? offer.sawyerId : null;
    if (party ? actor.accountId !== mine : actor.accountId !== offer.buyerId && actor.accountId !== offer.sawyerId)
      throw new Forbidden("That offer is not yours.");
    return offer;
  }

  const stale = (offer: OfferEntity, what: string) =>
    new Conflict(
      effectiveStatus(offer, now()) === "expired"
        ? "This offer waited too long for an answer and has expired."
        : `This offer cannot be ${what} now: it was answered already.`,
      "offer_state",
    );

  async function people(manager: EntityManager, offer: Pick<OfferEntity, "buyerId" | "sawyerId">) {
    const [buyer, sawyer] = await Promise.all([
      manager.getRepository(AccountEntity).findOneByOrFail({ id: offer.buyerId }),
      manager.getRepository(AccountEntity).findOneByOrFail({ id: offer.sawyerId }),
    ]);
    return { buyer, sawyer, yardName: sawyer.yardName ?? sawyer.displayName };
  }

  /** Declines every other offer on the listing still waiting on someone, and tells each buyer (inside the caller's transaction). */
  async function closeOthers(
    manager: EntityManager,
    listingId: string,
    keepOfferId: string | null,
    reason: "other_offer_accepted" | "slab_sold",
  ) {
    const open = await manager.getRepository(OfferEntity).find({
      where: { listingId, status: In(offerTransitionFrom("closeForOthers")), ...(keepOfferId ? { id: Not(keepOfferId) } : {}) },
    });
    if (open.length === 0) return;
    const listing = await manager.getRepository(ListingEntity).findOneByOrFail({ id: listingId });
    for (const offer of open) {
      const updated = await manager
        .getRepository(OfferEntity)
        .update(
          { id: offer.id, status: In(offerTransitionFrom("closeForOthers")) },
          { status: offerTransitions.closeForOthers.to, declineReason: reason, expiresAt: null },
        );
      if (updated.affected !== 1) continue;
      const buyer = await manager.getRepository(AccountEntity).findOneBy({ id: offer.buyerId });
      if (buyer)
        await deps.mail.queue(
          manager,
          "offer_declined",
          offerDeclinedMail(buyer, reason, "", { title: listing.title, currency: offer.currency, link: offersLink("buyer") }),
        );
    }
  }

  /**
   * Accepting (by the sawyer, or the buyer taking a counter): the slab reserved for the buyer at
   * the agreed price through checkout's own conditional update, the offer accepted (still open,
   * same round, not expired), every other open offer declined — one transaction — then the hosted
   * checkout opened. If the provider cannot be reached the order is dropped and the offer waits again.
   */
  async function acceptAt(
    offer: OfferEntity,
    transition: "accept" | "acceptCounter",
    agreedMinor: number,
    handover: { handover: "pickup" | "freight"; deliveryAddress: string | null },
  ): Promise<OrderEntity> {
    const before = { status: offer.status, expiresAt: offer.expiresAt, handover: offer.handover, deliveryAddress: offer.deliveryAddress };
    const order = await dataSource.transaction(async (manager) => {
      let placed: OrderEntity;
      try {
        placed = await deps.checkout.placeOrder(manager, offer.buyerId, offer.listingId, handover, {
          priceMinor: agreedMinor,
          ...feeBreakdown(agreedMinor, deps.fees()),
        });
      } catch (error) {
        if (error instanceof Conflict && error.code === "listing_not_available")
          throw new Conflict(
            "This slab is reserved or sold now (a buyer or another offer got there first), so nothing can be accepted.",
            "listing_not_available",
          );
        throw error;
      }
      const accepted = await manager.getRepository(OfferEntity).update(
        { id: offer.id, status: In(offerTransitionFrom(transition)), round: offer.round, expiresAt: MoreThan(now()) },
        {
          status: offerTransitions[transition].to,
          agreedMinor,
          orderId: placed.id,
          expiresAt: null,
          handover: handover.handover,
          deliveryAddress: handover.deliveryAddress,
        },
      );
      if (accepted.affected !== 1) throw stale(offer, "accepted");
      await closeOthers(manager, offer.listingId, offer.id, "other_offer_accepted");
      const { buyer, sawyer, yardName } = await people(manager, offer);
      const facts = { title: placed.title, currency: placed.currency, link: orderLink(placed.id) };
      await deps.mail.queue(manager, "offer_accepted", offerAcceptedBuyerMail(buyer, yardName, agreedMinor, placed.reservedUntil, facts));
      if (transition === "acceptCounter")
        await deps.mail.queue(manager, "offer_accepted", counterAcceptedSawyerMail(sawyer, buyer.displayName, agreedMinor, facts));
      return placed;
    });
    try {
      await deps.checkout.openPaymentPage(order);
    } catch (error) {
      if (error instanceof ServiceUnavailable)
        await dataSource
          .getRepository(OfferEntity)
          .update({ id: offer.id, orderId: order.id }, { ...before, agreedMinor: null, orderId: null });
      throw error;
    }
    return dataSource.getRepository(OrderEntity).findOneByOrFail({ id: order.id });
  }

  return {
    /** The sawyer's offer settings of their own listing. */
    async settings(actor: Actor, listingId: string): Promise<OfferSettings> {
      const sawyer = requireRole(actor, "sawyer");
      const listing = await dataSource.getRepository(ListingEntity).findOneBy({ id: listingId });
      if (!listing) throw new NotFound("No listing with that id.");
      if (listing.sawyerId !== sawyer.accountId) throw new Forbidden("That listing is not yours.");
      return { offersWelcome: listing.offersWelcome, floorMinor: listing.offerFloorMinor };
    },

    /** Offers welcome or not, and the floor (below the price), on the sawyer's own listing; no new review needed. */
    async setSettings(actor: Actor, listingId: string, input: OfferSettingsInput): Promise<OfferSettings> {
      const sawyer = requireRole(actor, "sawyer");
      const settings = offerSettingsSchema.parse(input);
      return dataSource.transaction(async (manager) => {
        const listing = await manager
          .getRepository(ListingEntity)
          .findOne({ where: { id: listingId }, lock: { mode: "pessimistic_write" } });
        if (!listing) throw new NotFound("No listing with that id.");
        if (listing.sawyerId !== sawyer.accountId) throw new Forbidden("That listing is not yours.");
        if (!SETTINGS_OPEN.includes(listing.status))
          throw new Conflict("This listing has ended, so its offer settings cannot change.", "listing_not_editable");
        if (settings.floorMinor !== null && settings.floorMinor >= listing.priceMinor)
          throw new Invalid("Set the floor below the price.", {
            floorMinor: `Set the floor below the price (${formatMoney(listing.priceMinor, listing.currency)}), or leave it empty.`,
          });
        await manager
          .getRepository(ListingEntity)
          .update({ id: listingId }, { offersWelcome: settings.offersWelcome, offerFloorMinor: settings.floorMinor });
        return settings;
      });
    },

    /**
     * A buyer offers on a live listing that welcomes offers: below its price, one waiting offer per
     * buyer and listing. Below the sawyer's floor it is declined at once, politely, and the answer
     * says only that (never the floor).
     */
    async make(actor: Actor, listingId: string, input: OfferInput): Promise<Offer> {
      const buyer = requireRole(actor, "buyer");
      const fields = offerInputSchema.parse(input);
      const id = randomUUID();
      await dataSource.transaction(async (manager) => {
        // The listing row is the lock: one buyer's two tabs, and an accept on the same listing, take turns.
        const listing = await manager
          .getRepository(ListingEntity)
          .findOne({ where: { id: listingId }, lock: { mode: "pessimistic_write" } });
        if (!listing || !["live", "reserved", "sold"].includes(listing.status)) throw new NotFound("That slab is not for sale here.");
        if (listing.sawyerId === buyer.accountId) throw new Forbidden("You cannot make an offer on your own listing.");
        if (listing.status !== "live")
          throw new Conflict("This slab is reserved or sold, so it takes no offers now.", "listing_not_available");
        if (!listing.offersWelcome) throw new Conflict("The sawyer does not take offers on this slab.", "offers_closed");
        if (fields.handover === "pickup" && !listing.pickup)
          throw new Invalid("This listing is not offered for pickup.", { handover: "Choose freight." });
        if (fields.handover === "freight" && !listing.freight)
          throw new Invalid("This listing is not offered for freight.", { handover: "Choose pickup." });
        if (fields.amountMinor >= listing.priceMinor)
          throw new Invalid("Offer less than the price.", {
            amountMinor: `Offer less than the price of ${formatMoney(listing.priceMinor, listing.currency)}, or buy it at that price.`,
          });
        const waiting = await manager.getRepository(OfferEntity).existsBy({
          listingId,
          buyerId: buyer.accountId,
          status: In(openOfferStatuses),
          expiresAt: MoreThan(now()),
        });
        if (waiting) throw new Conflict("You have an offer on this slab waiting for an answer already.", "offer_exists");
        const at = now();
        const belowFloor = listing.offerFloorMinor !== null && fields.amountMinor < listing.offerFloorMinor;
        await manager.getRepository(OfferEntity).insert({
          id,
          listingId,
          buyerId: buyer.accountId,
          sawyerId: listing.sawyerId,
          status: belowFloor ? "declined" : "open",
          declineReason: belowFloor ? "below_floor" : null,
          currency: listing.currency,
          amountMinor: fields.amountMinor,
          counterMinor: null,
          agreedMinor: null,
          round: 1,
          steps: [{ kind: "offer", amountMinor: fields.amountMinor, message: fields.message, at: at.toISOString() }],
          handover: fields.handover,
          deliveryAddress: fields.handover === "freight" ? (fields.deliveryAddress ?? null) : null,
          expiresAt: belowFloor ? null : later(at),
          orderId: null,
        });
        const { buyer: buyerAccount, sawyer } = await people(manager, { buyerId: buyer.accountId, sawyerId: listing.sawyerId });
        if (belowFloor)
          await deps.mail.queue(
            manager,
            "offer_declined",
            offerBelowFloorMail(buyerAccount, fields.amountMinor, {
              title: listing.title,
              currency: listing.currency,
              link: slabLink(listingId),
            }),
          );
        else
          await deps.mail.queue(
            manager,
            "offer_received",
            offerReceivedMail(sawyer, buyerAccount.displayName, fields.amountMinor, fields.message, 1, {
              title: listing.title,
              currency: listing.currency,
              link: offersLink("sawyer"),
            }),
          );
      });
      return viewOne(id, buyer);
    },

    /** The buyer's own offers, or the offers on the sawyer's listings, newest first (latest 100). */
    async list(actor: Actor, query: { listingId?: string; state?: "open" | "all" }): Promise<Offer[]> {
      const signedIn = requireRole(actor, "buyer", "sawyer");
      const mine = signedIn.role === "buyer" ? { buyerId: signedIn.accountId } : { sawyerId: signedIn.accountId };
      const rows = await dataSource.getRepository(OfferEntity).find({
        where: {
          ...mine,
          ...(query.listingId ? { listingId: query.listingId } : {}),
          ...(query.state === "open" ? { status: In(openOfferStatuses), expiresAt: MoreThan(now()) } : {}),
        },
        order: { updatedAt: "DESC" },
        take: 100,
      });
      return views(rows, signedIn);
    },

    async get(actor: Actor, offerId: string): Promise<Offer> {
      const signedIn = requireRole(actor, "buyer", "sawyer");
      return (await views([await offerFor(signedIn, offerId)], signedIn))[0]!;
    },

    /** The sawyer takes the buyer's amount: the slab is reserved for them at it and the hosted checkout opened for them. */
    async accept(actor: Actor, offerId: string): Promise<{ offer: Offer; order: Order; checkoutUrl: null }> {
      const sawyer = requireRole(actor, "sawyer");
      const offer = await offerFor(sawyer, offerId, "sawyer");
      if (!canMakeOfferTransition("accept", effectiveStatus(offer, now()), "sawyer")) throw stale(offer, "accepted");
      const order = await acceptAt(offer, "accept", offer.amountMinor, {
        handover: offer.handover,
        deliveryAddress: offer.deliveryAddress,
      });
      // The payment page is the buyer's: the sawyer sees the order, not its link.
      return { offer: await viewOne(offerId, sawyer), order: await deps.checkout.view(order, sawyer), checkoutUrl: null };
    },

    /** The sawyer declines, with an optional message for the buyer. */
    async decline(actor: Actor, offerId: string, input: OfferDeclineInput): Promise<Offer> {
      const sawyer = requireRole(actor, "sawyer");
      const { message } = offerDeclineInputSchema.parse(input);
      const offer = await offerFor(sawyer, offerId, "sawyer");
      await dataSource.transaction(async (manager) => {
        const at = now();
        const step: OfferStep = { kind: "decline", amountMinor: null, message, at: at.toISOString() };
        const updated = await manager
          .getRepository(OfferEntity)
          .update(
            { id: offer.id, status: In(offerTransitionFrom("decline")), round: offer.round, expiresAt: MoreThan(at) },
            { status: offerTransitions.decline.to, declineReason: "sawyer", expiresAt: null, steps: [...offer.steps, step] },
          );
        if (updated.affected !== 1) throw stale(offer, "declined");
        const { buyer } = await people(manager, offer);
        const listing = await manager.getRepository(ListingEntity).findOneByOrFail({ id: offer.listingId });
        await deps.mail.queue(
          manager,
          "offer_declined",
          offerDeclinedMail(buyer, "sawyer", message, { title: listing.title, currency: offer.currency, link: offersLink("buyer") }),
        );
      });
      return viewOne(offerId, sawyer);
    },

    /** The sawyer names their own amount (above the buyer's, at most the price), once per round. */
    async counter(actor: Actor, offerId: string, input: OfferAmountInput): Promise<Offer> {
      const sawyer = requireRole(actor, "sawyer");
      const fields = offerAmountInputSchema.parse(input);
      const offer = await offerFor(sawyer, offerId, "sawyer");
      const listing = await dataSource.getRepository(ListingEntity).findOneByOrFail({ id: offer.listingId });
      if (fields.amountMinor <= offer.amountMinor)
        throw new Invalid("Counter above the buyer's offer.", {
          amountMinor: `Name more than the buyer's ${formatMoney(offer.amountMinor, offer.currency)}, or accept it.`,
        });
      if (fields.amountMinor > listing.priceMinor)
        throw new Invalid("Counter at most the price.", {
          amountMinor: `Name at most the listed price of ${formatMoney(listing.priceMinor, listing.currency)}.`,
        });
      await dataSource.transaction(async (manager) => {
        const at = now();
        const step: OfferStep = { kind: "counter", amountMinor: fields.amountMinor, message: fields.message, at: at.toISOString() };
        const updated = await manager.getRepository(OfferEntity).update(
          { id: offer.id, status: In(offerTransitionFrom("counter")), round: offer.round, expiresAt: MoreThan(at) },
          {
            status: offerTransitions.counter.to,
            counterMinor: fields.amountMinor,
            expiresAt: later(at),
            steps: [...offer.steps, step],
          },
        );
        if (updated.affected !== 1) throw stale(offer, "countered");
        const { buyer, yardName } = await people(manager, offer);
        await deps.mail.queue(
          manager,
          "offer_countered",
          offerCounteredMail(buyer, yardName, fields.amountMinor, fields.message, {
            title: listing.title,
            currency: offer.currency,
            link: offersLink("buyer"),
          }),
        );
      });
      return viewOne(offerId, sawyer);
    },

    /** The buyer takes the counter: reserved at that price, and the buyer goes on to the hosted checkout. */
    async acceptCounter(
      actor: Actor,
      offerId: string,
      input: AcceptCounterInput,
    ): Promise<{ offer: Offer; order: Order; checkoutUrl: string }> {
      const buyer = requireRole(actor, "buyer");
      const fields = acceptCounterInputSchema.parse(input);
      const offer = await offerFor(buyer, offerId, "buyer");
      if (!canMakeOfferTransition("acceptCounter", effectiveStatus(offer, now()), "buyer") || offer.counterMinor === null)
        throw stale(offer, "accepted");
      const handover = fields.handover ?? offer.handover;
      const deliveryAddress = handover === "freight" ? (fields.handover ? (fields.deliveryAddress ?? null) : offer.deliveryAddress) : null;
      const order = await acceptAt(offer, "acceptCounter", offer.counterMinor, { handover, deliveryAddress });
      return { offer: await viewOne(offerId, buyer), order: await deps.checkout.view(order, buyer), checkoutUrl: order.checkoutUrl! };
    },

    /** The buyer answers a counter with a new amount (more than before, less than the counter): the next round. */
    async offerAgain(actor: Actor, offerId: string, input: OfferAmountInput): Promise<Offer> {
      const buyer = requireRole(actor, "buyer");
      const fields = offerAmountInputSchema.parse(input);
      const offer = await offerFor(buyer, offerId, "buyer");
      if (!canMakeOfferTransition("offerAgain", effectiveStatus(offer, now()), "buyer")) throw stale(offer, "answered");
      if (offer.round >= OFFER_ROUNDS)
        throw new Conflict(`An offer has at most ${OFFER_ROUNDS} rounds: accept the counter or withdraw.`, "offer_state");
      if (fields.amountMinor <= offer.amountMinor || (offer.counterMinor !== null && fields.amountMinor >= offer.counterMinor))
        throw new Invalid("Offer between your last offer and the counter.", {
          amountMinor: `Offer more than your ${formatMoney(offer.amountMinor, offer.currency)} and less than the counter of ${formatMoney(offer.counterMinor ?? 0, offer.currency)} (or accept the counter).`,
        });
      await dataSource.transaction(async (manager) => {
        const listing = await manager.getRepository(ListingEntity).findOneByOrFail({ id: offer.listingId });
        const at = now();
        const belowFloor = listing.offerFloorMinor !== null && fields.amountMinor < listing.offerFloorMinor;
        const step: OfferStep = { kind: "offer", amountMinor: fields.amountMinor, message: fields.message, at: at.toISOString() };
        const updated = await manager.getRepository(OfferEntity).update(
          { id: offer.id, status: In(offerTransitionFrom("offerAgain")), round: offer.round, expiresAt: MoreThan(at) },
          {
            ...(belowFloor
              ? { status: "declined" as const, declineReason: "below_floor" as const, expiresAt: null }
              : { status: offerTransitions.offerAgain.to, expiresAt: later(at) }),
            round: offer.round + 1,
            amountMinor: fields.amountMinor,
            counterMinor: null,
            steps: [...offer.steps, step],
          },
        );
        if (updated.affected !== 1) throw stale(offer, "answered");
        const { buyer: buyerAccount, sawyer } = await people(manager, offer);
        const facts = { title: listing.title, currency: offer.currency };
        if (belowFloor)
          await deps.mail.queue(
            manager,
            "offer_declined",
            offerBelowFloorMail(buyerAccount, fields.amountMinor, { ...facts, link: slabLink(listing.id) }),
          );
        else
          await deps.mail.queue(
            manager,
            "offer_received",
            offerReceivedMail(sawyer, buyerAccount.displayName, fields.amountMinor, fields.message, offer.round + 1, {
              ...facts,
              link: offersLink("sawyer"),
            }),
          );
      });
      return viewOne(offerId, buyer);
    },

    /** The buyer calls off an offer still waiting on someone. */
    async withdraw(actor: Actor, offerId: string): Promise<Offer> {
      const buyer = requireRole(actor, "buyer");
      const offer = await offerFor(buyer, offerId, "buyer");
      await dataSource.transaction(async (manager) => {
        const updated = await manager
          .getRepository(OfferEntity)
          .update(
            { id: offer.id, status: In(offerTransitionFrom("withdraw")), expiresAt: MoreThan(now()) },
            { status: offerTransitions.withdraw.to, expiresAt: null },
          );
        if (updated.affected !== 1) throw stale(offer, "withdrawn");
        const { buyer: buyerAccount, sawyer } = await people(manager, offer);
        const listing = await manager.getRepository(ListingEntity).findOneByOrFail({ id: offer.listingId });
        await deps.mail.queue(
          manager,
          "offer_withdrawn",
          offerWithdrawnMail(sawyer, buyerAccount.displayName, {
            title: listing.title,
            currency: offer.currency,
            link: offersLink("sawyer"),
          }),
        );
      });
      return viewOne(offerId, buyer);
    },

    /**
     * Offers and counters past their OFFER_HOURS become expired, and both sides hear it. Safe on
     * several API instances at once: each row's step is a conditional update, so one instance wins it.
     */
    async expireDue(): Promise<number> {
      const due = await dataSource
        .getRepository(OfferEntity)
        .find({ where: { status: In(offerTransitionFrom("expire")), expiresAt: LessThan(now()) }, take: 200 });
      let expired = 0;
      for (const offer of due) {
        const done = await retryOnLockConflict(() =>
          dataSource.transaction(async (manager) => {
            const updated = await manager
              .getRepository(OfferEntity)
              .update(
                { id: offer.id, status: In(offerTransitionFrom("expire")), expiresAt: LessThan(now()) },
                { status: offerTransitions.expire.to, expiresAt: null },
              );
            if (updated.affected !== 1) return false;
            const { buyer, sawyer } = await people(manager, offer);
            const listing = await manager.getRepository(ListingEntity).findOneByOrFail({ id: offer.listingId });
            const facts = { title: listing.title, currency: offer.currency };
            const waitedOnSawyer = offer.status === "open";
            await deps.mail.queue(
              manager,
              "offer_expired",
              offerExpiredMail(buyer, waitedOnSawyer ? "them" : "you", { ...facts, link: offersLink("buyer") }),
            );
            await deps.mail.queue(
              manager,
              "offer_expired",
              offerExpiredMail(sawyer, waitedOnSawyer ? "you" : "them", { ...facts, link: offersLink("sawyer") }),
            );
            return true;
          }),
        );
        if (done) expired += 1;
      }
      return expired;
    },

    /** A listing changed (inside its transaction): once it is sold, the offers still waiting on it are declined. */
    async onListingChanged(manager: EntityManager, listingId: string): Promise<void> {
      const listing = await manager.getRepository(ListingEntity).findOne({ where: { id: listingId }, select: { id: true, status: true } });
      if (listing?.status === "sold") await closeOthers(manager, listingId, null, "slab_sold");
    },
  };
}

export type OfferService = ReturnType<typeof createOfferService>;
