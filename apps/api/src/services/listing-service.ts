import { randomUUID } from "node:crypto";
import type {
  Listing,
  ListingInput,
  ListingPhoto,
  ListingStatus,
  ListingUpdate,
  PastReview,
  RejectInput,
  ReviewDeskItem,
  SendBackInput,
} from "@grainyard/contracts";
import { listingEndpoints, listingInputSchema, pathOf } from "@grainyard/contracts";
import { NIOSH_LOAD_CONSTANT_KG, listedSlabWarnings, type FeeSettings } from "@grainyard/slab-math";
import { In, type DataSource, type EntityManager } from "typeorm";
import type { AppConfig } from "../config.ts";
import { AccountEntity, ListingEntity, ListingPhotoEntity, ListingReviewEntity, ListingSlabEntity, SlabEntity } from "../entities/index.ts";
import type { ReviewDecision } from "../entities/listing-review.ts";
import { Conflict, Forbidden, Invalid, NotFound } from "../errors.ts";
import type { OutgoingMail } from "../integrations/mail.ts";
import { listingApprovedMail, listingSentBackMail } from "../mail-templates.ts";
import { listingRejectedMail } from "../mail-templates-operator.ts";
import { recordAudit } from "./audit-log.ts";
import { changesBetween, snapshotOf, type ReviewSnapshot } from "./review-snapshot.ts";
import { requireRole, type Actor } from "./actor.ts";
import { DEFAULT_WEIGHT_MOISTURE_PCT, computeListingFigures } from "./figures.ts";
import { USUAL_FEES } from "@grainyard/slab-math";
import { HOLDING_STATUSES, toSlab } from "./yard-service.ts";
import type { DomainEventBus } from "../events.ts";
import type { MailQueue } from "./mail-outbox.ts";

/** States in which the sawyer may still change the listing. */
const EDITABLE: ListingStatus[] = ["draft", "sent_back"];
/** States from which the sawyer may withdraw the listing. */
const WITHDRAWABLE: ListingStatus[] = ["draft", "in_review", "sent_back", "live"];

export function photoView(photo: ListingPhotoEntity): ListingPhoto {
  return {
    id: photo.id,
    position: photo.position,
    altText: photo.altText,
    width: photo.width,
    height: photo.height,
    smallUrl: pathOf(listingEndpoints.listingPhotoImage, { photoId: photo.id, size: "small" }),
    mediumUrl: pathOf(listingEndpoints.listingPhotoImage, { photoId: photo.id, size: "medium" }),
    largeUrl: pathOf(listingEndpoints.listingPhotoImage, { photoId: photo.id, size: "large" }),
  };
}

export interface ListingServiceDependencies {
  dataSource: DataSource;
  /** E-mails go into the outbox inside the transaction that causes them. */
  mail: MailQueue;
  config: Pick<AppConfig, "publicUrl">;
  log: { error(object: object, message: string): void };
  now?: () => Date;
  /** Called inside the transaction whenever a listing's status or figures change (keeps the catalogue in step). */
  /** Where the service announces what changed (the catalogue and alerts listen). */
  events?: DomainEventBus;
  /** Called after the approval committed, once a listing is live (saved-search alerts); must not throw. */
  /** The marketplace's fee settings (admin-editable, from the database); the defaults when absent. */
  settings?: { fees(): FeeSettings };
}

