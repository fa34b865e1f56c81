import { parse } from "csv-parse/sync";
import { stringify } from "csv-stringify/sync";
import { slabInputSchema, type CsvRowError, type SlabInput } from "@grainyard/contracts";
import { findSpeciesBySlug } from "@grainyard/slab-math";
import type { DataSource } from "typeorm";
import { SlabEntity, YardLogEntity } from "../entities/index.ts";
import { AppError, Invalid } from "../errors.ts";
import { requireRole, type Actor } from "./actor.ts";
import type { YardService } from "./yard-service.ts";

/**
 * The slab inventory as CSV (csv-parse / csv-stringify). Lists inside a cell are separated by ";".
 * Export writes the computed figures too; import reads only the measured columns and recomputes
 * every figure. An import with any bad row saves nothing and says which rows and fields.
 */
const CSV_COLUMNS = [
  "log_id",
  "sequence_in_log",
  "species",
  "length_mm",
  "thickness_mm",
  "width_stations_mm",
  "live_edge",
  "surfacing",
  "features",
  "defects",
  "drying_method",
  "kiln_completed_on",
  "heat_treated",
  "heat_treatment_temperature_c",
  "heat_treatment_minutes",
  "notes",
] as const;
const COMPUTED_COLUMNS = ["id", "board_feet", "volume_m3", "weight_kg", "last_moisture_pct", "last_read_on"] as const;
const MAX_IMPORT_ROWS = 2000;

const FIELD_TO_COLUMN: Record<string, string> = {
  logId: "log_id",
  sequenceInLog: "sequence_in_log",
  speciesSlug: "species",
  lengthMm: "length_mm",
  thicknessMm: "thickness_mm",
  widthStationsMm: "width_stations_mm",
  liveEdge: "live_edge",
  surfacing: "surfacing",
  features: "features",
  defects: "defects",
  dryingMethod: "drying_method",
  kilnCompletedOn: "kiln_completed_on",
  heatTreated: "heat_treated",
  heatTreatmentTemperatureC: "heat_treatment_temperature_c",
  heatTreatmentMinutes: "heat_treatment_minutes",
  notes: "notes",
};

const list = (cell: string) =>
  cell
    .split(";")
    .map((part) => part.trim())
    .filter(Boolean);
const numberOrNull = (cell: string): number | null => (cell.trim() === "" ? null : Number(cell.trim()));
const textOrNull = (cell: string): string | null => (cell.trim() === "" ? null : cell.trim());

function rowToInput(row: Record<string, string>): SlabInput {
  const heat = (row.heat_treated ?? "").trim().toLowerCase();
  return {
    logId: textOrNull(row.log_id ?? ""),
    sequenceInLog: numberOrNull(row.sequence_in_log ?? ""),
    speciesSlug: (row.species ?? "").trim(),
    lengthMm: numberOrNull(row.length_mm ?? "") as number,
    thicknessMm: numberOrNull(row.thickness_mm ?? "") as number,
    widthStationsMm: list(row.width_stations_mm ?? "").map(Number),
    liveEdge: (row.live_edge ?? "").trim() as SlabInput["liveEdge"],
    surfacing: (row.surfacing ?? "").trim() as SlabInput["surfacing"],
    features: list(row.features ?? "") as SlabInput["features"],
    defects: list(row.defects ?? "") as SlabInput["defects"],
    dryingMethod: (row.drying_method ?? "").trim() as SlabInput["dryingMethod"],
    kilnCompletedOn: textOrNull(row.kiln_completed_on ?? ""),
    heatTreated: heat === "yes" || heat === "true" || heat === "1",
    heatTreatmentTemperatureC: numberOrNull(row.heat_treatment_temperature_c ?? ""),
    heatTreatmentMinutes: numberOrNull(row.heat_treatment_minutes ?? ""),
    notes: row.notes ?? "",
  };
}

export type InventoryCsv = ReturnType<typeof createInventoryCsv>;

