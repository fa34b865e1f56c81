import type { DataSource, EntityManager, EntitySubscriberInterface, QueryRunner, TransactionCommitEvent } from "typeorm";
import type { ReplicaReads } from "../db/read-replica.ts";
import type { Logger } from "../logger.ts";

/** How often each instance asks whether another one changed what its caches hold. */
export const INVALIDATION_POLL_MS = 500;

/**
 * Caches every API instance must drop together (the catalogue's answers and counts, the yards'
 * pickup positions). A change bumps a version row in MariaDB after its transaction commits; each
 * instance reads that row every `everyMs` (one primary-key lookup) and clears its caches when the
 * number moved, so a change made through any instance is seen through every other within about
 * half a second plus one query. The bump happens after the commit, on the transaction's own
 * connection: no row lock is held for the transaction's length, and a search cannot refill a cache
 * from data about to change. Should an instance die between its commit and its bump, the caches'
 * own lifetimes (5 s for answers, 30 s for counts and positions) still bound what others show.
 *
 * With a read replica (`reads`), the caches are filled from the replica, which applies a change a
 * moment after the primary commits it. Clearing them at the commit alone could let a search in
 * between re-cache the replica's older rows. So the version row is polled where the caches are
 * filled from, the replica: the bump is written after the change commits, so it comes later in the
 * primary's binary log, and the replica (one SQL thread, applying in the primary's commit order)
 * shows the new version only once it has applied the change itself. Every instance, the one that
 * made the change included, clears its caches again when it sees it there. Should the replica be
 * unreachable, the poll and the catalogue both read the primary.
 */
export function createSharedInvalidation(deps: {
  dataSource: DataSource;
  /** Where the caches are filled from (the replica when there is one); the version row is read there. */
  reads?: ReplicaReads;
  logger: Logger;
  /** The version row's name. */
  name: string;
  /** Called when this instance or another changed the data (after the commit). */
  onChange: () => void;
  everyMs?: number;
}) {
  const { dataSource, logger, name } = deps;
  const everyMs = deps.everyMs ?? INVALIDATION_POLL_MS;
  /** Transactions (by their query runner) that changed the data and have not committed yet. */
  const pending = new WeakSet<QueryRunner>();
  let seen: string | null = null;
  let timer: NodeJS.Timeout | null = null;
  let polling: Promise<void> | null = null;

  const bumpSql =
    "INSERT INTO cache_version (name, version, changed_at) VALUES (?, 1, NOW(3)) ON DUPLICATE KEY UPDATE version = version + 1, changed_at = NOW(3)";

  async function bump(runner: QueryRunner | DataSource): Promise<void> {
    try {
      await runner.query(bumpSql, [name]);
    } catch (error) {
      // The data committed already: a failed bump leaves other instances on their caches' own lifetimes.
      logger.error({ err: error, cache: name }, "could not announce a change to the other instances");
    }
    deps.onChange();
  }

  const subscriber: EntitySubscriberInterface = {
    async afterTransactionCommit(event: TransactionCommitEvent) {
      const runner = event.queryRunner;
      // A released savepoint also ends here; only the outermost commit makes the change visible.
      if (runner.isTransactionActive || !pending.has(runner)) return;
      pending.delete(runner);
      await bump(runner);
    },
    afterTransactionRollback(event) {
      if (!event.queryRunner.isTransactionActive) pending.delete(event.queryRunner);
    },
  };
  dataSource.subscribers.push(subscriber);

  /** Reads the version row once; clears the caches when another instance moved it. */
  async function poll(): Promise<void> {
    const sql = "SELECT version FROM cache_version WHERE name = ?";
    const rows = (await (deps.reads ? deps.reads.query(sql, [name]) : dataSource.query(sql, [name]))) as { version: string | number }[];
    const version = String(rows[0]?.version ?? "0");
    if (seen !== null && version !== seen) deps.onChange();
    seen = version;
  }

  return {
    /** A change inside a transaction (clears everywhere once it commits), or outside one (at once). */
    async changed(manager?: EntityManager): Promise<void> {
      const runner = manager?.queryRunner;
      if (runner?.isTransactionActive) pending.add(runner);
      else await bump(dataSource);
    },
    poll,
    /** Polls on a timer (which never keeps the process alive); a poll that fails is logged and tried again. */
    start() {
      if (timer) return;
      timer = setInterval(() => {
        if (polling) return;
        polling = poll()
          .catch((error: unknown) => logger.warn({ err: error, cache: name }, "could not read the shared cache version"))
          .finally(() => (polling = null));
      }, everyMs);
      timer.unref();
    },
    /** Stops the timer, waits for a poll in progress and lets go of the data source. */
    async stop() {
      if (timer) clearInterval(timer);
      timer = null;
      await polling;
      const at = dataSource.subscribers.indexOf(subscriber);
      if (at >= 0) dataSource.subscribers.splice(at, 1);
    },
  };
}
