import { spawn, spawnSync, type ChildProcess } from "node:child_process";
import { existsSync, mkdirSync, openSync, readFileSync, renameSync, rmSync, statSync, writeFileSync } from "node:fs";
import { join } from "node:path";
import { relevantOutput, runTool } from "../tools.mjs";
import { aptInstall, needsRoot } from "./apt.ts";
import { say, StackError, ToolFailure, warn } from "./log.ts";
import { waitUntil } from "./ports.ts";

interface DatabaseEndpoint {
  host: string;
  port: number;
  user: string;
  password: string;
  database: string;
}

const SERVER_BINARY_CANDIDATES = ["/usr/sbin/mariadbd", "/usr/bin/mariadbd"];
const CLIENT_TOOLS = ["mariadb", "mariadb-admin", "mariadb-install-db"];

function onPath(name: string): string | null {
  const which = spawnSync("sh", ["-c", `command -v ${name}`], { encoding: "utf8" });
  return which.status === 0 && which.stdout.trim() ? which.stdout.trim() : null;
}

function findServerBinary(): string | null {
  for (const candidate of SERVER_BINARY_CANDIDATES) if (existsSync(candidate)) return candidate;
  return onPath("mariadbd");
}

/** Installs Debian's mariadb-server and mariadb-client when missing. Never starts the system service. */
async function ensureMariadbInstalled(signal?: AbortSignal): Promise<string> {
  const found = findServerBinary();
  if (found && CLIENT_TOOLS.every((tool) => onPath(tool))) return found;
  const packages = ["mariadb-server", "mariadb-client"];
  if (process.getuid?.() !== 0) throw needsRoot(packages, "for the local database");
  await aptInstall(packages, { why: "for the local database", noServiceStart: true, signal });
  const installed = findServerBinary();
  if (!installed)
    throw new StackError(
      "apt-get installed mariadb-server, but no mariadbd was found: run `dpkg -L mariadb-server | grep bin/` to see where it went.",
    );
  return installed;
}

/**
 * A private instance's part in MariaDB's own replication: none (one server, no binary log, as
 * always), the primary (binary log of whole rows with GTIDs), or a read-only replica of it.
 */
export type ReplicationRole = { role: "primary"; serverId: number } | { role: "replica"; serverId: number; databases: string };

/** my.cnf lines for the instance's replication role. */
function replicationSettings(dir: string, replication: ReplicationRole | undefined): string[] {
  if (!replication) return ["skip-log-bin"];
  const common = [`server_id=${replication.serverId}`, "gtid_strict_mode=1"];
  if (replication.role === "primary")
    return [
      ...common,
      `log_bin=${join(dir, "binlog")}`,
      "binlog_format=ROW",
      // The replica is seeded afresh on each start, so a day of binary log is plenty.
      "binlog_expire_logs_seconds=86400",
    ];
  return [
    ...common,
    "skip-log-bin",
    `relay_log=${join(dir, "relay")}`,
    // Only the replication thread changes data; the app's user (no READ_ONLY ADMIN) is refused any write.
    "read_only=1",
    // Replication starts once the runner has seeded it and named the primary (CHANGE MASTER TO).
    "skip-slave-start",
    // Only the app's databases (as a LIKE pattern); also covers their CREATE/DROP DATABASE.
    `replicate_wild_do_table=${replication.databases}.%`,
  ];
}

/**
 * The private instance's my.cnf. Everything is local and by address: the server listens on
 * 127.0.0.1 only and never looks names up (skip-name-resolve), the app connects over TCP to
 * 127.0.0.1, and the runner's own client tools (root) talk through the socket file.
 */
export function mariadbConfig(options: { dir: string; port: number; runAsRoot: boolean; replication?: ReplicationRole }): string {
  const { dir, port, replication } = options;
  return [
    "# Written by Grainyard's stack runner on each start (packages/devstack/src/mariadb.ts).",
    "[mysqld]",
    `datadir=${join(dir, "data")}`,
    `socket=${join(dir, "mariadb.sock")}`,
    `pid-file=${join(dir, "mariadb.pid")}`,
    `log-error=${join(dir, "error.log")}`,
    `port=${port}`,
    "bind-address=127.0.0.1",
    ...(options.runAsRoot ? ["user=root"] : []),
    "character-set-server=utf8mb4",
    "collation-server=utf8mb4_unicode_ci",
    "skip-name-resolve",
    ...replicationSettings(dir, replication),
    // Room for the national-scale benchmark catalogue (100 000 rows: about 190 MB of rows and
    // indexes) to stay in memory, as a production server's would; MariaDB takes it as needed.
    "innodb_buffer_pool_size=512M",
    "innodb_log_file_size=48M",
    "max_connections=200",
    "[client]",
    // The socket only, whatever MYSQL_HOST or a user's ~/.my.cnf says: no host name to look up.
    `socket=${join(dir, "mariadb.sock")}`,
    "protocol=socket",
    `port=${port}`,
    "",
  ].join("\n");
}

