import { z } from "zod";
import { accountSchema, roleSchema } from "./accounts.ts";
import { listingSchema } from "./listings.ts";

/*
 * The operator desk: moderation, the audit log, reports, suspension, marketplace settings, users
 * and the dashboard. Every route here needs an admin, except filing a report (anyone signed in).
 */

const reasonField = (message: string) => z.string({ error: message }).trim().min(5, message).max(2000, "Keep it under 2000 characters.");

export const rejectSchema = z.object({ reason: reasonField("Tell the sawyer why the listing is rejected.") });
export type RejectInput = z.infer<typeof rejectSchema>;

export const plausibilityWarningSchema = z.object({ code: z.string(), slabIndex: z.number().nullable(), message: z.string() });
export type PlausibilityWarningView = z.infer<typeof plausibilityWarningSchema>;

export const reviewChangeSchema = z.object({ field: z.string(), label: z.string(), before: z.string(), after: z.string() });
export type ReviewChange = z.infer<typeof reviewChangeSchema>;

export const reviewDecisionSchema = z.enum(["approved", "sent_back", "rejected"]);
export const pastReviewSchema = z.object({
  decision: reviewDecisionSchema,
  reason: z.string().nullable(),
  reviewedAt: z.string(),
  reviewerLabel: z.string(),
});
export type PastReview = z.infer<typeof pastReviewSchema>;

export const reviewDeskItemSchema = z.object({
  listing: listingSchema,
  sawyer: z.object({ id: z.string(), displayName: z.string(), email: z.string(), suspended: z.boolean() }),
  warnings: z.array(plausibilityWarningSchema),
  /** The last decision on this listing, if it was reviewed before. */
  lastReview: pastReviewSchema.nullable(),
  /** What changed since the last review (empty on a first submission). */
  changes: z.array(reviewChangeSchema),
});
export type ReviewDeskItem = z.infer<typeof reviewDeskItemSchema>;
export const reviewDeskSchema = z.object({ items: z.array(reviewDeskItemSchema) });

// Audit log.
/** What an audit entry was about, named as it is now (the entry itself keeps ids only). */
export const auditSubjectSchema = z.object({
  /** Its title or name: a listing's or order's title, an account's yard or name, an e-mail's subject (null when gone or nameless). */
  name: z.string().nullable(),
  /** Whose it is: a listing's yard, a report's reported person, a review's or order's buyer, an e-mail's recipient. */
  owner: z.string().nullable(),
  /** The currency of amounts in before/after when the entry does not carry one (an order's). */
  currency: z.string().nullable(),
});
export type AuditSubject = z.infer<typeof auditSubjectSchema>;
export const auditEntrySchema = z.object({
  id: z.string(),
  actorId: z.string().nullable(),
  /** The acting admin's e-mail at the time ("command line" for the CLI). */
  actorLabel: z.string(),
  /** The acting admin's display name now (the label when the account is gone or it was the command line). */
  actorName: z.string(),
  subject: auditSubjectSchema,
  action: z.string(),
  targetKind: z.string(),
  targetId: z.string(),
  before: z.unknown(),
  after: z.unknown(),
  reason: z.string().nullable(),
  createdAt: z.string(),
});
export type AuditEntry = z.infer<typeof auditEntrySchema>;

const isoDate = z
  .string()
  .trim()
  .regex(/^\d{4}-\d{2}-\d{2}$/, "Use a date like 2026-03-01.");
export const auditSearchSchema = z
  .object({
    actor: z.string().trim().max(254).optional(),
    action: z.string().trim().max(60).optional(),
    target: z.string().trim().max(64).optional(),
    from: isoDate.optional(),
    to: isoDate.optional(),
    cursor: z
      .string()
      .regex(/^\d{1,20}$/, "Not a page of this log.")
      .optional(),
    limit: z.coerce.number().int().min(1).max(200).optional(),
  })
  .superRefine((value, context) => {
    if (value.from && value.to && value.from > value.to)
      context.addIssue({ code: "custom", path: ["to"], message: "The end date comes after the start date." });
  });
export type AuditSearchInput = z.input<typeof auditSearchSchema>;
export const auditPageSchema = z.object({ entries: z.array(auditEntrySchema), nextCursor: z.string().nullable() });
export type AuditPage = z.infer<typeof auditPageSchema>;

