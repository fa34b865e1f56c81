import express, { Router } from "express";
import { logInputSchema, logUpdateSchema, moistureReadingInputSchema, slabInputSchema, slabUpdateSchema } from "@grainyard/contracts";
import { parse } from "../http/context.ts";
import type { InventoryCsv } from "../services/inventory-csv.ts";
import type { LogPhotoService } from "../services/photo-service.ts";
import type { YardService } from "../services/yard-service.ts";

/** The sawyer's own yard: logs, slabs, moisture readings, CSV in and out. */
export function yardRoutes(yard: YardService, csv: InventoryCsv, logPhotos: LogPhotoService) {
  const router = Router();
  const id = (value: string | string[] | undefined) => String(value);

  router.get("/yard/logs", async (req, res) => {
    res.json({ logs: await yard.listLogs(req.actor) });
  });
  router.post("/yard/logs", async (req, res) => {
    res.status(201).json({ log: await yard.createLog(req.actor, parse(logInputSchema, req.body)) });
  });
  router.get("/yard/logs/:logId", async (req, res) => {
    const detail = await yard.getLog(req.actor, id(req.params.logId));
    res.json({ ...detail, photos: await logPhotos.list(detail.log.id) });
  });
  router.patch("/yard/logs/:logId", async (req, res) => {
    res.json({ log: await yard.updateLog(req.actor, id(req.params.logId), parse(logUpdateSchema, req.body)) });
  });
  router.delete("/yard/logs/:logId", async (req, res) => {
    await yard.deleteLog(req.actor, id(req.params.logId));
    res.status(204).end();
  });
  router.post("/yard/logs/:logId/readings", async (req, res) => {
    res.status(201).json(await yard.addReadingToLog(req.actor, id(req.params.logId), parse(moistureReadingInputSchema, req.body)));
  });

  router.get("/yard/slabs.csv", async (req, res) => {
    const text = await csv.exportSlabs(req.actor);
    res.setHeader("content-type", "text/csv; charset=utf-8");
    res.setHeader("content-disposition", 'attachment; filename="grainyard-slabs.csv"');
    res.send(text);
  });
  router.post(
    "/yard/slabs/import",
    express.text({ type: ["text/csv", "text/plain", "application/csv", "application/vnd.ms-excel"], limit: "2mb" }),
    async (req, res) => {
      const text = typeof req.body === "string" ? req.body : "";
      res.status(201).json(await csv.importSlabs(req.actor, text));
    },
  );

  router.get("/yard/slabs", async (req, res) => {
    res.json({ slabs: await yard.listSlabs(req.actor) });
  });
  router.post("/yard/slabs", async (req, res) => {
    res.status(201).json({ slab: await yard.createSlab(req.actor, parse(slabInputSchema, req.body)) });
  });
  router.get("/yard/slabs/:slabId", async (req, res) => {
    res.json(await yard.getSlab(req.actor, id(req.params.slabId)));
  });
  router.patch("/yard/slabs/:slabId", async (req, res) => {
    res.json({ slab: await yard.updateSlab(req.actor, id(req.params.slabId), parse(slabUpdateSchema, req.body)) });
  });
  router.delete("/yard/slabs/:slabId", async (req, res) => {
    await yard.deleteSlab(req.actor, id(req.params.slabId));
    res.status(204).end();
  });
  router.post("/yard/slabs/:slabId/readings", async (req, res) => {
    res.status(201).json({ reading: await yard.addReading(req.actor, id(req.params.slabId), parse(moistureReadingInputSchema, req.body)) });
  });
  router.delete("/yard/readings/:readingId", async (req, res) => {
    await yard.deleteReading(req.actor, id(req.params.readingId));
    res.status(204).end();
  });

  return router;
}
