import { z } from "zod";
import { latestToday } from "./common.ts";

/*
 * The sawyer's yard: logs (with where the tree stood and why it came down), the slabs cut from
 * them, and moisture readings as the slabs dry. Measurements travel in millimetres; the web app
 * converts inches at the edge. Computed figures are never accepted from a client.
 */

export const siteKinds = ["street", "park", "private_yard", "construction", "other"] as const;
export const fellingReasons = ["storm", "disease", "pests", "construction", "hazard", "other"] as const;
export const liveEdges = ["both", "one", "none"] as const;
export const surfacings = ["rough_sawn", "flattened", "sanded"] as const;
export const slabFeatures = ["crotch", "burl", "spalting", "figure"] as const;
export const slabDefects = ["checks", "cracks", "voids_filled", "butterfly_keys"] as const;
export const dryingMethods = ["air", "kiln", "air_then_kiln"] as const;
export const moistureMethods = ["pin_meter", "pinless_meter", "oven_dry"] as const;

/** Plain-words labels, shared by forms, lists and CSV. */
export const yardLabels = {
  siteKind: { street: "Street tree", park: "Park", private_yard: "Private yard", construction: "Construction site", other: "Other" },
  fellingReason: {
    storm: "Storm damage",
    disease: "Disease",
    pests: "Pests",
    construction: "Construction",
    hazard: "Hazard tree",
    other: "Other",
  },
  liveEdge: { both: "Both edges live", one: "One live edge", none: "Straight edges" },
  surfacing: { rough_sawn: "Rough sawn", flattened: "Flattened", sanded: "Sanded" },
  feature: { crotch: "Crotch", burl: "Burl", spalting: "Spalting", figure: "Figure" },
  defect: { checks: "Checks", cracks: "Cracks", voids_filled: "Voids filled", butterfly_keys: "Butterfly keys installed" },
  dryingMethod: { air: "Air-dried", kiln: "Kiln-dried", air_then_kiln: "Air-dried, then kiln" },
  moistureMethod: { pin_meter: "Pin meter", pinless_meter: "Pinless meter", oven_dry: "Oven-dry sample" },
} as const;

const isoDate = z.iso.date({ error: "Use a date like 2026-05-14." });
/** A day something already happened on: today at the latest (anywhere on Earth, so no one's today is refused). */
const dayDone = (what: string) => isoDate.refine((day) => day <= latestToday(), `${what} cannot be in the future.`);
const text = (max: number, label: string) => z.string().trim().max(max, `Keep ${label} under ${max} characters.`);
const wholeMillimetres = (label: string, min: number, max: number) =>
  z
    .number({ error: `Give the ${label} in millimetres.` })
    .int(`Give the ${label} in whole millimetres.`)
    .min(min, `The ${label} must be at least ${min} mm.`)
    .max(max, `The ${label} must be at most ${max} mm.`);

export const speciesSlugSchema = z
  .string({ error: "Choose the species." })
  .trim()
  .regex(/^[a-z][a-z0-9-]{1,60}$/, "Choose the species from the list.");

// Field schemas without defaults (for partial updates); the create schemas add the defaults.
const logFields = {
  speciesSlug: speciesSlugSchema,
  siteTown: z.string({ error: "Say which town the tree stood in." }).trim().min(2, "Say which town the tree stood in.").max(80),
  siteNeighbourhood: text(80, "the neighbourhood"),
  siteKind: z.enum(siteKinds, { error: "Choose where the tree stood." }),
  fellingReason: z.enum(fellingReasons, { error: "Choose why the tree came down." }),
  felledOn: dayDone("The felling date").nullable(),
  milledOn: dayDone("The milling date").nullable(),
  lengthMm: wholeMillimetres("log length", 300, 12_000).nullable(),
  diameterMm: wholeMillimetres("log diameter", 100, 3_000).nullable(),
  notes: text(2000, "the notes"),
};

export const logInputSchema = z
  .object({
    ...logFields,
    siteNeighbourhood: logFields.siteNeighbourhood.default(""),
    felledOn: logFields.felledOn.default(null),
    milledOn: logFields.milledOn.default(null),
    lengthMm: logFields.lengthMm.default(null),
    diameterMm: logFields.diameterMm.default(null),
    notes: logFields.notes.default(""),
  })
  .refine((log) => !log.felledOn || !log.milledOn || log.milledOn >= log.felledOn, {
    message: "A log is milled after it is felled.",
    path: ["milledOn"],
  });
