/// <reference types="vitest/config" />
import { defineConfig } from "vite";
import vue from "@vitejs/plugin-vue";
import { catalogueRouteSize } from "./route-size.ts";

const apiTarget = process.env.GRAINYARD_API_URL ?? "http://127.0.0.1:5080";

export default defineConfig({
  plugins: [vue(), catalogueRouteSize()],
  server: {
    proxy: {
      "/api": { target: apiTarget, changeOrigin: false },
    },
  },
  preview: {
    proxy: {
      "/api": { target: apiTarget, changeOrigin: false },
    },
  },
  build: {
    outDir: "dist",
    emptyOutDir: true,
    sourcemap: false,
  },
  test: {
    environment: "happy-dom",
    include: ["src/**/*.test.ts", "route-size.test.ts"],
    restoreMocks: true,
    // Mounting a whole view with its router takes a few seconds on a busy 2-core machine.
    testTimeout: 20_000,
  },
});
