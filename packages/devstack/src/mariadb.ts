import { spawn, spawnSync, type ChildProcess } from "node:child_process";
import { existsSync, mkdirSync, openSync, readFileSync, writeFileSync } from "node:fs";
import { join } from "node:path";
import { say, StackError } from "./log.ts";
import { waitUntil } from "./ports.ts";

interface DatabaseEndpoint {
  host: string;
  port: number;
  user: string;
  password: string;
  database: string;
}

const SERVER_BINARY_CANDIDATES = ["/usr/sbin/mariadbd", "/usr/bin/mariadbd"];

function findServerBinary(): string | null {
  for (const candidate of SERVER_BINARY_CANDIDATES) if (existsSync(candidate)) return candidate;
  const which = spawnSync("sh", ["-c", "command -v mariadbd"], { encoding: "utf8" });
  return which.status === 0 && which.stdout.trim() ? which.stdout.trim() : null;
}

/** Installs Debian's mariadb-server when `mariadbd` is missing. Never starts the system service. */
function ensureMariadbInstalled(): string {
  const found = findServerBinary();
  if (found) return found;
  if (process.getuid?.() !== 0) {
    throw new StackError("MariaDB is not installed and this is not root: run `apt-get install -y mariadb-server` once, then start again.");
  }
  say("installing Debian's mariadb-server (about a minute, once)…");
  // policy-rc.d answering 101 keeps apt from starting the system instance; we only run our own.
  const script = [
    "set -e",
    "export DEBIAN_FRONTEND=noninteractive",
    "created_policy=0",
    "if [ ! -e /usr/sbin/policy-rc.d ]; then printf '#!/bin/sh\\nexit 101\\n' > /usr/sbin/policy-rc.d; chmod +x /usr/sbin/policy-rc.d; created_policy=1; fi",
    "apt-get update -qq",
    "apt-get install -y -qq mariadb-server mariadb-client >/dev/null",
    'if [ "$created_policy" = 1 ]; then rm -f /usr/sbin/policy-rc.d; fi',
  ].join("\n");
  const result = spawnSync("sh", ["-c", script], { stdio: ["ignore", "inherit", "inherit"] });
  const installed = findServerBinary();
  if (result.status !== 0 || !installed) throw new StackError(`apt-get could not install mariadb-server (exit ${result.status}).`);
  return installed;
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
  say(`a MariaDB from an earlier run is still up (pid ${pid}); shutting it down first…`);
  spawnSync("mariadb-admin", [`--defaults-file=${configFile}`, "--user=root", "shutdown"], { encoding: "utf8", timeout: 15_000 });
  try {
    await waitUntil(async () => !isAlive(pid), 20_000, "the earlier MariaDB shutdown");
  } catch {
    process.kill(pid, "SIGTERM");
    await waitUntil(async () => !isAlive(pid), 20_000, "the earlier MariaDB shutdown");
  }
}

export interface RunningMariadb {
  endpoint: Omit<DatabaseEndpoint, "database">;
  socket: string;
  createDatabase(name: string): void;
  stop(): Promise<void>;
}

function sqlString(value: string): string {
  return `'${value.replace(/\\/g, "\\\\").replace(/'/g, "\\'")}'`;
}

/**
 * Runs a private MariaDB instance: config, data, socket and logs under `dir`, bound to
 * 127.0.0.1 on `port`. Shut down cleanly with mariadb-admin, never killed.
 */
