import { describe, expect, it } from "vitest";
import { heatTreatmentLabel } from "./slab-labels.ts";

describe("heatTreatmentLabel", () => {
  it("says yes with the recorded core temperature and time", () => {
    expect(heatTreatmentLabel({ heatTreated: true, heatTreatmentTemperatureC: 56, heatTreatmentMinutes: 30 })).toBe(
      "Yes: 56 °C at the core for 30 minutes",
    );
    expect(heatTreatmentLabel({ heatTreated: true, heatTreatmentTemperatureC: null, heatTreatmentMinutes: null })).toBe("Yes");
  });

  it("says no when the sawyer recorded no, and not recorded only when there is no answer", () => {
    expect(heatTreatmentLabel({ heatTreated: false, heatTreatmentTemperatureC: null, heatTreatmentMinutes: null })).toBe("No");
    expect(heatTreatmentLabel({ heatTreated: null, heatTreatmentTemperatureC: null, heatTreatmentMinutes: null })).toBe("Not recorded");
    expect(heatTreatmentLabel({ heatTreated: undefined, heatTreatmentTemperatureC: null, heatTreatmentMinutes: null })).toBe(
      "Not recorded",
    );
  });
});
