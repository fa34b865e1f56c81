import { defineConfig } from "vitest/config";

/** The read-replica suite: `npm test` starts a MariaDB primary with a binary log and a replica following it, and points it at them. */
export default defineConfig({
  test: {
    include: ["src/**/*.replica.test.ts"],
    testTimeout: 30_000,
    hookTimeout: 60_000,
  },
});
