import { hostname } from "node:os";
import { randomUUID } from "node:crypto";
import type { DataSource } from "typeorm";
import { JobLeaseEntity } from "../entities/index.ts";
import type { Logger } from "../logger.ts";

/** Work that runs on a schedule, once per period across every API instance. */
export interface Job {
  name: string;
  everyMs: number;
  run(): Promise<void>;
}

export type TickOutcome = "ran" | "failed" | "skipped" | "busy";

/**
 * Runs scheduled jobs. Every instance ticks each job on its own timer; a tick first takes the
 * job's lease in MariaDB — a conditional update of an expired lease, or the first insert — and
 * runs the job only if it got it. The lease lasts most of a period and is not handed back early,
 * so in any one period one instance runs the job, whatever the others' timers do. Times are the
 * database's, so instances need not agree on their clocks.
 */
export function createJobRunner(deps: { dataSource: DataSource; logger: Logger; holder?: string }) {
  const holder = deps.holder ?? `${hostname()}:${process.pid}:${randomUUID().slice(0, 8)}`;
  const running = new Map<string, Promise<TickOutcome>>();
  const timers: NodeJS.Timeout[] = [];
  const leases = () => deps.dataSource.getRepository(JobLeaseEntity);

  async function claim(job: Job): Promise<boolean> {
    const leaseMicroseconds = Math.max(1_000, Math.floor(job.everyMs * 0.9)) * 1_000;
    const until = () => `NOW(3) + INTERVAL ${leaseMicroseconds} MICROSECOND`;
    const taken = await leases()
      .createQueryBuilder()
      .update()
      .set({ holder, expiresAt: until, runs: () => "runs + 1" })
      .where("job_name = :name AND expires_at <= NOW(3)", { name: job.name })
      .execute();
    if (taken.affected === 1) return true;
    try {
      await leases().createQueryBuilder().insert().values({ jobName: job.name, holder, expiresAt: until, runs: 1 }).execute();
      return true;
    } catch (error) {
      if ((error as { code?: string }).code === "ER_DUP_ENTRY") return false; // another instance holds it
      throw error;
    }
  }

  /** One tick of a job: runs it if this instance gets the lease. Never throws (failures are logged). */
  function tick(job: Job): Promise<TickOutcome> {
    const current = running.get(job.name);
    if (current) return Promise.resolve("busy");
    const attempt = (async (): Promise<TickOutcome> => {
      try {
        if (!(await claim(job))) return "skipped";
      } catch (error) {
        deps.logger.error({ err: error, job: job.name }, "could not take the job's lease");
        return "failed";
      }
      try {
        await job.run();
        return "ran";
      } catch (error) {
        deps.logger.error({ err: error, job: job.name }, "scheduled job failed");
        return "failed";
      }
    })().finally(() => running.delete(job.name));
    running.set(job.name, attempt);
    return attempt;
  }

  return {
    holder,
    tick,
    /** Ticks each job on its own timer (which never keeps the process alive). */
    start(jobs: Job[]) {
      for (const job of jobs) {
        const timer = setInterval(() => void tick(job), job.everyMs);
        timer.unref();
        timers.push(timer);
      }
    },
    /** Stops the timers and waits for runs in progress. */
    async stop() {
      for (const timer of timers.splice(0)) clearInterval(timer);
      await Promise.all(running.values());
    },
  };
}
