/// <reference types="vitest/config" />
import { defineConfig } from "vite";
import vue from "@vitejs/plugin-vue";
import { FontaineTransform } from "fontaine";
import { VitePWA } from "vite-plugin-pwa";
import { appShell } from "./app-shell.ts";
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
    !isSsrBuild && appShell(),
    // The sawyer's installable app: a manifest and a service worker (registered for sawyers, entry-client.ts).
    !isSsrBuild &&
      VitePWA({
        registerType: "autoUpdate",
        // entry-client registers it (no inline script under script-src 'self').
        injectRegister: null,
        manifest: {
          id: "/",
          name: "Grainyard — your yard",
          short_name: "Grainyard",
          description: "Your slab yard in your pocket: logs, slabs, moisture readings and listings, drafts that survive a lost connection.",
          start_url: "/yard",
          scope: "/",
          display: "standalone",
          orientation: "portrait",
          background_color: "#f6f1e8",
          theme_color: "#3d5a31",
          categories: ["business", "shopping"],
          icons: [
            { src: "/icons/icon-192.png", sizes: "192x192", type: "image/png" },
            { src: "/icons/icon-512.png", sizes: "512x512", type: "image/png" },
            { src: "/icons/icon-maskable-512.png", sizes: "512x512", type: "image/png", purpose: "maskable" },
          ],
        },
        workbox: {
          // The app's own files and the shell; never the page template, never anything from the API
          // (answers there can be personal: nothing under /api/ is cached, not even photos).
          globPatterns: ["**/*.{js,css,woff2,svg,png}", "app-shell.html"],
          globIgnores: ["index.html", ".vite/**"],
          // Pages come from the server (rendered or the shell, never a cached copy); only without a
          // connection does the saved shell answer, and the app draws the page.
          navigateFallback: null,
          runtimeCaching: [
            {
              urlPattern: ({ request }) => request.mode === "navigate",
              handler: "NetworkOnly",
              options: { precacheFallback: { fallbackURL: "/app-shell.html" } },
            },
          ],
          cleanupOutdatedCaches: true,
          clientsClaim: true,
          skipWaiting: true,
        },
      }),
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
    // Mounting a whole view with its router takes a few seconds on a busy 2-core machine.
    testTimeout: 20_000,
  },
}));
