/**
 * The operator desk's calls, kept out of the shared client so the catalogue's bundle carries none
 * of the admin schemas. Built on the shared client's `request` (same cookies, anti-forgery header
 * and error handling).
 */
import {
  adminPaths,
  reviewDeskSchema,
  auditPageSchema,
  reportListSchema,
  reportEnvelopeSchema,
  adminUserListSchema,
  adminUserEnvelopeSchema,
  marketplaceSettingsViewSchema,
  dashboardSchema,
  listingEnvelopeSchema,
  type AdminUser,
  type AdminUserSearchInput,
  type AuditPage,
  type Dashboard,
  type Listing,
  type MarketplaceSettingsUpdate,
  type MarketplaceSettingsView,
  type Report,
  type ReportResolveInput,
  type ReviewDeskItem,
} from "@grainyard/contracts";
import { api, envelope, type ApiClient, type ResponseParser } from "./client.ts";

function createAdminApi(client: ApiClient = api) {
  const { request } = client;
  const listingEnvelope = listingEnvelopeSchema as ResponseParser<{ listing: Listing }>;
  return {
    rejectListing: (listingId: string, reason: string) =>
      request("POST", adminPaths.reviewReject(listingId), { body: { reason }, schema: listingEnvelope }),
    reviewDesk: (signal?: AbortSignal): Promise<{ items: ReviewDeskItem[] }> =>
      request("GET", adminPaths.reviewDesk, { schema: reviewDeskSchema as ResponseParser<{ items: ReviewDeskItem[] }>, signal }),

    // The operator desk: audit log, reports, users, settings, dashboard.
    searchAudit: (filter: Record<string, string | undefined>, signal?: AbortSignal): Promise<AuditPage> =>
      request("GET", adminPaths.audit, { query: filter, schema: auditPageSchema as ResponseParser<AuditPage>, signal }),
    auditCsvUrl: (filter: Record<string, string | undefined>): string => {
      const params = new URLSearchParams(Object.entries(filter).filter((e): e is [string, string] => Boolean(e[1])));
      return `${adminPaths.auditCsv}${params.size ? `?${params}` : ""}`;
    },
    listReports: (status: string | undefined, signal?: AbortSignal): Promise<{ reports: Report[] }> =>
      request("GET", adminPaths.adminReports, {
        query: { status },
        schema: reportListSchema as ResponseParser<{ reports: Report[] }>,
        signal,
      }),
    resolveReport: (reportId: string, input: ReportResolveInput): Promise<{ report: Report }> =>
      request("POST", adminPaths.adminReportResolve(reportId), {
        body: input,
        schema: reportEnvelopeSchema as ResponseParser<{ report: Report }>,
      }),
    searchUsers: (filter: AdminUserSearchInput, signal?: AbortSignal): Promise<{ users: AdminUser[] }> =>
      request("GET", adminPaths.users, {
        query: { query: filter.query?.trim() || undefined, role: filter.role, suspended: filter.suspended },
        schema: adminUserListSchema as ResponseParser<{ users: AdminUser[] }>,
        signal,
      }),
    suspendUser: (accountId: string, reason: string): Promise<{ user: AdminUser }> =>
      request("POST", adminPaths.userSuspend(accountId), {
        body: { reason },
        schema: adminUserEnvelopeSchema as ResponseParser<{ user: AdminUser }>,
      }),
    restoreUser: (accountId: string, reason: string): Promise<{ user: AdminUser }> =>
      request("POST", adminPaths.userRestore(accountId), {
        body: { reason },
        schema: adminUserEnvelopeSchema as ResponseParser<{ user: AdminUser }>,
      }),
    getSettings: (signal?: AbortSignal): Promise<MarketplaceSettingsView> =>
      request("GET", adminPaths.settings, { schema: marketplaceSettingsViewSchema as ResponseParser<MarketplaceSettingsView>, signal }),
    updateSettings: (input: MarketplaceSettingsUpdate): Promise<MarketplaceSettingsView> =>
      request("PATCH", adminPaths.settings, {
        body: input,
        schema: marketplaceSettingsViewSchema as ResponseParser<MarketplaceSettingsView>,
      }),
    getDashboard: (signal?: AbortSignal): Promise<{ dashboard: Dashboard }> =>
      request("GET", adminPaths.dashboard, { schema: envelope("dashboard", dashboardSchema as ResponseParser<Dashboard>), signal }),
  };
}

export const adminApi = createAdminApi();