export function createListingService(deps: ListingServiceDependencies) {
  const { dataSource } = deps;
  const now = deps.now ?? (() => new Date());
  const changed = (manager: EntityManager, listingId: string) =>
    deps.events?.emitSerial("listingChanged", { manager, listingId }) ?? Promise.resolve();

  async function slabsOf(manager: EntityManager, listingId: string): Promise<SlabEntity[]> {
    const links = await manager
      .getRepository(ListingSlabEntity)
      .find({ where: { listingId }, relations: { slab: true }, order: { position: "ASC" } });
    return links.map((l) => l.slab!).filter(Boolean);
  }

  async function view(manager: EntityManager, listing: ListingEntity): Promise<Listing> {
    const [slabs, photos, sawyer] = await Promise.all([
      slabsOf(manager, listing.id),
      manager.getRepository(ListingPhotoEntity).find({ where: { listingId: listing.id }, order: { position: "ASC" } }),
      manager.getRepository(AccountEntity).findOneBy({ id: listing.sawyerId }),
    ]);
    return {
      id: listing.id,
      sawyerId: listing.sawyerId,
      yardName: sawyer?.yardName ?? null,
      title: listing.title,
      description: listing.description,
      setKind: listing.setKind,
      priceMode: listing.priceMode,
      rateMinor: listing.rateMinor,
      currency: listing.currency,
      pickup: listing.pickup,
      freight: listing.freight,
      status: listing.status,
      offersWelcome: listing.offersWelcome,
      offerFloorMinor: listing.offerFloorMinor,
      reviewNote: listing.reviewNote,
      figures: {
        boardFeet: listing.boardFeet,
        volumeM3: listing.volumeM3,
        weightKg: listing.weightKg,
        weightLowKg: listing.weightLowKg,
        weightHighKg: listing.weightHighKg,
        // Judged per slab: each one is lifted on its own.
        heavyLift: slabs.some((s) => s.weightHighKg > NIOSH_LOAD_CONSTANT_KG),
        priceMinor: listing.priceMinor,
        platformFeeMinor: listing.platformFeeMinor,
        processingFeeMinor: listing.processingFeeMinor,
        sawyerNetMinor: listing.sawyerNetMinor,
      },
      slabs: slabs.map((s) => toSlab(s, listing.id)),
      photos: photos.map(photoView),
      submittedAt: listing.submittedAt?.toISOString() ?? null,
      publishedAt: listing.publishedAt?.toISOString() ?? null,
      updatedAt: listing.updatedAt.toISOString(),
      createdAt: listing.createdAt.toISOString(),
    };
  }

  /** Checks the chosen slabs: the sawyer's own, free, and for a set all from one log. */
  async function checkSlabs(
    manager: EntityManager,
    sawyerId: string,
    slabIds: string[],
    setKind: string,
    exceptListingId?: string,
  ): Promise<SlabEntity[]> {
    const slabs = await manager.getRepository(SlabEntity).find({ where: { id: In(slabIds) }, lock: { mode: "pessimistic_write" } });
    if (slabs.length !== slabIds.length) throw new Invalid("Some of those slabs are not in your yard.", { slabIds: "Unknown slab." });
    if (slabs.some((s) => s.sawyerId !== sawyerId)) throw new Forbidden("You can only list slabs from your own yard.");
    const links = await manager.getRepository(ListingSlabEntity).find({ where: { slabId: In(slabIds) }, relations: { listing: true } });
    const taken = links.find(
      (l) => l.listingId !== exceptListingId && l.listing && (HOLDING_STATUSES as readonly string[]).includes(l.listing.status),
    );
    if (taken) throw new Conflict("One of those slabs is already in another listing.", "slab_already_listed");
    if (setKind !== "single") {
      const logIds = new Set(slabs.map((s) => s.logId));
      if (logIds.size !== 1 || logIds.has(null))
        throw new Invalid("A set is made of slabs cut from the same log.", { slabIds: "Choose slabs from one log." });
      if (slabs.some((s) => s.sequenceInLog == null))
        throw new Invalid("Give every slab of a set its number in the log.", { slabIds: "Numbers in the log are missing." });
      const numbers = slabs.map((s) => s.sequenceInLog!).sort((a, b) => a - b);
      const consecutive = numbers.every((n, i) => i === 0 || n === numbers[i - 1]! + 1);
      if (!consecutive)
        throw new Invalid("Sequential and bookmatched slabs are neighbours in the log.", { slabIds: "Choose neighbouring slabs." });
    }
    // Keep the order the sawyer chose.
    return slabIds.map((id) => slabs.find((s) => s.id === id)!);
  }

  function figuresFor(listing: Pick<ListingEntity, "priceMode" | "rateMinor">, slabs: SlabEntity[]) {
    return computeListingFigures({
      priceMode: listing.priceMode,
      rateMinor: listing.rateMinor,
      slabs,
      fees: deps.settings?.fees() ?? USUAL_FEES,
    });
  }

  async function ownListing(manager: EntityManager, sawyerId: string, listingId: string, lock = false): Promise<ListingEntity> {
    const listing = await manager
      .getRepository(ListingEntity)
      .findOne({ where: { id: listingId }, ...(lock ? { lock: { mode: "pessimistic_write" as const } } : {}) });
    if (!listing) throw new NotFound("No listing with that id.");
    if (listing.sawyerId !== sawyerId) throw new Forbidden("That listing belongs to another yard.");
    return listing;
  }

  async function pastReview(row: ListingReviewEntity): Promise<PastReview> {
    const reviewer = await dataSource
      .getRepository(AccountEntity)
      .findOne({ where: { id: row.reviewerId }, select: { id: true, displayName: true } });
    return {
      decision: row.decision,
      reason: row.reason,
      reviewedAt: row.reviewedAt.toISOString(),
      reviewerLabel: reviewer?.displayName ?? "an admin",
    };
  }

  const DECISION_STATUS: Record<ReviewDecision, ListingStatus> = { approved: "live", sent_back: "sent_back", rejected: "rejected" };

  /**
   * One review decision, in one transaction: the listing's new state, a snapshot of what was
   * reviewed (for the next submission's diff) and the audit entry.
   */
  /** The decision, its audit entry and the e-mail to the sawyer, in one transaction. */
  async function decide(
    actor: Actor,
    listingId: string,
    decision: ReviewDecision,
    reason: string | null,
    mail: (to: string, name: string, title: string, link: string) => OutgoingMail,
  ): Promise<ListingEntity> {
    const admin = requireRole(actor, "admin");
    return dataSource.transaction(async (manager) => {
      const found = await manager.getRepository(ListingEntity).findOne({ where: { id: listingId }, lock: { mode: "pessimistic_write" } });
      if (!found) throw new NotFound("No listing with that id.");
      const verb = { approved: "approved", sent_back: "sent back", rejected: "rejected" }[decision];
      if (found.status !== "in_review") throw new Conflict(`Only a listing waiting for review can be ${verb}.`, "listing_not_in_review");
      if (decision === "approved") {
        const sawyer = await manager
          .getRepository(AccountEntity)
          .findOne({ where: { id: found.sawyerId }, select: { id: true, suspendedAt: true } });
        if (sawyer?.suspendedAt)
          throw new Conflict("The sawyer's account is suspended: restore it before approving, or reject the listing.", "sawyer_suspended");
      }
      const at = now();
      const status = DECISION_STATUS[decision];
      const before = await view(manager, found);
      await manager
        .getRepository(ListingEntity)
        .update(
          { id: listingId },
          decision === "approved" ? { status, publishedAt: at, reviewNote: null } : { status, reviewNote: reason },
        );
      await manager.getRepository(ListingReviewEntity).insert({
        id: randomUUID(),
        listingId,
        reviewerId: admin.accountId,
        decision,
        reason,
        snapshot: snapshotOf(before),
        submittedAt: found.submittedAt ?? at,
        reviewedAt: at,
      });
      await recordAudit(
        manager,
        admin,
        {
          action: `listing.${decision === "approved" ? "approve" : decision === "sent_back" ? "send_back" : "reject"}`,
          targetKind: "listing",
          targetId: listingId,
          before: { status: found.status },
          after: { status },
          reason,
        },
        at,
      );
      await changed(manager, listingId);
      const sawyer = await manager.getRepository(AccountEntity).findOneBy({ id: found.sawyerId });
      if (sawyer)
        await deps.mail.queue(
          manager,
          `listing_${decision}`,
          mail(sawyer.email, sawyer.displayName, found.title, `${deps.config.publicUrl}/yard/listings/${listingId}`),
        );
      return manager.getRepository(ListingEntity).findOneByOrFail({ id: listingId });
    });
  }

  return {
    async listOwn(actor: Actor): Promise<Listing[]> {
      const sawyer = requireRole(actor, "sawyer");
      const listings = await dataSource
        .getRepository(ListingEntity)
        .find({ where: { sawyerId: sawyer.accountId }, order: { createdAt: "DESC" } });
      return Promise.all(listings.map((l) => view(dataSource.manager, l)));
    },

    async create(actor: Actor, input: ListingInput): Promise<Listing> {
      const sawyer = requireRole(actor, "sawyer");
      const parsed = listingInputSchema.parse(input);
      return dataSource.transaction(async (manager) => {
        const slabs = await checkSlabs(manager, sawyer.accountId, parsed.slabIds, parsed.setKind);
        const id = randomUUID();
        const { slabIds, ...fields } = parsed;
        await manager.getRepository(ListingEntity).insert({
          id,
          sawyerId: sawyer.accountId,
          ...fields,
          status: "draft",
          reviewNote: null,
          submittedAt: null,
          publishedAt: null,
          ...figuresFor(parsed, slabs),
        });
        await manager.getRepository(ListingSlabEntity).insert(slabIds.map((slabId, position) => ({ listingId: id, slabId, position })));
        return view(manager, await manager.getRepository(ListingEntity).findOneByOrFail({ id }));
      });
    },

    async getOwn(actor: Actor, listingId: string): Promise<Listing> {
      const signedIn = requireRole(actor, "sawyer", "admin");
      const listing = await dataSource.getRepository(ListingEntity).findOneBy({ id: listingId });
      if (!listing) throw new NotFound("No listing with that id.");
      if (signedIn.role === "sawyer" && listing.sawyerId !== signedIn.accountId)
        throw new Forbidden("That listing belongs to another yard.");
      return view(dataSource.manager, listing);
    },

    async update(actor: Actor, listingId: string, input: ListingUpdate): Promise<Listing> {
      const sawyer = requireRole(actor, "sawyer");
      return dataSource.transaction(async (manager) => {
        const listing = await ownListing(manager, sawyer.accountId, listingId, true);
        if (!EDITABLE.includes(listing.status)) {
          throw new Conflict(
            `A listing that is "${listing.status.replace("_", " ")}" cannot be changed. Withdraw it first.`,
            "listing_not_editable",
          );
        }
        const currentSlabs = await slabsOf(manager, listingId);
        const merged = listingInputSchema.safeParse({ ...listing, slabIds: currentSlabs.map((s) => s.id), ...input });
        if (!merged.success)
          throw new Invalid(
            "Some fields need another look.",
            Object.fromEntries(merged.error.issues.map((i) => [i.path.join("."), i.message])),
          );
        const { slabIds, ...fields } = merged.data;
        const slabs = await checkSlabs(manager, sawyer.accountId, slabIds, fields.setKind, listingId);
        await manager.getRepository(ListingEntity).update({ id: listingId }, { ...fields, ...figuresFor(fields, slabs) });
        await manager.getRepository(ListingSlabEntity).delete({ listingId });
        await manager.getRepository(ListingSlabEntity).insert(slabIds.map((slabId, position) => ({ listingId, slabId, position })));
        return view(manager, await manager.getRepository(ListingEntity).findOneByOrFail({ id: listingId }));
      });
    },

    /** Draft or sent back → in review. Only a sawyer with a confirmed e-mail, with at least one photo. */
    async submit(actor: Actor, listingId: string): Promise<Listing> {
      const sawyer = requireRole(actor, "sawyer");
      if (!sawyer.emailVerified) throw new Forbidden("Confirm your e-mail address before you submit listings.", "email_unverified");
      return dataSource.transaction(async (manager) => {
        const listing = await ownListing(manager, sawyer.accountId, listingId, true);
        if (!EDITABLE.includes(listing.status))
          throw new Conflict("Only a draft or a listing that was sent back can be submitted.", "listing_not_submittable");
        const photos = await manager.getRepository(ListingPhotoEntity).countBy({ listingId });
        if (photos === 0)
          throw new Invalid("Add at least one photo before you submit.", { photos: "Add at least one photo." }, "photos_missing");
        await manager.getRepository(ListingEntity).update({ id: listingId }, { status: "in_review", submittedAt: now() });
        return view(manager, await manager.getRepository(ListingEntity).findOneByOrFail({ id: listingId }));
      });
    },

    async withdraw(actor: Actor, listingId: string): Promise<Listing> {
      const sawyer = requireRole(actor, "sawyer");
      return dataSource.transaction(async (manager) => {
        const listing = await ownListing(manager, sawyer.accountId, listingId, true);
        if (!WITHDRAWABLE.includes(listing.status))
          throw new Conflict("This listing can no longer be withdrawn.", "listing_not_withdrawable");
        await manager.getRepository(ListingEntity).update({ id: listingId }, { status: "withdrawn" });
        await changed(manager, listingId);
        return view(manager, await manager.getRepository(ListingEntity).findOneByOrFail({ id: listingId }));
      });
    },

    /** Admin: the review desk — each waiting listing with plausibility warnings and what changed since its last review. */
    async reviewDesk(actor: Actor): Promise<ReviewDeskItem[]> {
      requireRole(actor, "admin");
      const listings = await dataSource
        .getRepository(ListingEntity)
        .find({ where: { status: "in_review" }, order: { submittedAt: "ASC", id: "ASC" } });
      return Promise.all(
        listings.map(async (entity) => {
          const listing = await view(dataSource.manager, entity);
          const [sawyer, last] = await Promise.all([
            dataSource.getRepository(AccountEntity).findOneByOrFail({ id: entity.sawyerId }),
            dataSource.getRepository(ListingReviewEntity).findOne({ where: { listingId: entity.id }, order: { reviewedAt: "DESC" } }),
          ]);
          const warnings = listedSlabWarnings(listing.slabs, { moistureAssumedPct: DEFAULT_WEIGHT_MOISTURE_PCT });
          return {
            listing,
            sawyer: { id: sawyer.id, displayName: sawyer.displayName, email: sawyer.email, suspended: sawyer.suspendedAt !== null },
            warnings,
            lastReview: last ? await pastReview(last) : null,
            changes: last ? changesBetween(last.snapshot as ReviewSnapshot, snapshotOf(listing)) : [],
          };
        }),
      );
    },

    /** Admin: every decision on one listing, newest first. */
    async reviewHistory(actor: Actor, listingId: string): Promise<PastReview[]> {
      requireRole(actor, "admin");
      const rows = await dataSource.getRepository(ListingReviewEntity).find({ where: { listingId }, order: { reviewedAt: "DESC" } });
      return Promise.all(rows.map(pastReview));
    },

    async approve(actor: Actor, listingId: string): Promise<Listing> {
      const listing = await decide(actor, listingId, "approved", null, listingApprovedMail);
      await deps.events?.emit("listingLive", { listingId: listing.id });
      return view(dataSource.manager, listing);
    },

    async sendBack(actor: Actor, listingId: string, input: SendBackInput): Promise<Listing> {
      const listing = await decide(actor, listingId, "sent_back", input.reason, (to, name, title, link) =>
        listingSentBackMail(to, name, title, input.reason, link),
      );
      return view(dataSource.manager, listing);
    },

    /** Final: the listing will not be sold here; its slabs go back to the yard. */
    async reject(actor: Actor, listingId: string, input: RejectInput): Promise<Listing> {
      const listing = await decide(actor, listingId, "rejected", input.reason, (to, name, title, link) =>
        listingRejectedMail(to, name, title, input.reason, link),
      );
      return view(dataSource.manager, listing);
    },

    /** Keeps listing figures in step when a slab's figures change (called inside the slab's transaction). */
    async refreshListingsOfSlabs(manager: EntityManager, slabIds: string[]): Promise<void> {
      const links = await manager.getRepository(ListingSlabEntity).find({ where: { slabId: In(slabIds) } });
      for (const listingId of new Set(links.map((l) => l.listingId))) {
        const listing = await manager.getRepository(ListingEntity).findOneByOrFail({ id: listingId });
        if (listing.status === "withdrawn" || listing.status === "sold") continue;
        await manager.getRepository(ListingEntity).update({ id: listingId }, figuresFor(listing, await slabsOf(manager, listingId)));
        await changed(manager, listingId);
      }
    },

    ownListing,
    /** Every listing of a sawyer (after the yard's name or town changed). */
    async refreshAllOfSawyer(manager: EntityManager, sawyerId: string): Promise<void> {
      const listings = await manager.getRepository(ListingEntity).find({ where: { sawyerId, status: "live" }, select: { id: true } });
      for (const listing of listings) await changed(manager, listing.id);
    },
  };
}

export type ListingService = ReturnType<typeof createListingService>;
