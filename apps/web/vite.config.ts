/// <reference types="vitest/config" />
import { defineConfig } from "vite";
import vue from "@vitejs/plugin-vue";
import { FontaineTransform } from "fontaine";
import { linuxFontFallbacks } from "./font-fallbacks.ts";
import { catalogueRouteSize } from "./route-size.ts";

const apiTarget = process.env.GRAINYARD_API_URL ?? "http://127.0.0.1:5080";

/**
 * Two builds (see package.json): the browser's (dist/client, with the manifests the server uses
 * for preload links) and the server's render (dist/server/entry-server.js, every dependency
 * bundled in, so the API can run it without the web app's node_modules).
 */
export default defineConfig(({ command, isSsrBuild }) => ({
  plugins: [
    vue(),
    // Metric-matched local fallbacks ("IBM Plex Sans fallback", "Fraunces fallback"): text set in them
    // takes the same room as in the web font, so nothing moves when the fonts arrive.
    FontaineTransform.vite({
      fallbacks: {
        "IBM Plex Sans": ["Arial", "Roboto", "Helvetica Neue"],
        Fraunces: ["Georgia", "Times New Roman"],
      },
    }),
    linuxFontFallbacks(),
    !isSsrBuild && catalogueRouteSize(),
  ],
  server: {
    proxy: {
      "/api": { target: apiTarget, changeOrigin: false },
    },
  },
  ssr: {
    // Built: self-contained. In development (Vite inside the API) only the packages Node cannot
    // load as they are published (Naive UI's CommonJS main and its helpers) go through Vite.
    noExternal:
      command === "build"
        ? true
        : [
            "naive-ui",
            "vueuc",
            "vooks",
            "evtd",
            "seemly",
            "treemate",
            "css-render",
            "@css-render/plugin-bem",
            "@css-render/vue3-ssr",
            "date-fns",
            "date-fns-tz",
          ],
  },
  build: {
    emptyOutDir: true,
    sourcemap: false,
    manifest: !isSsrBuild,
    ssrManifest: !isSsrBuild,
  },
  test: {
    environment: "happy-dom",
    include: ["src/**/*.test.ts", "route-size.test.ts"],
    restoreMocks: true,
  },
}));
