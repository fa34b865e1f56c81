import type { DataSource, EntityManager } from "typeorm";
import type { Logger } from "../logger.ts";

/** How often at most a replica that cannot be reached is named in the log (it may be down for a while). */
const WARN_EVERY_MS = 30_000;

/**
 * Whether an error means the replica could not be reached (refused, dropped, taken out of the pool,
 * shutting down), as opposed to a query the server answered with an error. mysql2 gives server
 * errors an SQLSTATE; connection trouble has none, or is of class 08 (connection exception).
 */
function isUnreachable(error: unknown): boolean {
  const outer = error as { sqlState?: string; driverError?: { sqlState?: string }; code?: string };
  const sqlState = outer.driverError?.sqlState ?? outer.sqlState;
  if (sqlState === undefined) return outer.code !== undefined || outer.driverError !== undefined;
  return sqlState.startsWith("08") || sqlState === "70100";
}

/**
 * Reads that may come from a MariaDB read replica: the catalogue search, slab pages for visitors,
 * yard pages and the sitemaps, which everyone shares and which may be a moment behind. Everything
 * else reads the primary (the data source's default mode), so a user's own pages show their change
 * at once and every write goes to the primary (the replica is read-only and would refuse it).
 *
 * Without a replica configured these are the data source's own reads. A replica that cannot be
 * reached costs no answer: the read goes to the primary, with a warning in the log.
 */
export function createReplicaReads(dataSource: DataSource, logger?: Logger) {
  const replicated = "replication" in dataSource.options && Boolean(dataSource.options.replication);
  let lastWarning = 0;
  let falling = false;

  async function onReplica<T>(work: (manager: EntityManager) => Promise<T>): Promise<T> {
    const runner = dataSource.createQueryRunner("slave");
    try {
      const result = await work(runner.manager);
      if (falling) logger?.info("the read replica answers again; the catalogue reads from it");
      falling = false;
      return result;
    } finally {
      await runner.release();
    }
  }

  async function run<T>(work: (manager: EntityManager) => Promise<T>): Promise<T> {
    if (!replicated) return work(dataSource.manager);
    try {
      return await onReplica(work);
    } catch (error) {
      if (!isUnreachable(error)) throw error;
      falling = true;
      if (Date.now() - lastWarning > WARN_EVERY_MS) {
        lastWarning = Date.now();
        logger?.warn({ err: error }, "the read replica cannot be reached; the catalogue reads from the primary");
      }
      return work(dataSource.manager);
    }
  }

  return {
    /** Whether a replica is configured at all. */
    replicated,
    /** Runs `work` with a manager on the replica's connection (or the primary's, see above). */
    run,
    /** One SQL read on the replica (or the primary). */
    query<T = Record<string, unknown>>(sql: string, parameters?: unknown[]): Promise<T[]> {
      return run((manager) => manager.query(sql, parameters) as Promise<T[]>);
    },
  };
}

export type ReplicaReads = ReturnType<typeof createReplicaReads>;
