import { defineConfig } from "vitest/config";

export default defineConfig({
  test: {
    include: ["src/**/*.test.ts"],
    // Needs a primary and a replica of its own (vitest.replica.config.ts; npm test runs it as its own suite).
    exclude: ["src/**/*.replica.test.ts", "**/node_modules/**"],
    testTimeout: 20_000,
    hookTimeout: 60_000,
  },
});
