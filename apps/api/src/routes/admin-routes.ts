import type { adminEndpoints, reportEndpoints } from "@grainyard/contracts";
import type { Handlers } from "../http/endpoints.ts";
import type { AccountModeration } from "../services/account-moderation.ts";
import type { AuditService } from "../services/audit-log.ts";
import type { DashboardService } from "../services/dashboard-service.ts";
import type { MailOutbox } from "../services/mail-outbox.ts";
import type { OrderProblemService } from "../services/order-problem-service.ts";
import type { ReportService } from "../services/report-service.ts";
import type { SettingsService } from "../services/settings-service.ts";

/** Filing a report (anyone signed in). */
export function reportHandlers(reports: ReportService): Handlers<typeof reportEndpoints> {
  return {
    fileReport: async ({ actor, body }) => ({ report: await reports.create(actor, body) }),
  };
}

/** The operator desk. Every row needs an admin (checked again in the services). */
export function adminHandlers(services: {
  audit: AuditService;
  reports: ReportService;
  problems: OrderProblemService;
  moderation: AccountModeration;
  settings: SettingsService;
  dashboard: DashboardService;
  outbox: MailOutbox;
}): Handlers<typeof adminEndpoints> {
  const { audit, reports, problems, moderation, settings, dashboard, outbox } = services;
  return {
    searchAudit: ({ actor, query }) => audit.search(actor, query),
    exportAuditCsv: async ({ actor, query }) => ({
      body: await audit.exportCsv(actor, query),
      contentType: "text/csv; charset=utf-8",
      filename: "grainyard-audit.csv",
    }),
    listReports: async ({ actor, query }) => ({ reports: await reports.list(actor, query.status) }),
    resolveReport: async ({ actor, params, body }) => ({ report: await reports.resolve(actor, params.reportId, body) }),
    listOrderProblems: async ({ actor, query }) => ({ problems: await problems.list(actor, query.status) }),
    resolveOrderProblem: async ({ actor, params, body }) => ({ problem: await problems.resolve(actor, params.problemId, body) }),
    searchUsers: async ({ actor, query }) => ({ users: await moderation.searchUsers(actor, query) }),
    getUser: async ({ actor, params }) => ({ user: await moderation.getUser(actor, params.accountId) }),
    suspendUser: async ({ actor, params, body }) => ({ user: await moderation.suspend(actor, params.accountId, body) }),
    restoreUser: async ({ actor, params, body }) => ({ user: await moderation.restore(actor, params.accountId, body) }),
    getSettings: ({ actor }) => settings.view(actor),
    updateSettings: ({ actor, body }) => settings.update(actor, body),
    getDashboard: async ({ actor }) => ({ dashboard: await dashboard.dashboard(actor) }),
    listOutbox: ({ actor, query }) => outbox.list(actor, query),
    resendEmail: async ({ actor, params }) => ({ email: await outbox.resend(actor, params.emailId) }),
  };
}
