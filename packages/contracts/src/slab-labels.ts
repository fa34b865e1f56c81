import type { Slab } from "./yard.ts";

type HeatTreatment = Pick<Slab, "heatTreatmentTemperatureC" | "heatTreatmentMinutes"> & {
  /** true or false as the sawyer recorded it; null or missing when it was never recorded. */
  heatTreated: boolean | null | undefined;
};

/**
 * The heat treatment as a reader sees it: "Yes: 56 °C at the core for 30 minutes", "No" when the
 * sawyer recorded no treatment, and "Not recorded" only when there is no answer at all.
 */
export function heatTreatmentLabel(slab: HeatTreatment): string {
  if (slab.heatTreated === true) {
    if (slab.heatTreatmentTemperatureC == null || slab.heatTreatmentMinutes == null) return "Yes";
    return `Yes: ${slab.heatTreatmentTemperatureC} °C at the core for ${slab.heatTreatmentMinutes} minutes`;
  }
  if (slab.heatTreated === false) return "No";
  return "Not recorded";
}
