/**
 * The slab form's state and rules: what was typed (in the sawyer's units, rewritten when the units
 * change so nothing is lost), what it means in millimetres exactly as entered, slab-math's figures
 * as they type, the input for the shared schema, and the first field to look at after a refusal.
 */
import { computed, reactive, ref, watch } from "vue";
import type { dryingMethods, liveEdges, slabDefects, slabFeatures, Slab, surfacings } from "@grainyard/contracts";
import { useFormErrors } from "./useFormErrors.ts";
import { useSlabFigures } from "./useSlabFigures.ts";
import { convertLengthText, useUnits } from "./useUnits.ts";

type Choice<T extends string> = T | "";
export interface SlabFormState {
  logId: string;
  sequence: string;
  speciesSlug: string;
  length: string;
  thickness: string;
  widths: string[];
  liveEdge: Choice<(typeof liveEdges)[number]>;
  surfacing: Choice<(typeof surfacings)[number]>;
  features: (typeof slabFeatures)[number][];
  defects: (typeof slabDefects)[number][];
  dryingMethod: Choice<(typeof dryingMethods)[number]>;
  kilnCompletedOn: string;
  heatTreated: boolean;
  heatTemperature: string;
  heatMinutes: string;
  notes: string;
  units: "metric" | "imperial";
}

function emptyForm(units: "metric" | "imperial"): SlabFormState {
  return {
    logId: "",
    sequence: "",
    speciesSlug: "",
    length: "",
    thickness: "",
    widths: ["", "", ""],
    liveEdge: "",
    surfacing: "",
    features: [],
    defects: [],
    dryingMethod: "",
    kilnCompletedOn: "",
    heatTreated: false,
    heatTemperature: "",
    heatMinutes: "",
    notes: "",
    units,
  };
}

export const MIN_STATIONS = 2;
export const MAX_STATIONS = 25;

