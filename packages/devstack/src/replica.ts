import { spawn } from "node:child_process";
import { randomBytes } from "node:crypto";
import { rmSync } from "node:fs";
import { join } from "node:path";
import { relevantOutput } from "../tools.mjs";
import { say, StackError } from "./log.ts";
import { startMariadb, type RunningMariadb } from "./mariadb.ts";
import { waitUntil } from "./ports.ts";

/** GRAINYARD_REPLICA=1: `npm start` also runs a read replica for the catalogue. */
export function replicaWanted(raw = process.env.GRAINYARD_REPLICA): boolean {
  if (raw === undefined || raw === "" || raw === "0") return false;
  if (raw === "1") return true;
  throw new StackError(`GRAINYARD_REPLICA must be 1 (a read replica for the catalogue) or 0, not "${raw}".`);
}

/** The account the replica's I/O thread signs in to the primary with (REPLICATION SLAVE only). */
const REPLICATION_USER = "grainyard_replication";

function sqlString(value: string): string {
  return `'${value.replace(/\\/g, "\\\\").replace(/'/g, "\\'")}'`;
}

/** Rows of the mariadb tool's batch output (tab-separated, a header line first) as objects. */
function batchRows(output: string): Record<string, string>[] {
  const [header, ...lines] = output.split("\n").filter((line) => line !== "");
  if (!header) return [];
  const names = header.split("\t");
  return lines.map((line) => Object.fromEntries(line.split("\t").map((value, index) => [names[index] ?? String(index), value])));
}

/**
 * Copies `databases` from the primary into the replica: mariadb-dump of one consistent snapshot
 * (`--single-transaction`) that also writes where in the primary's binary log the snapshot stands
 * (`--master-data --gtid`: a `SET GLOBAL gtid_slave_pos` line), piped straight into the replica.
 */
async function seedFromDump(primary: RunningMariadb, replica: RunningMariadb, databases: string[]): Promise<void> {
  const dump = spawn(
    "mariadb-dump",
    [
      `--defaults-file=${primary.configFile}`,
      "--user=root",
      "--single-transaction",
      "--master-data=1",
      "--gtid",
      "--routines",
      "--triggers",
      "--databases",
      ...databases,
    ],
    { stdio: ["ignore", "pipe", "pipe"] },
  );
  const load = spawn("mariadb", [`--defaults-file=${replica.configFile}`, "--user=root", "--batch"], { stdio: ["pipe", "ignore", "pipe"] });
  let said = "";
  dump.stderr.on("data", (chunk: Buffer) => (said += chunk.toString()));
  load.stderr.on("data", (chunk: Buffer) => (said += chunk.toString()));
  load.stdin.on("error", () => undefined); // the loader's own exit code tells what went wrong
  dump.stdout.pipe(load.stdin);
  const exitOf = (child: ReturnType<typeof spawn>) =>
    new Promise<number>((resolvePromise) => {
      child.on("error", (error) => ((said += `${error.message}\n`), resolvePromise(-1)));
      child.on("exit", (code) => resolvePromise(code ?? -1));
    });
  const [dumped, loaded] = await Promise.all([exitOf(dump), exitOf(load)]);
  if (dumped !== 0 || loaded !== 0)
    throw new StackError(
      [
        `seeding the replica from the primary failed (mariadb-dump exit ${dumped}, mariadb exit ${loaded}):`,
        ...relevantOutput(said, 20).map((line) => `  │ ${line}`),
        "What to do: read the messages above; the replica is made afresh on the next start.",
      ].join("\n"),
    );
}

export interface RunningReplica extends RunningMariadb {
  /** The replica's `SHOW SLAVE STATUS` (empty when it follows no primary). */
  status(): Promise<Record<string, string>>;
}

/**
 * A read replica of `primary` on 127.0.0.1:`port`, from the same Debian package, with MariaDB's own
 * replication: the primary keeps a binary log with GTIDs (startMariadb with `replication: primary`),
 * the replica is seeded from a consistent dump of `databases` that records the primary's GTID
 * position, then follows the primary from exactly there (`MASTER_USE_GTID=slave_pos`), read-only.
 *
 * The replica is made afresh on every start (a few seconds): the primary may have run without a
 * binary log in between (a start without GRAINYARD_REPLICA), and a replica that missed changes
 * would silently show a different catalogue. A fresh copy from a snapshot never can.
 */
export async function startReplica(options: {
  primary: RunningMariadb;
  dir: string;
  port: number;
  appPassword: string;
  /** The app's databases on the primary to copy (they exist, migrated); later ones matching `pattern` replicate too. */
  databases: string[];
  /** A LIKE pattern of the databases the replica follows (`grainyard%` unless told). */
  pattern?: string;
  signal?: AbortSignal;
  track?: (name: string, stop: () => Promise<void>) => void;
}): Promise<RunningReplica> {
  const { primary, dir, port } = options;
  rmSync(dir, { recursive: true, force: true });
  say(`starting the read replica on 127.0.0.1:${port} (seeded from the primary)…`);
  const replica = await startMariadb({
    dir,
    port,
    appPassword: options.appPassword,
    replication: { role: "replica", serverId: 2, databases: options.pattern ?? "grainyard%" },
    name: "the MariaDB replica",
    signal: options.signal,
    track: options.track,
  });
  try {
    const password = randomBytes(18).toString("base64url");
    await primary.rootSql(
      [
        `CREATE USER IF NOT EXISTS '${REPLICATION_USER}'@'127.0.0.1' IDENTIFIED BY ${sqlString(password)};`,
        `ALTER USER '${REPLICATION_USER}'@'127.0.0.1' IDENTIFIED BY ${sqlString(password)};`,
        `GRANT REPLICATION SLAVE ON *.* TO '${REPLICATION_USER}'@'127.0.0.1';`,
      ].join(" "),
    );
    if (options.databases.length) await seedFromDump(primary, replica, options.databases);
    else {
      // Nothing to copy yet: follow the primary from where its binary log stands now.
      const [position] = batchRows(await primary.rootSql("SELECT @@GLOBAL.gtid_binlog_pos AS position"));
      await replica.rootSql(`SET GLOBAL gtid_slave_pos = ${sqlString(position?.position ?? "")};`);
    }
    await replica.rootSql(
      [
        `CHANGE MASTER TO MASTER_HOST='127.0.0.1', MASTER_PORT=${primary.endpoint.port},`,
        `MASTER_USER='${REPLICATION_USER}', MASTER_PASSWORD=${sqlString(password)},`,
        "MASTER_USE_GTID=slave_pos, MASTER_CONNECT_RETRY=1;",
        "START SLAVE;",
      ].join(" "),
    );
    const status = async () => batchRows(await replica.rootSql("SHOW SLAVE STATUS"))[0] ?? {};
    await waitUntil(
      async () => {
        const now = await status();
        // A connection error is retried every second; an error applying a change is final.
        if (now.Last_SQL_Error) throw new StackError(`the replica cannot apply the primary's changes: ${now.Last_SQL_Error}`);
        return now.Slave_IO_Running === "Yes" && now.Slave_SQL_Running === "Yes";
      },
      30_000,
      "the replica to follow the primary",
      options.signal,
    );
    say(`the read replica follows the primary (GTID, read-only); its log: ${join(dir, "error.log")}`);
    return { ...replica, status };
  } catch (error) {
    await replica.stop().catch(() => undefined);
    throw error;
  }
}
