import { mkdtempSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, describe, expect, it } from "vitest";
import { bootstrap, processesMarked, runnerEnvironment, startRunner, testPortBase } from "./runner-harness.ts";

const dataDir = mkdtempSync(join(tmpdir(), "devstack-sigint-"));
afterAll(() => rmSync(dataDir, { recursive: true, force: true }));

/** When the Ctrl-C comes: at different moments of a start, once or pressed again. */
const MOMENTS = [
  { when: "after the services are up", waitFor: /test services are up/, again: null },
  { when: "while MariaDB starts", waitFor: /starting MariaDB on/, again: null },
  { when: "after the services are up, pressed twice at once", waitFor: /test services are up/, again: 30 },
  { when: "while pnpm install runs (before the runner)", waitFor: /installing workspace dependencies/, again: null },
  { when: "after the services are up, pressed again a second later", waitFor: /test services are up/, again: 1200 },
] as const;

const ROUNDS = 10;

describe("Ctrl-C", () => {
  it(
    `stops a fresh start cleanly every time (${ROUNDS} starts, each interrupted at a different moment) and leaves nothing running`,
    { timeout: ROUNDS * 45_000, skip: process.platform !== "linux" },
    async () => {
      const env = runnerEnvironment({ GRAINYARD_TEST_PORT_BASE: String(testPortBase() + 10), GRAINYARD_DATA_DIR: dataDir, CI: "true" });
      const outcomes: string[] = [];
      for (let round = 0; round < ROUNDS; round++) {
        const moment = MOMENTS[round % MOMENTS.length]!;
        const runner = startRunner(process.execPath, [bootstrap, "services"], env);
        await runner.waitFor(moment.waitFor, 120_000);
        runner.interrupt();
        if (moment.again !== null) setTimeout(() => runner.interrupt(), moment.again);
        const exit = await Promise.race([runner.exited, new Promise<null>((r) => setTimeout(() => r(null), 60_000))]);
        const output = runner.output();
        const label = `round ${round + 1} (${moment.when})`;
        expect(exit, `${label}: the runner did not exit within 60 s after Ctrl-C; output:\n${output}`).not.toBeNull();
        expect(output, `${label}: output:\n${output}`).toMatch(/\[grainyard\] stopped cleanly/);
        expect(output, `${label}: output:\n${output}`).not.toMatch(/could not stop|✗/);
        expect(output, `${label}: escape codes in a CI log`).not.toContain("\u001b");
        expect([0, 130], `${label}: exit ${JSON.stringify(exit)}`).toContain(exit!.code);
        expect(processesMarked(runner.marker), `${label}: left running`).toEqual([]);
        outcomes.push(`${label}: stopped cleanly, exit ${exit!.code}`);
      }
      expect(outcomes).toHaveLength(ROUNDS);
    },
  );
});
