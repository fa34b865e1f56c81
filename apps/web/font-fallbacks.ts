import { generateFontFace, getMetricsForFamily } from "fontaine";
import type { Plugin } from "vite";

/**
 * fontaine writes metric-matched fallback faces ("IBM Plex Sans fallback", "Fraunces fallback")
 * over fonts it knows the metrics of: Arial, Georgia, Times New Roman. Linux has none of those
 * (Chromium's local() finds them by exact name) but has their metric-compatible twins, drawn to
 * the same widths and heights: Liberation Sans (Arial's) and Liberation Serif (Times New Roman's).
 * This adds the same faces for the twins, from the same metrics, as `virtual:linux-font-fallbacks.css`.
 */
const TWINS: { family: string; local: string; metricsOf: string; faces: { weight: number; style: "normal" | "italic" }[] }[] = [
  {
    family: "IBM Plex Sans",
    local: "Liberation Sans",
    metricsOf: "Arial",
    faces: [400, 500, 600].map((weight) => ({ weight, style: "normal" as const })),
  },
  {
    family: "Fraunces",
    local: "Liberation Serif",
    metricsOf: "Times New Roman",
    faces: [
      { weight: 600, style: "normal" },
      { weight: 400, style: "italic" },
    ],
  },
];

const MODULE = "virtual:linux-font-fallbacks.css";

async function fallbackCss(): Promise<string> {
  let css = "";
  for (const twin of TWINS) {
    const [metrics, twinMetrics] = await Promise.all([getMetricsForFamily(twin.family), getMetricsForFamily(twin.metricsOf)]);
    if (!metrics || !twinMetrics) throw new Error(`No font metrics for ${twin.family} or ${twin.metricsOf}.`);
    for (const face of twin.faces) {
      css += generateFontFace(metrics, {
        name: `${twin.family} fallback`,
        font: twin.local,
        metrics: twinMetrics,
        "font-weight": String(face.weight),
        "font-style": face.style,
      });
    }
  }
  return css;
}

export function linuxFontFallbacks(): Plugin {
  return {
    name: "grainyard-linux-font-fallbacks",
    resolveId: (id) => (id === MODULE ? `\0${MODULE}` : null),
    load: (id) => (id === `\0${MODULE}` ? fallbackCss() : null),
  };
}
