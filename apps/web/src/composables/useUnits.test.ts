import { beforeEach, describe, expect, it } from "vitest";
import { createPinia, setActivePinia } from "pinia";
import { nextTick } from "vue";
import { convertLengthText, unitFormatter, useUnits } from "./useUnits.ts";
import { UNITS_STORAGE_KEY, unitsForRequest, useUnitsStore } from "../stores/units.ts";

// Expected values are worked by hand from the exact definitions (1 in = 25.4 mm,
// 1 lb = 0.45359237 kg; International Yard and Pound Agreement, 1959).
const metric = unitFormatter("metric");
const imperial = unitFormatter("imperial");

describe("unitFormatter: lengths", () => {
  it("shows millimetres in metric and inches to the nearest 1/16 in imperial", () => {
    expect(metric.length(612)).toBe("612 mm");
    // 612 mm = 24.094 in → 24 2/16 = 24 1/8″ (nearest sixteenth)
    expect(imperial.length(612)).toBe("24 1/8″");
    // 57 mm = 2.244 in → 2 4/16 = 2 1/4″
    expect(imperial.length(57)).toBe("2 1/4″");
  });

  it("shows a slab's length in feet and inches", () => {
    // 2438.4 mm = 96 in = 8 ft exactly
    expect(imperial.longLength(2438.4)).toBe("8′ 0″");
    expect(metric.longLength(2440)).toBe("2,440 mm");
  });

  it("writes length × width × thickness in one line", () => {
    expect(metric.dimensions(2440, 603, 57)).toBe("2,440 × 603 × 57 mm");
    expect(imperial.dimensions(2438.4, 609.6, 50.8)).toBe("8′ 0″ × 24″ × 2″");
  });
});

describe("unitFormatter: weight and volume", () => {
  it("shows kilograms or pounds", () => {
    expect(metric.weight(100)).toBe("100 kg");
    // 100 kg / 0.45359237 = 220.46 lb
    expect(imperial.weight(100)).toBe("220 lb");
    expect(metric.weightRange(48, 59)).toBe("48–59 kg");
    // 48 kg = 105.8 lb, 59 kg = 130.07 lb
    expect(imperial.weightRange(48, 59)).toBe("106–130 lb");
  });

  it("always shows board feet with the volume", () => {
    expect(metric.volume(0.0868, 36.79)).toBe("0.087 m³ · 36.8 bf");
    expect(imperial.volume(0.0868, 36.79)).toBe("36.8 bf");
  });

  it("shows area in m² or ft²", () => {
    // 1 m² = 10.7639 ft² (1 ft = 304.8 mm)
    expect(metric.area(1.5)).toBe("1.50 m²");
    expect(imperial.area(1)).toBe("10.8 ft²");
  });
});

describe("unitFormatter: reading what was typed", () => {
  it("reads millimetres as whole millimetres", () => {
    expect(metric.parseLength("612")).toEqual({ ok: true, mm: 612 });
    expect(metric.parseLength("612,6")).toEqual({ ok: true, mm: 613 });
    expect(metric.parseLength("612,6", "width", { exact: true })).toEqual({ ok: true, mm: 612.6 });
    expect(metric.parseLength("")).toEqual({ ok: "empty" });
    expect(metric.parseLength("six hundred", "width")).toEqual({ ok: false, message: "Type the width in millimetres, like 612." });
  });

  it("reads inches with fractions and stores whole millimetres", () => {
    // 24 1/8 in = 24.125 × 25.4 = 612.775 mm → 613 mm
    expect(imperial.parseLength("24 1/8")).toEqual({ ok: true, mm: 613 });
    expect(imperial.parseLength("24-1/8″")).toEqual({ ok: true, mm: 613 });
    expect(imperial.parseLength("2.25")).toEqual({ ok: true, mm: 57 });
    // A slab's measurements are kept as entered: 2 1/4″ is 57.15 mm (25.4 mm to the inch, exact by definition).
    expect(imperial.parseLength("2 1/4", "thickness", { exact: true })).toEqual({ ok: true, mm: 57.15 });
    expect(imperial.parseLength("96 1/2", "length", { exact: true })).toEqual({ ok: true, mm: 2451.1 });
    expect(imperial.parseLength("24 1/64", "width", { exact: true })).toEqual({ ok: true, mm: 609.996875 });
    const wrong = imperial.parseLength("2 1/", "thickness");
    expect(wrong.ok).toBe(false);
  });

  it("puts a stored length back into the input in the person's units", () => {
    expect(metric.lengthToInput(612)).toBe("612");
    expect(imperial.lengthToInput(612)).toBe("24 1/8");
    expect(imperial.lengthToInput(null)).toBe("");
  });

  it("rewrites typed lengths when the units change, and leaves unreadable text alone", () => {
    expect(convertLengthText("2438.4", "metric", "imperial")).toBe("96");
    // Exactly, so switching back and forth loses nothing: 2 1/4″ is 57.15 mm and 57.15 mm is 2 1/4″.
    expect(convertLengthText("2 1/4", "imperial", "metric")).toBe("57.15");
    expect(convertLengthText("57.15", "metric", "imperial")).toBe("2 1/4");
    expect(convertLengthText("abc", "metric", "imperial")).toBe("abc");
  });
});

describe("useUnits and the units store", () => {
  beforeEach(() => {
    localStorage.clear();
    setActivePinia(createPinia());
  });

  it("remembers the choice on this device", async () => {
    const units = useUnits();
    units.choose("imperial");
    await nextTick();
    expect(localStorage.getItem(UNITS_STORAGE_KEY)).toBe("imperial");
    expect(units.format.value.length(25.4)).toBe("1″");
    units.choose("metric");
    await nextTick();
    expect(localStorage.getItem(UNITS_STORAGE_KEY)).toBe("metric");
    expect(units.format.value.length(25.4)).toBe("25 mm");
  });

  it("starts from the stored choice", () => {
    localStorage.setItem(UNITS_STORAGE_KEY, "imperial");
    expect(useUnitsStore().system).toBe("imperial");
    setActivePinia(createPinia());
    localStorage.setItem(UNITS_STORAGE_KEY, "metric");
    expect(useUnitsStore().system).toBe("metric");
  });
});

describe("units of a server-rendered page", () => {
  it("follows the remembered choice, then the browser's first language", () => {
    expect(unitsForRequest("metric", "en-US,en;q=0.9")).toBe("metric");
    expect(unitsForRequest(undefined, "en-US,en;q=0.9")).toBe("imperial");
    expect(unitsForRequest(undefined, "en-CA,fr-CA;q=0.8")).toBe("metric");
    expect(unitsForRequest("furlongs", "de-DE")).toBe("metric");
    expect(unitsForRequest(undefined, undefined)).toBe("metric");
  });
});
