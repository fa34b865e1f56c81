import { Router } from "express";
import type { DataSource } from "typeorm";
import type { Health } from "@grainyard/contracts";
import type { Mailer } from "../integrations/mail.ts";
import type { Payments } from "../integrations/payments.ts";
import type { PhotoStorage } from "../integrations/storage.ts";

/** /api/health: each part of the stack as up or down; 503 when any part is down. */
export function healthRoutes(deps: { dataSource: DataSource; storage: PhotoStorage; mailer: Mailer; payments: Payments }) {
  const router = Router();
  router.get("/health", async (_req, res) => {
    const database = deps.dataSource
      .query("SELECT 1")
      .then(() => true)
      .catch(() => false);
    const [db, storage, mail, payments] = await Promise.all([database, deps.storage.isUp(), deps.mailer.isUp(), deps.payments.isUp()]);
    const state = (up: boolean) => (up ? "up" : "down") as "up" | "down";
    const body: Health = {
      status: db && storage && mail && payments ? "ok" : "degraded",
      components: { database: state(db), storage: state(storage), mail: state(mail), payments: state(payments) },
    };
    res.status(body.status === "ok" ? 200 : 503).json(body);
  });
  return router;
}