export function useSlabForm() {
  const { format, system } = useUnits();
  const form = reactive<SlabFormState>(emptyForm(system.value));
  const errors = useFormErrors();
  const lastMoisturePct = ref<number | null>(null);

  function fill(slab: Slab) {
    const units = format.value;
    Object.assign(form, {
      logId: slab.logId ?? "",
      sequence: slab.sequenceInLog != null ? String(slab.sequenceInLog) : "",
      speciesSlug: slab.speciesSlug,
      length: units.lengthToInput(slab.lengthMm),
      thickness: units.lengthToInput(slab.thicknessMm),
      widths: slab.widthStationsMm.map((width) => units.lengthToInput(width)),
      liveEdge: slab.liveEdge,
      surfacing: slab.surfacing,
      features: [...slab.features],
      defects: [...slab.defects],
      dryingMethod: slab.dryingMethod,
      kilnCompletedOn: slab.kilnCompletedOn ?? "",
      heatTreated: slab.heatTreated,
      heatTemperature: slab.heatTreatmentTemperatureC != null ? String(slab.heatTreatmentTemperatureC) : "",
      heatMinutes: slab.heatTreatmentMinutes != null ? String(slab.heatTreatmentMinutes) : "",
      notes: slab.notes,
      units: system.value,
    });
    lastMoisturePct.value = slab.lastMoisturePct;
  }

  // Switching units rewrites what was typed, so nothing is lost.
  watch(system, (next, previous) => {
    form.length = convertLengthText(form.length, previous, next);
    form.thickness = convertLengthText(form.thickness, previous, next);
    form.widths = form.widths.map((width) => convertLengthText(width, previous, next));
    form.units = next;
  });

  // What the typed text means in millimetres, exactly as entered (null when empty or unreadable).
  function mm(text: string, label: string) {
    return format.value.parseLength(text, label, { exact: true });
  }
  const parsed = computed(() => ({
    length: mm(form.length, "length"),
    thickness: mm(form.thickness, "thickness"),
    widths: form.widths.map((width) => mm(width, "width")),
  }));
  const valueOf = (result: ReturnType<typeof mm>) => (result.ok === true ? result.mm : null);

  const figureInput = computed(() => ({
    speciesSlug: form.speciesSlug,
    lengthMm: valueOf(parsed.value.length),
    thicknessMm: valueOf(parsed.value.thickness),
    widthStationsMm: parsed.value.widths.map(valueOf),
    moisturePct: lastMoisturePct.value,
  }));
  const live = useSlabFigures(figureInput);

  /** A field's message: the schema's or the API's first, then slab-math's live objection. */

  /** A field's message: the schema's or the API's first, then slab-math's live objection. */
  function messageFor(field: string): string | undefined {
    return errors.fields[field] ?? (live.value.problem?.field === field ? live.value.problem.message : undefined);
  }

  const isKiln = computed(() => form.dryingMethod === "kiln" || form.dryingMethod === "air_then_kiln");

  const lengthHint = computed(() => (format.value.imperial ? "Inches, like 96 1/2 (or 96.5)." : "Millimetres, end to end."));

  function toNumber(text: string): number | null {
    const trimmed = text.trim().replace(",", ".");
    if (trimmed === "") return null;
    const value = Number(trimmed);
    return Number.isFinite(value) ? value : Number.NaN;
  }

  function values(): { input: Record<string, unknown>; unitErrors: Record<string, string> } {
    const unitErrors: Record<string, string> = {};
    const { length, thickness, widths } = parsed.value;
    if (length.ok === false) unitErrors.lengthMm = length.message;
    if (thickness.ok === false) unitErrors.thicknessMm = thickness.message;
    widths.forEach((width, index) => {
      if (width.ok === false) unitErrors[`widthStationsMm.${index}`] = width.message;
      if (width.ok === "empty") unitErrors[`widthStationsMm.${index}`] = `Type width ${index + 1}, or remove this measurement.`;
    });
    const sequence = toNumber(form.sequence);
    return {
      unitErrors,
      input: {
        logId: form.logId || null,
        sequenceInLog: sequence,
        speciesSlug: form.speciesSlug || undefined,
        lengthMm: valueOf(length) ?? undefined,
        thicknessMm: valueOf(thickness) ?? undefined,
        widthStationsMm: widths.map((width) => valueOf(width) ?? 0),
        liveEdge: form.liveEdge || undefined,
        surfacing: form.surfacing || undefined,
        features: form.features,
        defects: form.defects,
        dryingMethod: form.dryingMethod || undefined,
        kilnCompletedOn: isKiln.value && form.kilnCompletedOn ? form.kilnCompletedOn : null,
        heatTreated: form.heatTreated,
        heatTreatmentTemperatureC: form.heatTreated ? toNumber(form.heatTemperature) : null,
        heatTreatmentMinutes: form.heatTreated ? toNumber(form.heatMinutes) : null,
        notes: form.notes,
      },
    };
  }

  const fieldOrder = [
    "logId",
    "sequenceInLog",
    "speciesSlug",
    "lengthMm",
    "thicknessMm",
    ...Array.from({ length: MAX_STATIONS }, (_, index) => `widthStationsMm.${index}`),
    "widthStationsMm",
    "liveEdge",
    "surfacing",
    "dryingMethod",
    "kilnCompletedOn",
    "heatTreatmentTemperatureC",
    "heatTreatmentMinutes",
    "notes",
  ];
  const fieldIds: Record<string, string> = {
    widthStationsMm: "width-0",
    liveEdge: "liveEdge-0",
    surfacing: "surfacing-0",
    heatTreatmentMinutes: "heatTreatmentMinutes",
  };
  function focusFirstError() {
    const first = fieldOrder.find((key) => errors.fields[key]);
    if (!first) return;
    const station = /^widthStationsMm\.(\d+)$/.exec(first);
    const id = station ? `width-${station[1]}` : (fieldIds[first] ?? first);
    document.getElementById(id)?.focus();
  }

  /** Empty again (start over). */
  function reset() {
    Object.assign(form, emptyForm(system.value));
    errors.clear();
  }

  /** A draft kept on this phone, its lengths rewritten into the units in use now. */
  function restore(saved: SlabFormState) {
    const units = saved.units ?? system.value;
    Object.assign(form, emptyForm(system.value), saved, {
      length: convertLengthText(saved.length, units, system.value),
      thickness: convertLengthText(saved.thickness, units, system.value),
      widths: saved.widths.map((width) => convertLengthText(width, units, system.value)),
      units: system.value,
    });
  }

  return { form, errors, format, fill, figureInput, live, messageFor, lengthHint, values, focusFirstError, reset, restore };
}
