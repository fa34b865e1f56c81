import { spawn } from "node:child_process";
import { createReadStream, createWriteStream, mkdtempSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import type { AppConfig } from "../config.ts";

/*
 * Debian's MariaDB client tools (`mariadb-dump`, `mariadb`), run as the app's database user over TCP.
 * The connection settings go in an option file of their own (mode 0600, deleted afterwards) passed as
 * `--defaults-file`, so the password is never on a command line and no ~/.my.cnf or /etc/mysql setting
 * changes where the tools connect.
 */

type DatabaseSettings = AppConfig["database"];

function optionFile(database: DatabaseSettings): { file: string; remove(): void } {
  const dir = mkdtempSync(join(tmpdir(), "grainyard-db-"));
  const file = join(dir, "client.cnf");
  const quoted = (value: string) => `"${value.replace(/\\/g, "\\\\").replace(/"/g, '\\"')}"`;
  writeFileSync(
    file,
    [
      "[client]",
      `host=${database.host}`,
      `port=${database.port}`,
      `user=${quoted(database.user)}`,
      `password=${quoted(database.password)}`,
      "protocol=tcp",
      "default-character-set=utf8mb4",
      "",
    ].join("\n"),
    { mode: 0o600 },
  );
  return { file, remove: () => rmSync(dir, { recursive: true, force: true }) };
}

/** Runs a client tool; stdin from `input` (a file) and stdout into `output` (a file) when given. */
async function runClientTool(
  command: string,
  database: DatabaseSettings,
  args: string[],
  files: { input?: string; output?: string } = {},
): Promise<string> {
  const options = optionFile(database);
  try {
    return await new Promise<string>((resolve, reject) => {
      // --defaults-file must come first.
      const child = spawn(command, [`--defaults-file=${options.file}`, ...args], { stdio: ["pipe", "pipe", "pipe"] });
      let stderr = "";
      let stdout = "";
      child.stderr.on("data", (chunk: Buffer) => (stderr += chunk.toString("utf8")));
      // The file is complete only once its stream has flushed, which may come after the tool exits.
      const written = files.output
        ? new Promise<void>((done, failed) => child.stdout.pipe(createWriteStream(files.output!)).on("close", done).on("error", failed))
        : Promise.resolve();
      if (!files.output) child.stdout.on("data", (chunk: Buffer) => (stdout += chunk.toString("utf8")));
      if (files.input) createReadStream(files.input).pipe(child.stdin);
      else child.stdin.end();
      child.on("error", (error: NodeJS.ErrnoException) =>
        reject(
          new Error(
            error.code === "ENOENT"
              ? `${command} is not installed: apt-get install mariadb-client (Debian's MariaDB client tools)`
              : `${command} could not start: ${error.message}`,
          ),
        ),
      );
      child.on("close", (code) => {
        if (code === 0) written.then(() => resolve(stdout), reject);
        else reject(new Error(`${command} failed (exit ${code}): ${stderr.trim() || "no message"}`));
      });
    });
  } finally {
    options.remove();
  }
}

/** The tool's version line, for the manifest. */
export async function toolVersion(command: "mariadb-dump" | "mariadb"): Promise<string> {
  return new Promise((resolve) => {
    const child = spawn(command, ["--version"]);
    let out = "";
    child.stdout.on("data", (chunk: Buffer) => (out += chunk.toString("utf8")));
    child.on("error", () => resolve("unknown"));
    child.on("close", () => resolve(out.trim() || "unknown"));
  });
}

/**
 * A consistent dump of one database into `file`: `--single-transaction` reads every InnoDB table in
 * one snapshot without locking writers out; routines and triggers are kept; no CREATE DATABASE, so
 * the dump loads into whatever database the restore names.
 */
export async function dumpDatabase(database: DatabaseSettings, file: string): Promise<void> {
  await runClientTool(
    "mariadb-dump",
    database,
    [
      "--single-transaction",
      "--quick",
      "--routines",
      "--triggers",
      "--hex-blob",
      "--no-tablespaces",
      "--skip-add-locks",
      "--default-character-set=utf8mb4",
      database.database,
    ],
    { output: file },
  );
}

/** Drops and recreates the database (utf8mb4, as the stack makes it), then loads the dump with the `mariadb` client. */
export async function loadDatabase(database: DatabaseSettings, file: string): Promise<void> {
  const name = database.database.replace(/`/g, "``");
  await runClientTool("mariadb", database, [
    "--batch",
    "-e",
    `DROP DATABASE IF EXISTS \`${name}\`; CREATE DATABASE \`${name}\` CHARACTER SET utf8mb4 COLLATE utf8mb4_unicode_ci;`,
  ]);
  await runClientTool("mariadb", database, ["--batch", database.database], { input: file });
}