export function createInventoryCsv(deps: { dataSource: DataSource; yard: YardService }) {
  const { dataSource } = deps;
  return {
    async exportSlabs(actor: Actor): Promise<string> {
      const sawyer = requireRole(actor, "sawyer");
      const slabs = await dataSource.getRepository(SlabEntity).find({ where: { sawyerId: sawyer.accountId }, order: { createdAt: "ASC" } });
      const rows = slabs.map((s) => ({
        id: s.id,
        log_id: s.logId ?? "",
        sequence_in_log: s.sequenceInLog ?? "",
        species: s.speciesSlug,
        length_mm: s.lengthMm,
        thickness_mm: s.thicknessMm,
        width_stations_mm: s.widthStationsMm.join(";"),
        live_edge: s.liveEdge,
        surfacing: s.surfacing,
        features: s.features.join(";"),
        defects: s.defects.join(";"),
        drying_method: s.dryingMethod,
        kiln_completed_on: s.kilnCompletedOn ?? "",
        heat_treated: s.heatTreated ? "yes" : "no",
        heat_treatment_temperature_c: s.heatTreatmentTemperatureC ?? "",
        heat_treatment_minutes: s.heatTreatmentMinutes ?? "",
        notes: s.notes,
        board_feet: s.boardFeet.toFixed(2),
        volume_m3: s.volumeM3.toFixed(4),
        weight_kg: s.weightKg.toFixed(1),
        last_moisture_pct: s.lastMoisturePct ?? "",
        last_read_on: s.lastReadOn ?? "",
      }));
      return stringify(rows, { header: true, columns: ["id", ...CSV_COLUMNS, ...COMPUTED_COLUMNS.slice(1)] });
    },

    /** Adds every row as a new slab, or none at all. */
    async importSlabs(actor: Actor, text: string): Promise<{ created: number }> {
      const sawyer = requireRole(actor, "sawyer");
      let records: Record<string, string>[];
      try {
        records = parse(text, {
          columns: (header: string[]) => header.map((h) => h.trim().toLowerCase()),
          skip_empty_lines: true,
          bom: true,
          trim: false,
        });
      } catch (error) {
        throw new Invalid(`That file is not readable CSV: ${(error as Error).message}`, undefined, "csv_unreadable");
      }
      if (records.length === 0) throw new Invalid("The file has no rows under its header.", undefined, "csv_empty");
      if (records.length > MAX_IMPORT_ROWS)
        throw new Invalid(`Import at most ${MAX_IMPORT_ROWS} rows at a time.`, undefined, "csv_too_long");
      const missing = ["species", "length_mm", "thickness_mm", "width_stations_mm", "live_edge", "surfacing", "drying_method"].filter(
        (c) => !(c in records[0]!),
      );
      if (missing.length) throw new Invalid(`The header lacks: ${missing.join(", ")}.`, undefined, "csv_columns_missing");

      const ownLogs = new Set(
        (await dataSource.getRepository(YardLogEntity).find({ where: { sawyerId: sawyer.accountId }, select: { id: true } })).map(
          (l) => l.id,
        ),
      );
      const errors: CsvRowError[] = [];
      const inputs: SlabInput[] = [];
      records.forEach((record, index) => {
        const row = index + 2; // the header is row 1, as a spreadsheet shows it
        const parsed = slabInputSchema.safeParse(rowToInput(record));
        if (!parsed.success) {
          for (const issue of parsed.error.issues) {
            const field = String(issue.path[0] ?? "");
            errors.push({ row, field: FIELD_TO_COLUMN[field] ?? field, message: issue.message });
          }
          return;
        }
        if (!findSpeciesBySlug(parsed.data.speciesSlug))
          errors.push({ row, field: "species", message: `Unknown species "${parsed.data.speciesSlug}".` });
        if (parsed.data.logId && !ownLogs.has(parsed.data.logId))
          errors.push({ row, field: "log_id", message: "No such log in your yard." });
        inputs.push(parsed.data);
      });
      if (errors.length === 0) {
        try {
          await dataSource.transaction(async (manager) => {
            for (const [index, input] of inputs.entries()) {
              try {
                await deps.yard.createSlab(actor, input, manager);
              } catch (error) {
                if (error instanceof AppError) {
                  const [field, message] = Object.entries(error.fields ?? { _: error.message })[0]!;
                  errors.push({ row: index + 2, field: FIELD_TO_COLUMN[field] ?? field, message });
                }
                throw error;
              }
            }
          });
        } catch (error) {
          if (!(error instanceof AppError)) throw error;
        }
      }
      if (errors.length) {
        throw new AppError(
          "csv_rows_invalid",
          `${new Set(errors.map((e) => e.row)).size} row(s) need fixing; nothing was saved.`,
          undefined,
          { rows: errors.slice(0, 200) },
        );
      }
      return { created: inputs.length };
    },
  };
}