export type LogInput = z.input<typeof logInputSchema>;

export const logUpdateSchema = z.object(logFields).partial();
export type LogUpdate = z.input<typeof logUpdateSchema>;

export const logSchema = z.object({
  id: z.string(),
  speciesSlug: z.string(),
  siteTown: z.string(),
  siteNeighbourhood: z.string(),
  siteKind: z.enum(siteKinds),
  fellingReason: z.enum(fellingReasons),
  felledOn: z.string().nullable(),
  milledOn: z.string().nullable(),
  lengthMm: z.number().nullable(),
  diameterMm: z.number().nullable(),
  notes: z.string(),
  slabCount: z.number(),
  createdAt: z.string(),
});
export type Log = z.infer<typeof logSchema>;

const slabFields = {
  logId: z.string().uuid("Choose one of your logs.").nullable(),
  sequenceInLog: z.number().int("Use a whole number.").min(1, "Slabs are numbered from 1.").max(200).nullable(),
  speciesSlug: speciesSlugSchema,
  lengthMm: wholeMillimetres("length", 200, 12_000),
  thicknessMm: wholeMillimetres("thickness", 10, 600),
  widthStationsMm: z
    .array(wholeMillimetres("width", 50, 3_000), { error: "Measure the width at two or more points." })
    .min(2, "Measure the width at two or more points along the slab.")
    .max(25, "Twenty-five width measurements are plenty."),
  liveEdge: z.enum(liveEdges, { error: "Choose the edges." }),
  surfacing: z.enum(surfacings, { error: "Choose the surfacing." }),
  features: z.array(z.enum(slabFeatures)).max(slabFeatures.length),
  defects: z.array(z.enum(slabDefects)).max(slabDefects.length),
  dryingMethod: z.enum(dryingMethods, { error: "Choose how the slab was dried." }),
  kilnCompletedOn: dayDone("The kiln date").nullable(),
  heatTreated: z.boolean(),
  heatTreatmentTemperatureC: z.number().min(40).max(120).nullable(),
  heatTreatmentMinutes: z.number().int().min(1).max(10_000).nullable(),
  notes: text(2000, "the notes"),
};

function slabRules<
  T extends {
    logId?: string | null;
    sequenceInLog?: number | null;
    heatTreated?: boolean;
    heatTreatmentTemperatureC?: number | null;
    heatTreatmentMinutes?: number | null;
    dryingMethod?: string;
    kilnCompletedOn?: string | null;
  },
>(slab: T, context: z.RefinementCtx) {
  if (slab.sequenceInLog != null && !slab.logId)
    context.addIssue({ code: "custom", path: ["sequenceInLog"], message: "A sequence number needs the log it was cut from." });
  if (slab.heatTreated && (slab.heatTreatmentTemperatureC == null || slab.heatTreatmentMinutes == null)) {
    context.addIssue({
      code: "custom",
      path: ["heatTreatmentTemperatureC"],
      message: "Give the core temperature and the minutes it was held (ISPM 15: 56 °C for 30 minutes).",
    });
  }
  if (slab.dryingMethod === "air" && slab.kilnCompletedOn)
    context.addIssue({ code: "custom", path: ["kilnCompletedOn"], message: "An air-dried slab has no kiln date." });
}

export const slabInputSchema = z
  .object({
    ...slabFields,
    logId: slabFields.logId.default(null),
    sequenceInLog: slabFields.sequenceInLog.default(null),
    features: slabFields.features.default([]),
    defects: slabFields.defects.default([]),
    kilnCompletedOn: slabFields.kilnCompletedOn.default(null),
    heatTreated: slabFields.heatTreated.default(false),
    heatTreatmentTemperatureC: slabFields.heatTreatmentTemperatureC.default(null),
    heatTreatmentMinutes: slabFields.heatTreatmentMinutes.default(null),
    notes: slabFields.notes.default(""),
  })
  .superRefine(slabRules);
