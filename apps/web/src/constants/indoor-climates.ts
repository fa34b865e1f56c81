import type { IndoorClimate } from "@grainyard/slab-math";

/**
 * Indoor climates a buyer can pick for the seasonal movement forecast. Round, typical figures for
 * homes in a temperate climate with heating in winter (common practice; not a measurement of any
 * one house). People can enter their own.
 */
export interface ClimatePreset {
  id: string;
  label: string;
  summer: IndoorClimate;
  winter: IndoorClimate;
}

export const CLIMATE_PRESETS: readonly ClimatePreset[] = Object.freeze([
  {
    id: "heated-home",
    label: "Humid summers, heated winters",
    summer: { temperatureC: 24, relativeHumidityPct: 65 },
    winter: { temperatureC: 20, relativeHumidityPct: 30 },
  },
  {
    id: "air-conditioned",
    label: "Air-conditioned summers, humidified winters",
    summer: { temperatureC: 22, relativeHumidityPct: 50 },
    winter: { temperatureC: 21, relativeHumidityPct: 40 },
  },
  {
    id: "dry-winters",
    label: "Humid summers, very dry winters (wood stove, cold climate)",
    summer: { temperatureC: 24, relativeHumidityPct: 65 },
    winter: { temperatureC: 21, relativeHumidityPct: 20 },
  },
]);
