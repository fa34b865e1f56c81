import { randomUUID } from "node:crypto";
import type { Report, ReportInput, ReportReceipt, ReportResolveInput, reportStatuses } from "@grainyard/contracts";
import { In, type DataSource, type EntityManager } from "typeorm";
import type { AppConfig } from "../config.ts";
import {
  AccountEntity,
  ContentReportEntity,
  ListingEntity,
  MessageEntity,
  MessageThreadEntity,
  OrderReviewEntity,
} from "../entities/index.ts";
import { Conflict, Invalid, NotFound } from "../errors.ts";
import { accountSuspendedMail, listingTakenDownMail } from "../mail-templates-operator.ts";
import type { AccountModeration } from "./account-moderation.ts";
import { requireRole, requireSignedIn, type Actor } from "./actor.ts";
import { recordAudit } from "./audit-log.ts";
import type { DomainEventBus } from "../events.ts";
import type { OrderReviewService } from "./order-review-service.ts";
import type { MailQueue } from "./mail-outbox.ts";

/** Listings an admin may take down after a report (a reserved or sold slab is mid-sale: handled as an order dispute). */
const TAKE_DOWN_FROM = ["draft", "in_review", "sent_back", "live", "suspended"] as const;

export function createReportService(deps: {
  dataSource: DataSource;
  /** E-mails go into the outbox inside the transaction that causes them. */
  mail: MailQueue;
  config: Pick<AppConfig, "publicUrl">;
  moderation: AccountModeration;
  /** Hiding a reported review (inside the resolution's transaction), and telling its buyer. */
  reviews: Pick<OrderReviewService, "hideWith">;
  now?: () => Date;
  /** Where the service announces what changed (the catalogue and alerts listen). */
  events?: DomainEventBus;
}) {
  const { dataSource } = deps;
  const now = deps.now ?? (() => new Date());
  const changed = (manager: EntityManager, listingId: string) =>
    deps.events?.emitSerial("listingChanged", { manager, listingId }) ?? Promise.resolve();

  async function views(rows: ContentReportEntity[]): Promise<Report[]> {
    const accountIds = [...new Set(rows.flatMap((r) => [r.reporterId, r.reportedAccountId]))];
    const accounts = accountIds.length ? await dataSource.getRepository(AccountEntity).findBy({ id: In(accountIds) }) : [];
    const byId = new Map(accounts.map((a) => [a.id, a]));
    const listingIds = rows.filter((r) => r.targetKind === "listing").map((r) => r.targetId);
    const messageIds = rows.filter((r) => r.targetKind === "message").map((r) => r.targetId);
    const reviewIds = rows.filter((r) => r.targetKind === "review").map((r) => r.targetId);
    const listings = listingIds.length
      ? await dataSource
          .getRepository(ListingEntity)
          .find({ where: { id: In(listingIds) }, select: { id: true, title: true, status: true } })
      : [];
    const messages = messageIds.length ? await dataSource.getRepository(MessageEntity).findBy({ id: In(messageIds) }) : [];
    const reviews = reviewIds.length ? await dataSource.getRepository(OrderReviewEntity).findBy({ id: In(reviewIds) }) : [];
    /** A review's words for the admin: the rating, the two answers with their comments, and the text. */
    const reviewExcerpt = (review: OrderReviewEntity) =>
      [
        `${review.rating} of 5`,
        `matched the listing: ${review.matchedListing ? "yes" : "no"}${review.matchedListingComment ? ` (${review.matchedListingComment})` : ""}`,
        `hand-over: ${review.handoverWentWell ? "went well" : "did not go well"}${review.handoverComment ? ` (${review.handoverComment})` : ""}`,
        review.body,
      ]
        .filter(Boolean)
        .join(" · ")
        .slice(0, 400);
    return rows.map((r) => {
      const reporter = byId.get(r.reporterId);
      const reported = byId.get(r.reportedAccountId);
      const review = r.targetKind === "review" ? reviews.find((v) => v.id === r.targetId) : undefined;
      const excerpt =
        r.targetKind === "listing"
          ? (listings.find((l) => l.id === r.targetId)?.title ?? "(listing gone)")
          : r.targetKind === "message"
            ? (messages.find((m) => String(m.id) === r.targetId)?.body.slice(0, 400) ?? "(message gone)")
            : review
              ? reviewExcerpt(review)
              : "(review gone)";
      return {
        id: r.id,
        targetKind: r.targetKind,
        targetId: r.targetId,
        listingId: r.listingId,
        excerpt,
        reason: r.reason,
        status: r.status,
        reporter: { id: r.reporterId, displayName: reporter?.displayName ?? "(gone)" },
        reported: {
          id: r.reportedAccountId,
          displayName: reported?.displayName ?? "(gone)",
          email: reported?.email ?? "",
          suspended: Boolean(reported?.suspendedAt),
        },
        resolutionNote: r.resolutionNote,
        resolvedAt: r.resolvedAt?.toISOString() ?? null,
        createdAt: r.createdAt.toISOString(),
      };
    });
  }

  return {
    /** Anyone signed in reports a listing they can see, or a message in a thread they are part of. */
    async create(actor: Actor, input: ReportInput): Promise<ReportReceipt> {
      const signedIn = requireSignedIn(actor);
      let listingId: string | null;
      let reportedAccountId: string;
      if (input.targetKind === "listing") {
        const listing = await dataSource.getRepository(ListingEntity).findOneBy({ id: input.targetId });
        const visible = listing && (["live", "reserved", "sold"].includes(listing.status) || signedIn.role === "admin");
        if (!listing || !visible) throw new NotFound("No listing with that id.");
        listingId = listing.id;
        reportedAccountId = listing.sawyerId;
      } else if (input.targetKind === "review") {
        // Visible reviews are public; a hidden one only to its two parties and the admins.
        const review = await dataSource.getRepository(OrderReviewEntity).findOneBy({ id: input.targetId });
        const visible =
          review && (!review.hiddenAt || signedIn.role === "admin" || [review.buyerId, review.sawyerId].includes(signedIn.accountId));
        if (!review || !visible) throw new NotFound("No review with that id.");
        listingId = review.listingId;
        reportedAccountId = review.buyerId;
      } else {
        if (!/^\d{1,20}$/.test(input.targetId)) throw new NotFound("No message with that id.");
        const message = await dataSource.getRepository(MessageEntity).findOneBy({ id: input.targetId });
        const thread = message ? await dataSource.getRepository(MessageThreadEntity).findOneBy({ id: message.threadId }) : null;
        if (!message || !thread || ![thread.buyerId, thread.sawyerId].includes(signedIn.accountId))
          throw new NotFound("No message with that id.");
        listingId = thread.listingId;
        reportedAccountId = message.authorId;
      }
      if (reportedAccountId === signedIn.accountId) throw new Invalid("You cannot report your own words.", { targetId: "That is yours." });
      const already = await dataSource
        .getRepository(ContentReportEntity)
        .findOneBy({ reporterId: signedIn.accountId, targetKind: input.targetKind, targetId: input.targetId, status: "open" });
      if (already) throw new Conflict("You reported this already; an admin will look at it.", "already_reported");
      const id = randomUUID();
      await dataSource.getRepository(ContentReportEntity).insert({
        id,
        reporterId: signedIn.accountId,
        targetKind: input.targetKind,
        targetId: input.targetId,
        listingId,
        reportedAccountId,
        reason: input.reason,
        status: "open",
        resolvedBy: null,
        resolutionNote: null,
        resolvedAt: null,
        createdAt: now(),
      });
      // The reporter gets a receipt only: who was reported (and their e-mail) is for the admins.
      return { id, targetKind: input.targetKind, targetId: input.targetId, status: "open" };
    },

    /** Admin queue: open reports oldest first, or resolved ones newest first. */
    async list(actor: Actor, status: (typeof reportStatuses)[number] = "open"): Promise<Report[]> {
      requireRole(actor, "admin");
      const rows = await dataSource
        .getRepository(ContentReportEntity)
        .find({ where: { status }, order: { createdAt: status === "open" ? "ASC" : "DESC" }, take: 200 });
      return views(rows);
    },

    async openCount(): Promise<number> {
      return dataSource.getRepository(ContentReportEntity).countBy({ status: "open" });
    },

    /**
     * Resolves one report: dismiss it, take the listing down, or suspend whose content it is. The
     * action, the report's new state and the audit entry commit together. Other open reports on
     * the same thing are closed with it.
     */
    async resolve(actor: Actor, reportId: string, input: ReportResolveInput): Promise<Report> {
      const admin = requireRole(actor, "admin");
      const at = now();
      await dataSource.transaction(async (manager) => {
        const report = await manager
          .getRepository(ContentReportEntity)
          .findOne({ where: { id: reportId }, lock: { mode: "pessimistic_write" } });
        if (!report) throw new NotFound("No report with that id.");
        if (report.status !== "open") throw new Conflict("That report is resolved already.", "report_resolved");
        let status: ContentReportEntity["status"] = "dismissed";
        if (input.resolution === "take_down") {
          if (!report.listingId || report.targetKind === "review")
            throw new Invalid("This report has no listing to take down.", { resolution: "Nothing to take down." });
          const listing = await manager
            .getRepository(ListingEntity)
            .findOne({ where: { id: report.listingId }, lock: { mode: "pessimistic_write" } });
          if (!listing) throw new NotFound("The listing is gone.");
          if (!(TAKE_DOWN_FROM as readonly string[]).includes(listing.status))
            throw new Conflict(
              `A listing that is "${listing.status.replace("_", " ")}" cannot be taken down here.`,
              "listing_not_removable",
            );
          await manager.getRepository(ListingEntity).update({ id: listing.id }, { status: "taken_down", reviewNote: input.note });
          await changed(manager, listing.id);
          await recordAudit(
            manager,
            admin,
            {
              action: "listing.take_down",
              targetKind: "listing",
              targetId: listing.id,
              before: { status: listing.status },
              after: { status: "taken_down" },
              reason: input.note,
            },
            at,
          );
          const sawyer = await manager.getRepository(AccountEntity).findOneBy({ id: listing.sawyerId });
          if (sawyer)
            await deps.mail.queue(
              manager,
              "listing_taken_down",
              listingTakenDownMail(
                sawyer.email,
                sawyer.displayName,
                listing.title,
                input.note,
                `${deps.config.publicUrl}/yard/listings/${listing.id}`,
              ),
            );
          status = "listing_taken_down";
        } else if (input.resolution === "hide_review") {
          if (report.targetKind !== "review") throw new Invalid("This report is not about a review.", { resolution: "Nothing to hide." });
          await deps.reviews.hideWith(manager, admin, report.targetId, input.note, at);
          status = "review_hidden";
        } else if (input.resolution === "suspend") {
          if (report.reportedAccountId === admin.accountId)
            throw new Invalid("You cannot suspend your own account.", { resolution: "That is you." });
          const suspended = await deps.moderation.suspendWith(manager, admin, report.reportedAccountId, input.note, at);
          await deps.mail.queue(manager, "account_suspended", accountSuspendedMail(suspended.email, suspended.displayName, input.note));
          status = "user_suspended";
        }
        const same = await manager
          .getRepository(ContentReportEntity)
          .find({ where: { targetKind: report.targetKind, targetId: report.targetId, status: "open" }, select: { id: true } });
        const ids = same.map((r) => r.id);
        await manager
          .getRepository(ContentReportEntity)
          .update({ id: In(ids) }, { status, resolvedBy: admin.accountId, resolutionNote: input.note, resolvedAt: at });
        await recordAudit(
          manager,
          admin,
          {
            action: `report.${input.resolution}`,
            targetKind: "report",
            targetId: report.id,
            before: { status: "open" },
            after: { status, closedTogether: ids.filter((id) => id !== report.id) },
            reason: input.note,
          },
          at,
        );
      });
      return (await views([await dataSource.getRepository(ContentReportEntity).findOneByOrFail({ id: reportId })]))[0]!;
    },
  };
}

export type ReportService = ReturnType<typeof createReportService>;