export async function startMariadb(options: { dir: string; port: number; appPassword: string }): Promise<RunningMariadb> {
  const serverBinary = ensureMariadbInstalled();
  const { dir, port } = options;
  const dataDir = join(dir, "data");
  const socket = join(dir, "mariadb.sock");
  const pidFile = join(dir, "mariadb.pid");
  const errorLog = join(dir, "error.log");
  const configFile = join(dir, "my.cnf");
  mkdirSync(dir, { recursive: true });
  const runAsRoot = process.getuid?.() === 0;
  writeFileSync(
    configFile,
    [
      "[mysqld]",
      `datadir=${dataDir}`,
      `socket=${socket}`,
      `pid-file=${pidFile}`,
      `log-error=${errorLog}`,
      `port=${port}`,
      "bind-address=127.0.0.1",
      ...(runAsRoot ? ["user=root"] : []),
      "character-set-server=utf8mb4",
      "collation-server=utf8mb4_unicode_ci",
      "skip-name-resolve",
      "skip-log-bin",
      // Room for the national-scale benchmark catalogue (100 000 rows: about 190 MB of rows and
      // indexes) to stay in memory, as a production server's would; MariaDB takes it as needed.
      "innodb_buffer_pool_size=512M",
      "innodb_log_file_size=48M",
      "max_connections=200",
      "[client]",
      `socket=${socket}`,
      `port=${port}`,
      "",
    ].join("\n"),
  );

  const admin = (args: string[]) =>
    spawnSync("mariadb-admin", [`--defaults-file=${configFile}`, "--user=root", ...args], { encoding: "utf8", timeout: 15_000 });

  if (!existsSync(join(dataDir, "mysql"))) {
    say("initialising a private MariaDB data folder…");
    const init = spawnSync(
      "mariadb-install-db",
      [
        `--defaults-file=${configFile}`,
        "--auth-root-authentication-method=socket",
        "--skip-test-db",
        ...(runAsRoot ? ["--user=root"] : []),
      ],
      { encoding: "utf8" },
    );
    if (init.status !== 0) {
      throw new StackError(`MariaDB could not initialise its data folder ${dataDir}: ${lastLine(init.stderr || init.stdout)}`);
    }
  }

  const logFd = openSync(join(dir, "mariadbd.out"), "a");
  // Own process group, so a Ctrl-C in the terminal leaves the shutdown to us (clean, not killed).
  const server: ChildProcess = spawn(serverBinary, [`--defaults-file=${configFile}`], { detached: true, stdio: ["ignore", logFd, logFd] });
  let exited: number | null = null;
  server.on("exit", (code) => (exited = code ?? -1));
  try {
    await waitUntil(
      async () => {
        if (exited !== null) throw new StackError(`MariaDB stopped while starting (exit ${exited}): ${lastErrorLine(errorLog)}`);
        return admin(["--connect-timeout=1", "ping"]).status === 0;
      },
      30_000,
      "MariaDB",
    );
  } catch (error) {
    if (exited === null) server.kill("SIGTERM");
    if (error instanceof StackError && exited !== null)
      throw new StackError(`MariaDB stopped while starting (exit ${exited}): ${lastErrorLine(errorLog)}`);
    throw error;
  }

  const rootSql = (sql: string) => {
    const result = spawnSync("mariadb", [`--defaults-file=${configFile}`, "--user=root", "--batch", "-e", sql], { encoding: "utf8" });
    if (result.status !== 0) throw new StackError(`MariaDB refused a set-up statement: ${lastLine(result.stderr)}`);
  };
  // The app connects over TCP as its own user, with rights on the grainyard* databases only.
  rootSql(
    [
      `CREATE USER IF NOT EXISTS 'grainyard'@'127.0.0.1' IDENTIFIED BY ${sqlString(options.appPassword)};`,
      `ALTER USER 'grainyard'@'127.0.0.1' IDENTIFIED BY ${sqlString(options.appPassword)};`,
      "GRANT ALL PRIVILEGES ON `grainyard%`.* TO 'grainyard'@'127.0.0.1';",
      "FLUSH PRIVILEGES;",
    ].join(" "),
  );

  return {
    endpoint: { host: "127.0.0.1", port, user: "grainyard", password: options.appPassword },
    socket,
    createDatabase(name: string) {
      if (!/^grainyard[a-z0-9_]*$/.test(name)) throw new StackError(`refusing to create database "${name}".`);
      rootSql(`CREATE DATABASE IF NOT EXISTS \`${name}\` CHARACTER SET utf8mb4 COLLATE utf8mb4_unicode_ci;`);
    },
    async stop() {
      if (exited !== null) return;
      const pid = server.pid;
      const result = admin(["shutdown"]);
      if (result.status !== 0 && pid) process.kill(pid, "SIGTERM");
      await waitUntil(async () => exited !== null, 30_000, "MariaDB shutdown").catch(() => undefined);
    },
  };
}

function isAlive(pid: number): boolean {
  try {
    process.kill(pid, 0);
    return true;
  } catch {
    return false;
  }
}

function lastLine(text: string | undefined): string {
  const lines = (text ?? "").trim().split("\n").filter(Boolean);
  return lines.at(-1) ?? "no message";
}

function lastErrorLine(errorLog: string): string {
  if (!existsSync(errorLog)) return "no error log was written";
  const lines = readFileSync(errorLog, "utf8").trim().split("\n");
  const errors = lines.filter((line) => /\[ERROR\]/.test(line));
  return (errors.at(-1) ?? lines.at(-1) ?? "no message").replace(/^.*\[ERROR\]\s*/, "");
}
