import { Router } from "express";
import {
  adminUserSearchSchema,
  auditSearchSchema,
  marketplaceSettingsUpdateSchema,
  rejectSchema,
  reportInputSchema,
  reportQuerySchema,
  reportResolveSchema,
  restoreSchema,
  suspendSchema,
} from "@grainyard/contracts";
import { parse } from "../http/context.ts";
import type { AccountModeration } from "../services/account-moderation.ts";
import type { AuditService } from "../services/audit-log.ts";
import type { DashboardService } from "../services/dashboard-service.ts";
import type { ListingService } from "../services/listing-service.ts";
import type { ReportService } from "../services/report-service.ts";
import type { SettingsService } from "../services/settings-service.ts";

/** The operator desk. Every route needs an admin (checked in the services), except filing a report. */
export function adminRoutes(services: {
  listings: ListingService;
  audit: AuditService;
  reports: ReportService;
  moderation: AccountModeration;
  settings: SettingsService;
  dashboard: DashboardService;
}) {
  const { listings, audit, reports, moderation, settings, dashboard } = services;
  const router = Router();
  const id = (value: string | string[] | undefined) => String(value);

  router.get("/admin/review-desk", async (req, res) => {
    res.json({ items: await listings.reviewDesk(req.actor) });
  });
  router.get("/admin/listings/:listingId/reviews", async (req, res) => {
    res.json({ reviews: await listings.reviewHistory(req.actor, id(req.params.listingId)) });
  });
  router.post("/admin/listings/:listingId/reject", async (req, res) => {
    res.json({ listing: await listings.reject(req.actor, id(req.params.listingId), parse(rejectSchema, req.body)) });
  });

  router.get("/admin/audit", async (req, res) => {
    res.json(await audit.search(req.actor, parse(auditSearchSchema, req.query)));
  });
  router.get("/admin/audit.csv", async (req, res) => {
    const csv = await audit.exportCsv(req.actor, parse(auditSearchSchema, req.query));
    res.setHeader("content-type", "text/csv; charset=utf-8");
    res.setHeader("content-disposition", 'attachment; filename="grainyard-audit.csv"');
    res.send(csv);
  });

  router.post("/reports", async (req, res) => {
    res.status(201).json({ report: await reports.create(req.actor, parse(reportInputSchema, req.body)) });
  });
  router.get("/admin/reports", async (req, res) => {
    res.json({ reports: await reports.list(req.actor, parse(reportQuerySchema, req.query).status) });
  });
  router.post("/admin/reports/:reportId/resolve", async (req, res) => {
    res.json({ report: await reports.resolve(req.actor, id(req.params.reportId), parse(reportResolveSchema, req.body)) });
  });

  router.get("/admin/users", async (req, res) => {
    res.json({ users: await moderation.searchUsers(req.actor, parse(adminUserSearchSchema, req.query)) });
  });
  router.get("/admin/users/:accountId", async (req, res) => {
    res.json({ user: await moderation.getUser(req.actor, id(req.params.accountId)) });
  });
  router.post("/admin/users/:accountId/suspend", async (req, res) => {
    res.json({ user: await moderation.suspend(req.actor, id(req.params.accountId), parse(suspendSchema, req.body)) });
  });
  router.post("/admin/users/:accountId/restore", async (req, res) => {
    res.json({ user: await moderation.restore(req.actor, id(req.params.accountId), parse(restoreSchema, req.body)) });
  });

  router.get("/admin/settings", async (req, res) => {
    res.json(await settings.view(req.actor));
  });
  router.patch("/admin/settings", async (req, res) => {
    res.json(await settings.update(req.actor, parse(marketplaceSettingsUpdateSchema, req.body)));
  });

  router.get("/admin/dashboard", async (req, res) => {
    res.json({ dashboard: await dashboard.dashboard(req.actor) });
  });

  return router;
}
