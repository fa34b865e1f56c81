import type { yardEndpoints } from "@grainyard/contracts";
import { NotFound } from "../errors.ts";
import type { Handlers } from "../http/endpoints.ts";
import type { InventoryCsv } from "../services/inventory-csv.ts";
import type { LogPhotoService } from "../services/photo-service.ts";
import type { YardService } from "../services/yard-service.ts";

/** The sizes every stored photo has. */
export function displaySize(size: string): "small" | "medium" | "large" {
  if (size !== "small" && size !== "medium" && size !== "large") throw new NotFound("No such photo size.");
  return size;
}

/** The sawyer's own yard: logs, slabs, moisture readings, log photos, CSV in and out. */
export function yardHandlers(yard: YardService, csv: InventoryCsv, logPhotos: LogPhotoService): Handlers<typeof yardEndpoints> {
  return {
    listLogs: async ({ actor }) => ({ logs: await yard.listLogs(actor) }),
    createLog: async ({ actor, body }) => ({ log: await yard.createLog(actor, body) }),
    getLog: async ({ actor, params }) => {
      const detail = await yard.getLog(actor, params.logId);
      return { ...detail, photos: await logPhotos.list(detail.log.id) };
    },
    updateLog: async ({ actor, params, body }) => ({ log: await yard.updateLog(actor, params.logId, body) }),
    deleteLog: ({ actor, params }) => yard.deleteLog(actor, params.logId),
    recordLogReadings: ({ actor, params, body }) => yard.addReadingToLog(actor, params.logId, body),
    uploadLogPhoto: async ({ actor, params, query, body }) => ({
      photo: await logPhotos.upload(actor, params.logId, body, query.altText ?? ""),
    }),
    deleteLogPhoto: ({ actor, params }) => logPhotos.remove(actor, params.logId, params.photoId),
    logPhotoImage: async ({ actor, params }) => ({
      body: await logPhotos.image(actor, params.photoId, displaySize(params.size)),
      contentType: "image/webp",
      cacheControl: "private, max-age=300",
    }),
    exportSlabsCsv: async ({ actor }) => ({
      body: await csv.exportSlabs(actor),
      contentType: "text/csv; charset=utf-8",
      filename: "grainyard-slabs.csv",
    }),
    importSlabsCsv: ({ actor, body }) => csv.importSlabs(actor, body),
    listSlabs: async ({ actor }) => ({ slabs: await yard.listSlabs(actor) }),
    createSlab: async ({ actor, body }) => ({ slab: await yard.createSlab(actor, body) }),
    getSlab: ({ actor, params }) => yard.getSlab(actor, params.slabId),
    updateSlab: async ({ actor, params, body }) => ({ slab: await yard.updateSlab(actor, params.slabId, body) }),
    deleteSlab: ({ actor, params }) => yard.deleteSlab(actor, params.slabId),
    addReading: async ({ actor, params, body }) => ({ reading: await yard.addReading(actor, params.slabId, body) }),
    deleteReading: ({ actor, params }) => yard.deleteReading(actor, params.readingId),
  };
}
