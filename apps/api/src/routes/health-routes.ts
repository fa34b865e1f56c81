import { Router } from "express";
import type { HealthService } from "../services/health-service.ts";

/** /api/health: each part of the stack as up or down; 503 when any part is down. */
export function healthRoutes(health: HealthService) {
  const router = Router();
  router.get("/health", async (_req, res) => {
    const body = await health.check();
    res.status(body.status === "ok" ? 200 : 503).json(body);
  });
  return router;
}