// Reports.
export const reportTargetKinds = ["listing", "message", "review"] as const;
export const reportStatuses = ["open", "dismissed", "listing_taken_down", "user_suspended", "review_hidden"] as const;
export const reportStatusLabels: Record<(typeof reportStatuses)[number], string> = {
  open: "Open",
  dismissed: "Dismissed",
  listing_taken_down: "Listing taken down",
  user_suspended: "User suspended",
  review_hidden: "Review hidden",
};
export const reportInputSchema = z.object({
  targetKind: z.enum(reportTargetKinds, { error: "Choose what you are reporting." }),
  targetId: z.string({ error: "Choose what you are reporting." }).trim().min(1, "Choose what you are reporting.").max(36),
  reason: reasonField("Tell us what is wrong, in a few words."),
});
export type ReportInput = z.infer<typeof reportInputSchema>;
/** `take_down` is for a listing, `hide_review` for a review; `dismiss` and `suspend` for anything. */
export const reportResolutions = ["dismiss", "take_down", "suspend", "hide_review"] as const;
export const reportResolveSchema = z.object({
  resolution: z.enum(reportResolutions, { error: "Choose how to resolve the report." }),
  note: reasonField("Say why, in a few words (kept in the audit log)."),
});
export type ReportResolveInput = z.infer<typeof reportResolveSchema>;
export const reportSchema = z.object({
  id: z.string(),
  targetKind: z.enum(reportTargetKinds),
  targetId: z.string(),
  listingId: z.string().nullable(),
  /** The listing's title, the message's words or the review's, for the admin to judge. */
  excerpt: z.string(),
  reason: z.string(),
  status: z.enum(reportStatuses),
  reporter: z.object({ id: z.string(), displayName: z.string() }),
  reported: z.object({ id: z.string(), displayName: z.string(), email: z.string(), suspended: z.boolean() }),
  resolutionNote: z.string().nullable(),
  resolvedAt: z.string().nullable(),
  createdAt: z.string(),
});
export type Report = z.infer<typeof reportSchema>;
export const reportListSchema = z.object({ reports: z.array(reportSchema) });
export const reportEnvelopeSchema = z.object({ report: reportSchema });
/** What the person who filed a report gets back: never the reported person's details. */
export const reportReceiptSchema = z.object({
  report: z.object({ id: z.string(), targetKind: z.enum(reportTargetKinds), targetId: z.string(), status: z.literal("open") }),
});
export type ReportReceipt = z.infer<typeof reportReceiptSchema>["report"];
export const reportQuerySchema = z.object({ status: z.enum(reportStatuses).optional() });

// Suspension and users.
export const suspendSchema = z.object({ reason: reasonField("Say why the account is suspended.") });
export type SuspendInput = z.infer<typeof suspendSchema>;
export const restoreSchema = z.object({ reason: reasonField("Say why the account is restored.") });
export type RestoreInput = z.infer<typeof restoreSchema>;

export const adminUserSchema = z.object({
  account: accountSchema,
  suspended: z.boolean(),
  suspendedAt: z.string().nullable(),
  suspensionReason: z.string().nullable(),
  listingsCount: z.number(),
  ordersCount: z.number(),
});
export type AdminUser = z.infer<typeof adminUserSchema>;
export const adminUserListSchema = z.object({ users: z.array(adminUserSchema) });
export const adminUserEnvelopeSchema = z.object({ user: adminUserSchema });
export const adminUserSearchSchema = z.object({
  query: z.string().trim().max(100).optional(),
  role: roleSchema.optional(),
  suspended: z.enum(["yes", "no"]).optional(),
});
export type AdminUserSearchInput = z.infer<typeof adminUserSearchSchema>;

// Marketplace settings.
const wholeNumber = (label: string, min: number, max: number, unit: string) =>
  z
    .number({ error: `Give the ${label}.` })
    .int(`Give the ${label} as a whole number.`)
    .min(min, `The ${label} is at least ${min} ${unit}.`)
    .max(max, `The ${label} is at most ${max} ${unit}.`);
