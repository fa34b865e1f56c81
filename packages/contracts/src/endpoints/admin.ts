import { z } from "zod";
import {
  adminUserEnvelopeSchema,
  adminUserListSchema,
  adminUserSearchSchema,
  auditPageSchema,
  auditSearchSchema,
  dashboardSchema,
  marketplaceSettingsUpdateSchema,
  marketplaceSettingsViewSchema,
  outboxEmailEnvelopeSchema,
  outboxPageSchema,
  outboxQuerySchema,
  reportEnvelopeSchema,
  reportInputSchema,
  reportListSchema,
  reportQuerySchema,
  reportReceiptSchema,
  reportResolveSchema,
  restoreSchema,
  suspendSchema,
} from "../admin.ts";
import { endpoint } from "../endpoint.ts";
import { API_PREFIX } from "./prefix.ts";

const adminOnly = ["admin"] as const;

/** Filing a report: anyone signed in tells the admins what is wrong with a listing or a message. */
export const reportEndpoints = {
  fileReport: endpoint({
    method: "POST",
    path: `${API_PREFIX}/reports`,
    summary: "Report a listing, a message or a review (never one's own).",
    access: "signed_in",
    body: reportInputSchema,
    answer: reportReceiptSchema,
    status: 201,
    errors: ["already_reported"],
  }),
} as const;

/** The operator desk: audit log, reports, people, settings, dashboard, the e-mail outbox. */
export const adminEndpoints = {
  searchAudit: endpoint({
    method: "GET",
    path: `${API_PREFIX}/admin/audit`,
    summary: "Admin actions, newest first, filtered and paged.",
    access: adminOnly,
    query: auditSearchSchema,
    answer: auditPageSchema,
    errors: ["bad_cursor"],
  }),
  exportAuditCsv: endpoint({
    method: "GET",
    path: `${API_PREFIX}/admin/audit.csv`,
    summary: "The filtered audit log as a CSV file.",
    access: adminOnly,
    query: auditSearchSchema,
    answer: { file: "csv" },
  }),
  listReports: endpoint({
    method: "GET",
    path: `${API_PREFIX}/admin/reports`,
    summary: "Reports, open ones first, optionally by status.",
    access: adminOnly,
    query: reportQuerySchema,
    answer: reportListSchema,
  }),
  resolveReport: endpoint({
    method: "POST",
    path: `${API_PREFIX}/admin/reports/:reportId/resolve`,
    summary: "Dismiss a report, take the listing down, hide the review, or suspend its author.",
    access: adminOnly,
    body: reportResolveSchema,
    answer: reportEnvelopeSchema,
    errors: ["report_resolved", "listing_not_removable", "admin_not_suspendable", "already_suspended", "review_hidden"],
  }),
  searchUsers: endpoint({
    method: "GET",
    path: `${API_PREFIX}/admin/users`,
    summary: "People by name, e-mail or yard, role and suspension.",
    access: adminOnly,
    query: adminUserSearchSchema,
    answer: adminUserListSchema,
  }),
  getUser: endpoint({
    method: "GET",
    path: `${API_PREFIX}/admin/users/:accountId`,
    summary: "One person as the desk sees them.",
    access: adminOnly,
    answer: adminUserEnvelopeSchema,
  }),
  suspendUser: endpoint({
    method: "POST",
    path: `${API_PREFIX}/admin/users/:accountId/suspend`,
    summary: "Suspend an account: its live listings hide, its held orders expire.",
    access: adminOnly,
    body: suspendSchema,
    answer: adminUserEnvelopeSchema,
    errors: ["admin_not_suspendable", "already_suspended"],
  }),
  restoreUser: endpoint({
    method: "POST",
    path: `${API_PREFIX}/admin/users/:accountId/restore`,
    summary: "Lift a suspension; hidden listings come back.",
    access: adminOnly,
    body: restoreSchema,
    answer: adminUserEnvelopeSchema,
    errors: ["not_suspended"],
  }),
  getSettings: endpoint({
    method: "GET",
    path: `${API_PREFIX}/admin/settings`,
    summary: "Fees, reservation time, tax and payout hold in force, and who changed them last.",
    access: adminOnly,
    answer: marketplaceSettingsViewSchema,
  }),
  updateSettings: endpoint({
    method: "PATCH",
    path: `${API_PREFIX}/admin/settings`,
    summary: "Change marketplace settings, with a reason for the audit log.",
    access: adminOnly,
    body: marketplaceSettingsUpdateSchema,
    answer: marketplaceSettingsViewSchema,
  }),
  getDashboard: endpoint({
    method: "GET",
    path: `${API_PREFIX}/admin/dashboard`,
    summary: "The marketplace's health at a glance.",
    access: adminOnly,
    answer: z.object({ dashboard: dashboardSchema }),
  }),
  listOutbox: endpoint({
    method: "GET",
    path: `${API_PREFIX}/admin/outbox`,
    summary: "E-mails still to go out (the default), those that could not be delivered, or the latest sent; with counts.",
    access: adminOnly,
    query: outboxQuerySchema,
    answer: outboxPageSchema,
  }),
  resendEmail: endpoint({
    method: "POST",
    path: `${API_PREFIX}/admin/outbox/:emailId/resend`,
    summary: "Send a failed or waiting e-mail again now, with a fresh round of attempts (audited).",
    access: adminOnly,
    answer: outboxEmailEnvelopeSchema,
    errors: ["email_already_sent"],
  }),
} as const;