/**
 * mariadb-install-db's arguments. `--force` is the tool's own switch for a host whose name does not
 * resolve (a minimal image with no /etc/hosts): it skips the resolveip check that otherwise refuses
 * to run. `--skip-name-resolve` keeps host names out of the grant tables.
 */
export function installDbArguments(configFile: string, runAsRoot: boolean): string[] {
  return [
    `--defaults-file=${configFile}`, // must come first
    "--auth-root-authentication-method=socket",
    "--skip-test-db",
    "--force",
    "--skip-name-resolve",
    ...(runAsRoot ? ["--user=root"] : []),
  ];
}

/** What to do when MariaDB's own output shows why it failed. */
export function mariadbAdvice(output: string, dataDir: string, port: number): string {
  if (/Address already in use|Bind on TCP\/IP port/i.test(output))
    return `Port ${port} on 127.0.0.1 was taken after the check: stop whatever uses it, or choose other ports with GRAINYARD_PORT_BASE / GRAINYARD_TEST_PORT_BASE.`;
  if (/Unable to lock|Can't lock aria|lock .*ibdata1/i.test(output))
    return `Another MariaDB is using ${dataDir}: stop it (\`ps -e | grep mariadbd\`), then run the command again.`;
  if (/No space left|errno: 28/i.test(output)) return "The disk is full: free some space, then run the command again.";
  if (/Permission denied|errno: 13/i.test(output))
    return `MariaDB may not write to ${dataDir}: run as the owner of the project folder (or root), then run the command again.`;
  return `Read MariaDB's messages above; if the data folder is damaged, delete ${dataDir} (this loses the local data) and run the command again.`;
}

function isAlive(pid: number): boolean {
  try {
    process.kill(pid, 0);
    return true;
  } catch {
    return false;
  }
}

/** mariadb-admin with the instance's config (root over the socket); resolves with its output. */
function admin(configFile: string, args: string[], timeoutMs: number): Promise<{ output: string }> {
  return runTool({
    label: `mariadb-admin ${args.at(-1)}`,
    command: "mariadb-admin",
    args: [`--defaults-file=${configFile}`, "--user=root", ...args],
    announce: false,
    quietMs: Number.POSITIVE_INFINITY,
    timeoutMs,
  });
}

/**
 * Shuts down a Grainyard MariaDB left running by an earlier run of this profile that was killed
 * before it could stop it (its pid file is still in our data folder and the process is alive).
 */
export async function stopLeftoverMariadb(dir: string): Promise<void> {
  const pidFile = join(dir, "mariadb.pid");
  const configFile = join(dir, "my.cnf");
  if (!existsSync(pidFile) || !existsSync(configFile)) return;
  const pid = Number(readFileSync(pidFile, "utf8").trim());
  if (!pid || !isAlive(pid)) return;
  // Only ours: the pid may have been reused since.
  const commandLine = existsSync(`/proc/${pid}/cmdline`) ? readFileSync(`/proc/${pid}/cmdline`, "utf8") : "";
  if (!commandLine.includes(configFile)) return;
  say(`a MariaDB from an earlier run is still up (pid ${pid}); shutting it down first…`);
  const goneWithin = async (ms: number) => {
    const deadline = Date.now() + ms;
    while (isAlive(pid) && Date.now() < deadline) await new Promise((r) => setTimeout(r, 100));
    return !isAlive(pid);
  };
  await admin(configFile, ["shutdown"], 15_000).catch(() => undefined);
  if (await goneWithin(20_000)) return;
  process.kill(pid, "SIGTERM");
  if (await goneWithin(20_000)) return;
  process.kill(pid, "SIGKILL");
  warn(`the earlier MariaDB (pid ${pid}) did not stop; it was killed, and this start recovers its data.`);
  await goneWithin(10_000);
}

export interface RunningMariadb {
  endpoint: Omit<DatabaseEndpoint, "database">;
  socket: string;
  /** The instance's my.cnf (the runner's client tools reach it as root through the socket with it). */
  configFile: string;
  /** Runs SQL as root through the socket; resolves with the tool's output (tab-separated rows, a header first). */
  rootSql(sql: string): Promise<string>;
  createDatabase(name: string): Promise<void>;
  stop(): Promise<void>;
}

function sqlString(value: string): string {
  return `'${value.replace(/\\/g, "\\\\").replace(/'/g, "\\'")}'`;
}

/** The error log's lines written since `fromByte`: what this start of the server said. */
function errorLogSince(errorLog: string, fromByte: number): string {
  if (!existsSync(errorLog)) return "(MariaDB wrote no error log)";
  return readFileSync(errorLog).subarray(fromByte).toString("utf8");
}

function serverReport(headline: string, log: string, errorLog: string, advice: string): string {
  const errors = log.split("\n").filter((line) => /\[ERROR\]/.test(line));
  const shown = relevantOutput(errors.length ? [...errors, ...log.split("\n").slice(-5)].join("\n") : log, 30);
  return [
    `[grainyard] ✗ ${headline}`,
    ...shown.map((line) => `[grainyard]   │ ${line}`),
    `[grainyard]   whole log: ${errorLog}`,
    `[grainyard]   What to do: ${advice}`,
  ].join("\n");
}

/**
 * Runs a private MariaDB instance: config, data, socket and logs under `dir`, bound to
 * 127.0.0.1 on `port`. Shut down cleanly (mariadb-admin, then SIGTERM), never killed.
 */
export async function startMariadb(options: {
  dir: string;
  port: number;
  appPassword: string;
  signal?: AbortSignal;
  /** Told how to stop the server as soon as it is spawned, before it answers (a Ctrl-C may come in between). */
  track?: (name: string, stop: () => Promise<void>) => void;
  /** Binary log and GTIDs for a replica to follow, or the replica itself (see replica.ts). */
  replication?: ReplicationRole;
  /** The name the runner gives it in messages ("MariaDB" unless told). */
  name?: string;
}): Promise<RunningMariadb> {
  const serverBinary = await ensureMariadbInstalled(options.signal);
  const { dir, port, signal } = options;
  const dataDir = join(dir, "data");
  const socket = join(dir, "mariadb.sock");
  const errorLog = join(dir, "error.log");
  const configFile = join(dir, "my.cnf");
  mkdirSync(dir, { recursive: true });
  const runAsRoot = process.getuid?.() === 0;
  writeFileSync(configFile, mariadbConfig({ dir, port, runAsRoot, replication: options.replication }));
  const name = options.name ?? "MariaDB";

  if (!existsSync(join(dataDir, "mysql"))) {
    // Made in a folder of its own and renamed when complete: an interrupted initialisation
    // (Ctrl-C) leaves no half-made data folder behind for the next start to trip over.
    const making = `${dataDir}.initialising`;
    rmSync(making, { recursive: true, force: true });
    await runTool({
      label: "initialising a private MariaDB data folder (mariadb-install-db)",
      command: "mariadb-install-db",
      args: [...installDbArguments(configFile, runAsRoot), `--datadir=${making}`],
      advice: (output) => mariadbAdvice(output, dataDir, port),
      signal,
    });
    rmSync(dataDir, { recursive: true, force: true });
    renameSync(making, dataDir);
  }

  const logStart = existsSync(errorLog) ? statSync(errorLog).size : 0;
  const logFd = openSync(join(dir, "mariadbd.out"), "a");
  // Own process group, so a Ctrl-C in the terminal leaves the shutdown to us (clean, not killed).
  const server: ChildProcess = spawn(serverBinary, [`--defaults-file=${configFile}`], { detached: true, stdio: ["ignore", logFd, logFd] });
  let exited: number | null = null;
  const exit = new Promise<void>((resolvePromise) =>
    server.on("exit", (code, exitSignal) => {
      exited = code ?? (exitSignal ? 128 : -1);
      resolvePromise();
    }),
  );
  const pid = server.pid;

  const ping = () =>
    admin(configFile, ["--connect-timeout=1", "ping"], 5_000).then(
      () => true,
      () => false,
    );
  const exitWithin = async (ms: number): Promise<boolean> => {
    let timer: NodeJS.Timeout | undefined;
    await Promise.race([exit, new Promise((r) => (timer = setTimeout(r, ms)))]);
    clearTimeout(timer);
    return exited !== null;
  };
  let ready = false;

  let startGaveUp = false;
  /**
   * Stops the server and waits for it to end; runs once. A shutdown request (SIGTERM or
   * mariadb-admin) that reaches mariadbd 10.11 while it is still starting can leave it hung for
   * good, so a server interrupted while starting is first let finish starting, then shut down.
   */
  const shutDown = async (): Promise<void> => {
    const deadline = startGaveUp ? 0 : Date.now() + 30_000;
    while (exited === null && !ready && Date.now() < deadline) {
      ready = await ping();
      if (!ready) await new Promise((r) => setTimeout(r, 100));
    }
    if (exited !== null) return;
    let adminSaid: string | undefined;
    if (ready)
      await admin(configFile, ["shutdown"], 20_000).catch((error: unknown) => {
        adminSaid = (error instanceof ToolFailure ? error.output.trim() : String(error)) || "nothing";
      });
    if (!ready || adminSaid !== undefined) server.kill("SIGTERM");
    if (await exitWithin(60_000)) return;
    // Hung: nothing else ends it. InnoDB is crash-safe; the next start recovers the data.
    server.kill("SIGKILL");
    await exitWithin(10_000);
    throw new StackError(
      `MariaDB (pid ${pid}) did not stop within 60 s of its shutdown${adminSaid ? ` (mariadb-admin said: ${adminSaid})` : ""}; it was killed, and its next start recovers the data.`,
    );
  };
  let stopping: Promise<void> | undefined;
  const stopServer = (): Promise<void> => (stopping ??= shutDown());
  options.track?.(`${name} (pid ${pid})`, stopServer);

  try {
    await waitUntil(
      async () => {
        if (exited !== null) {
          const log = errorLogSince(errorLog, logStart);
          throw new StackError(
            serverReport(`MariaDB stopped while starting (exit ${exited})`, log, errorLog, mariadbAdvice(log, dataDir, port)),
          );
        }
        ready = await ping();
        return ready;
      },
      30_000,
      "MariaDB",
      signal,
    );
  } catch (error) {
    const timedOut = error instanceof StackError && !error.message.includes("\n");
    startGaveUp = timedOut; // already waited 30 s for it to answer
    await stopServer().catch(() => undefined);
    if (timedOut) {
      const log = errorLogSince(errorLog, logStart);
      throw new StackError(serverReport(`MariaDB did not answer within 30 s`, log, errorLog, mariadbAdvice(log, dataDir, port)));
    }
    throw error;
  }

  const rootSql = async (sql: string): Promise<string> => {
    const { stdout } = await runTool({
      label: "a set-up statement for MariaDB",
      command: "mariadb",
      args: [`--defaults-file=${configFile}`, "--user=root", "--batch", "-e", sql],
      announce: false,
      quietMs: Number.POSITIVE_INFINITY,
      advice: () =>
        `MariaDB refused the statement; read its message above, then run the command again (deleting ${dataDir} starts from empty).`,
    });
    return stdout;
  };
  try {
    // The app connects over TCP to 127.0.0.1 as its own user, with rights on the grainyard* databases only.
    await rootSql(
      [
        `CREATE USER IF NOT EXISTS 'grainyard'@'127.0.0.1' IDENTIFIED BY ${sqlString(options.appPassword)};`,
        `ALTER USER 'grainyard'@'127.0.0.1' IDENTIFIED BY ${sqlString(options.appPassword)};`,
        "GRANT ALL PRIVILEGES ON `grainyard%`.* TO 'grainyard'@'127.0.0.1';",
        "FLUSH PRIVILEGES;",
      ].join(" "),
    );
  } catch (error) {
    await stopServer().catch(() => undefined);
    throw error;
  }

  return {
    endpoint: { host: "127.0.0.1", port, user: "grainyard", password: options.appPassword },
    socket,
    configFile,
    rootSql,
    async createDatabase(name: string) {
      if (!/^grainyard[a-z0-9_]*$/.test(name)) throw new StackError(`refusing to create database "${name}".`);
      await rootSql(`CREATE DATABASE IF NOT EXISTS \`${name}\` CHARACTER SET utf8mb4 COLLATE utf8mb4_unicode_ci;`);
    },
    stop: stopServer,
  };
}