export const marketplaceSettingsFields = {
  /** Platform fee on the price, basis points (1000 = 10 %). */
  platformFeeBps: wholeNumber("platform fee", 0, 3000, "basis points"),
  /** Card processing, basis points of the price… */
  processingFeeBps: wholeNumber("processing rate", 0, 1000, "basis points"),
  /** …plus a fixed amount per order, minor units. */
  processingFixedMinor: wholeNumber("fixed processing fee", 0, 500, "cents"),
  /** Days a sawyer's money is held after hand-over before a payout may be approved. */
  holdDays: wholeNumber("hold", 0, 60, "days"),
  /** Minutes a slab stays reserved for a buyer at checkout. */
  reservationMinutes: wholeNumber("reservation time", 5, 120, "minutes"),
  /** Sales tax on the price, basis points. */
  taxRateBps: wholeNumber("tax rate", 0, 2500, "basis points"),
};
export const marketplaceSettingsSchema = z.object(marketplaceSettingsFields);
export type MarketplaceSettings = z.infer<typeof marketplaceSettingsSchema>;
export const marketplaceSettingsUpdateSchema = z
  .object({ ...marketplaceSettingsSchema.partial().shape, reason: reasonField("Say why the settings change (kept in the audit log).") })
  .strict();
export type MarketplaceSettingsUpdate = z.infer<typeof marketplaceSettingsUpdateSchema>;
export const marketplaceSettingsViewSchema = z.object({
  settings: marketplaceSettingsSchema,
  defaults: marketplaceSettingsSchema,
  /** Which settings were changed by an admin (the others are the defaults). */
  changedKeys: z.array(z.string()),
});
export type MarketplaceSettingsView = z.infer<typeof marketplaceSettingsViewSchema>;
/** The fees in force, for anyone (a sawyer's listing form previews the take-home with them). */
export const marketplaceFeesSchema = z.object({
  fees: marketplaceSettingsSchema.pick({ platformFeeBps: true, processingFeeBps: true, processingFixedMinor: true }),
});
export type MarketplaceFees = z.infer<typeof marketplaceFeesSchema>["fees"];

// Dashboard.
export const dashboardSchema = z.object({
  awaitingReview: z.object({ count: z.number(), oldestSubmittedAt: z.string().nullable() }),
  liveBySpecies: z.array(z.object({ speciesSlug: z.string(), count: z.number() })),
  /** Per week: decisions made and the median time from submission to decision, in hours (to the second). */
  reviewTimes: z.array(z.object({ week: z.string(), reviews: z.number(), medianHours: z.number() })),
  /** Orders that were paid for, by their state now (checkouts never paid — waiting, declined, run out — are not orders). */
  ordersByState: z.array(z.object({ status: z.string(), count: z.number() })),
  salesByWeek: z.array(z.object({ week: z.string(), currency: z.string(), salesMinor: z.number(), platformRevenueMinor: z.number() })),
  openReports: z.number(),
  suspendedUsers: z.number(),
});
export type Dashboard = z.infer<typeof dashboardSchema>;

// The e-mail outbox: e-mails waiting to go out, and those that could not be delivered.
export const outboxEmailStatuses = ["waiting", "sending", "sent", "failed"] as const;
export const outboxEmailStatusLabels: Record<(typeof outboxEmailStatuses)[number], string> = {
  waiting: "Waiting to go out",
  sending: "Going out now",
  sent: "Delivered to the mail server",
  failed: "Could not be delivered",
};
/** Which e-mails the desk shows: those still to go out (waiting or going out now), failed ones, or the latest sent. */
export const outboxQuerySchema = z.object({ status: z.enum(["waiting", "failed", "sent"]).optional() });
export type OutboxQuery = z.infer<typeof outboxQuerySchema>;
/** One e-mail as the desk sees it: never its body (reset and confirmation links are the recipient's alone). */
export const outboxEmailSchema = z.object({
  id: z.string(),
  kind: z.string(),
  to: z.string(),
  subject: z.string(),
  status: z.enum(outboxEmailStatuses),
  attempts: z.number(),
  nextAttemptAt: z.string().nullable(),
  lastError: z.string().nullable(),
  sentAt: z.string().nullable(),
  createdAt: z.string(),
});
export type OutboxEmail = z.infer<typeof outboxEmailSchema>;
export const outboxPageSchema = z.object({
  emails: z.array(outboxEmailSchema),
  counts: z.object({ waiting: z.number(), failed: z.number() }),
});
export type OutboxPage = z.infer<typeof outboxPageSchema>;
export const outboxEmailEnvelopeSchema = z.object({ email: outboxEmailSchema });
