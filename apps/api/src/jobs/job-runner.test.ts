import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { JobLeaseEntity } from "../entities/index.ts";
import { createLogger } from "../logger.ts";
import { createTestDatabase } from "../test-support/test-context.ts";
import { createJobRunner, type Job } from "./job-runner.ts";

let db: Awaited<ReturnType<typeof createTestDatabase>>;
beforeAll(async () => {
  db = await createTestDatabase();
}, 60_000);
afterAll(async () => db?.drop());

const logLines: string[] = [];
const logger = createLogger("error", { write: (line: string) => void logLines.push(line) });
/** Ends the job's period at once (as if its lease ran out), without waiting. */
const expire = (name: string) =>
  db.dataSource.query("UPDATE job_lease SET expires_at = NOW(3) - INTERVAL 1 SECOND WHERE job_name = ?", [name]);

describe("scheduled jobs across instances", () => {
  it("two instances ticking the same job at the same moments run it once per period", async () => {
    const first = createJobRunner({ dataSource: db.dataSource, logger, holder: "instance-a" });
    const second = createJobRunner({ dataSource: db.dataSource, logger, holder: "instance-b" });
    const runsBy: string[] = [];
    const job = (who: string): Job => ({ name: "sweep", everyMs: 60_000, run: async () => void runsBy.push(who) });
    const [a, b] = [job("a"), job("b")];
    for (let period = 0; period < 12; period++) {
      const outcomes = await Promise.all([first.tick(a), second.tick(b), first.tick(a), second.tick(b)]);
      expect(outcomes.filter((o) => o === "ran")).toHaveLength(1);
      // Within the period, later ticks of either instance do nothing.
      expect(await second.tick(b)).toBe("skipped");
      expect(await first.tick(a)).toBe("skipped");
      await expire("sweep");
    }
    expect(runsBy).toHaveLength(12);
    expect((await db.dataSource.getRepository(JobLeaseEntity).findOneByOrFail({ jobName: "sweep" })).runs).toBe(12);
  });

  it("a failing job is logged, not thrown, and the next period runs it again; jobs have separate leases", async () => {
    const runner = createJobRunner({ dataSource: db.dataSource, logger, holder: "instance-c" });
    let calls = 0;
    const flaky: Job = {
      name: "flaky",
      everyMs: 60_000,
      run: async () => {
        calls += 1;
        if (calls === 1) throw new Error("the mail server is down");
      },
    };
    const other: Job = { name: "other", everyMs: 60_000, run: async () => undefined };
    expect(await runner.tick(flaky)).toBe("failed");
    expect(logLines.some((line) => line.includes("scheduled job failed") && line.includes("flaky"))).toBe(true);
    expect(await runner.tick(other)).toBe("ran");
    expect(await runner.tick(flaky)).toBe("skipped");
    await expire("flaky");
    expect(await runner.tick(flaky)).toBe("ran");
    expect(calls).toBe(2);
  });

  it("a tick while the same job still runs in this instance does not start it twice", async () => {
    const runner = createJobRunner({ dataSource: db.dataSource, logger, holder: "instance-d" });
    let release: (() => void) | undefined;
    const slow: Job = { name: "slow", everyMs: 60_000, run: () => new Promise<void>((resolve) => (release = resolve)) };
    const firstTick = runner.tick(slow);
    expect(await runner.tick(slow)).toBe("busy");
    await expire("slow");
    expect(await runner.tick(slow)).toBe("busy");
    await new Promise<void>((resolve) => {
      const check = () => (release ? resolve() : setImmediate(check));
      check();
    });
    release!();
    expect(await firstTick).toBe("ran");
    await runner.stop();
  });
});
