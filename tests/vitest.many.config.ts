import { defineConfig } from "vitest/config";

/** The several-instances suite: three API processes behind HAProxy on the test stack (npm test starts them). */
export default defineConfig({
  test: {
    include: ["many/**/*.many.test.ts"],
    testTimeout: 60_000,
    hookTimeout: 60_000,
    fileParallelism: false,
  },
});