export type SlabInput = z.input<typeof slabInputSchema>;

export const slabUpdateSchema = z.object(slabFields).partial().superRefine(slabRules);
export type SlabUpdate = z.input<typeof slabUpdateSchema>;

/** Figures the API computes with slab-math on every write. */
export const slabFiguresSchema = z.object({
  areaM2: z.number(),
  volumeM3: z.number(),
  boardFeet: z.number(),
  averageWidthMm: z.number(),
  minWidthMm: z.number(),
  maxWidthMm: z.number(),
  /** Weight at the last moisture reading (or 12 % when none), with the species spread. */
  weightKg: z.number(),
  weightLowKg: z.number(),
  weightHighKg: z.number(),
  weightAtMoisturePct: z.number(),
  heavyLift: z.boolean(),
  handling: z.enum(["one_person", "two_people", "mechanical_aid"]),
});
export type SlabFigures = z.infer<typeof slabFiguresSchema>;

export const moistureReadingSchema = z.object({
  id: z.string(),
  slabId: z.string(),
  readOn: z.string(),
  moistureContentPct: z.number(),
  method: z.enum(moistureMethods),
});
export type MoistureReading = z.infer<typeof moistureReadingSchema>;

export const dryingStateSchema = z.enum(["no_readings", "drying", "ready", "over_dried"]);
export type DryingState = z.infer<typeof dryingStateSchema>;

export const slabSchema = z.object({
  id: z.string(),
  logId: z.string().nullable(),
  sequenceInLog: z.number().nullable(),
  speciesSlug: z.string(),
  lengthMm: z.number(),
  thicknessMm: z.number(),
  widthStationsMm: z.array(z.number()),
  liveEdge: z.enum(liveEdges),
  surfacing: z.enum(surfacings),
  features: z.array(z.enum(slabFeatures)),
  defects: z.array(z.enum(slabDefects)),
  dryingMethod: z.enum(dryingMethods),
  kilnCompletedOn: z.string().nullable(),
  heatTreated: z.boolean(),
  heatTreatmentTemperatureC: z.number().nullable(),
  heatTreatmentMinutes: z.number().nullable(),
  notes: z.string(),
  figures: slabFiguresSchema,
  lastMoisturePct: z.number().nullable(),
  lastReadOn: z.string().nullable(),
  dryingState: dryingStateSchema,
  listingId: z.string().nullable(),
  createdAt: z.string(),
});
export type Slab = z.infer<typeof slabSchema>;

export const moistureReadingInputSchema = z.object({
  readOn: dayDone("A reading's date"),
  moistureContentPct: z
    .number({ error: "Give the moisture content in %." })
    .min(0, "Moisture content cannot be negative.")
    .max(200, "Moisture content above 200 % is not a reading."),
  method: z.enum(moistureMethods, { error: "Choose how it was measured." }),
});
export type MoistureReadingInput = z.infer<typeof moistureReadingInputSchema>;

/** A drying projection as the API returns it (from slab-math's dryingProjection). */
export const dryingProjectionSchema = z.object({
  status: z.enum(["ready", "below_target_band", "not_enough_readings", "not_drying", "target_not_reachable", "projected"]),
  projectedDate: z.string().nullable(),
  daysFromLastReading: z.number().nullable(),
  targetBand: z.object({ minimumPct: z.number(), maximumPct: z.number() }),
});
export type DryingProjectionView = z.infer<typeof dryingProjectionSchema>;

export const logListSchema = z.object({ logs: z.array(logSchema) });
/** A photo of a log or a listing, as served (WebP sizes on our own origin). */
export const photoSchema = z.object({
  id: z.string(),
  position: z.number(),
  altText: z.string(),
  width: z.number(),
  height: z.number(),
  smallUrl: z.string(),
  largeUrl: z.string(),
});
export const logDetailSchema = z.object({ log: logSchema, slabs: z.array(slabSchema), photos: z.array(photoSchema) });
export const slabListSchema = z.object({ slabs: z.array(slabSchema) });
export const slabDetailSchema = z.object({
  slab: slabSchema,
  readings: z.array(moistureReadingSchema),
  projection: dryingProjectionSchema,
});
export const csvImportResultSchema = z.object({ created: z.number() });
