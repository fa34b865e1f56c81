import { Router } from "express";
import { disputeRefundSchema, payoutApprovalSchema, payoutBatchSchema, payoutListQuerySchema } from "@grainyard/contracts";
import { parse } from "../http/context.ts";
import type { PayoutService } from "../services/payout-service.ts";

/** Paying sawyers: their payout account, balance and statement; the admin's payouts and dispute refunds. */
export function payoutRoutes(payouts: PayoutService) {
  const router = Router();
  const id = (value: string | string[] | undefined) => String(value);

  router.get("/yard/payouts", async (req, res) => {
    res.json(await payouts.mine(req.actor));
  });
  router.post("/yard/payouts/account", async (req, res) => {
    res.json(await payouts.onboardingLink(req.actor));
  });
  router.post("/yard/payouts/account/refresh", async (req, res) => {
    res.json(await payouts.refreshAccount(req.actor));
  });
  router.get("/yard/payouts/statement.csv", async (req, res) => {
    const csv = await payouts.statementCsv(req.actor);
    res.type("text/csv").attachment("grainyard-statement.csv").send(csv);
  });
  router.get("/yard/payouts/:payoutId", async (req, res) => {
    res.json({ payout: await payouts.one(req.actor, id(req.params.payoutId), "yard") });
  });

  router.get("/admin/payouts/due", async (req, res) => {
    res.json(await payouts.due(req.actor));
  });
  router.post("/admin/payouts/batch", async (req, res) => {
    res.json(await payouts.approveBatch(req.actor, parse(payoutBatchSchema, req.body)));
  });
  router.post("/admin/payouts", async (req, res) => {
    res.json({ payout: await payouts.approve(req.actor, parse(payoutApprovalSchema, req.body)) });
  });
  router.get("/admin/payouts", async (req, res) => {
    res.json({ payouts: await payouts.list(req.actor, parse(payoutListQuerySchema, req.query)) });
  });
  router.get("/admin/payouts/:payoutId", async (req, res) => {
    res.json({ payout: await payouts.one(req.actor, id(req.params.payoutId), "desk") });
  });
  router.get("/admin/orders/:orderId/refund", async (req, res) => {
    res.json(await payouts.refundState(req.actor, id(req.params.orderId)));
  });
  router.post("/admin/orders/:orderId/refund", async (req, res) => {
    res.json(await payouts.disputeRefund(req.actor, id(req.params.orderId), parse(disputeRefundSchema, req.body)));
  });
  return router;
}
