import { spawn, spawnSync } from "node:child_process";
import { mkdtempSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, describe, expect, it } from "vitest";
import { installDbArguments, mariadbAdvice, mariadbConfig } from "./mariadb.ts";
import {
  bootstrap,
  inNamespace,
  mountNamespacePrefix,
  processesMarked,
  runnerEnvironment,
  startRunner,
  testPortBase,
  tsxLoader,
} from "./runner-harness.ts";

const dir = mkdtempSync(join(tmpdir(), "devstack-mariadb-"));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

/** my.cnf as { section: { key: value } } (a bare option gets ""). */
function parseConfig(text: string): Record<string, Record<string, string>> {
  const sections: Record<string, Record<string, string>> = {};
  let current: Record<string, string> | undefined;
  for (const line of text.split("\n")) {
    if (!line.trim() || line.startsWith("#")) continue;
    const header = /^\[(.+)\]$/.exec(line);
    if (header) current = sections[header[1]!] = {};
    else {
      const [key, ...value] = line.split("=");
      current![key!.trim()] = value.join("=").trim();
    }
  }
  return sections;
}

describe("the private MariaDB's my.cnf", () => {
  const config = parseConfig(mariadbConfig({ dir: "/srv/gy/mariadb", port: 6085, runAsRoot: true }));

  it("listens on 127.0.0.1 only, on its own port, and never looks host names up", () => {
    expect(config.mysqld).toMatchObject({ "bind-address": "127.0.0.1", port: "6085", "skip-name-resolve": "" });
  });

  it("keeps data, socket, pid file and error log under the instance's folder", () => {
    expect(config.mysqld).toMatchObject({
      datadir: "/srv/gy/mariadb/data",
      socket: "/srv/gy/mariadb/mariadb.sock",
      "pid-file": "/srv/gy/mariadb/mariadb.pid",
      "log-error": "/srv/gy/mariadb/error.log",
    });
  });

  it("points the runner's client tools at the socket only (no host to resolve, whatever MYSQL_HOST says)", () => {
    expect(config.client).toEqual({ socket: "/srv/gy/mariadb/mariadb.sock", protocol: "socket", port: "6085" });
  });

  it("names no host other than 127.0.0.1", () => {
    const text = mariadbConfig({ dir: "/srv/gy/mariadb", port: 6085, runAsRoot: true });
    expect(text).not.toMatch(/localhost|^host\s*=/m);
  });

  it("runs the server as root only when the runner is root", () => {
    expect(config.mysqld!.user).toBe("root");
    expect(parseConfig(mariadbConfig({ dir: "/d", port: 1, runAsRoot: false })).mysqld!.user).toBeUndefined();
  });

  it("initialises with mariadb-install-db's own switches for a host name that does not resolve", () => {
    const args = installDbArguments("/srv/gy/mariadb/my.cnf", false);
    expect(args[0]).toBe("--defaults-file=/srv/gy/mariadb/my.cnf"); // the tool reads it only as the first argument
    expect(args).toContain("--force"); // skips the resolveip check of the host name
    expect(args).toContain("--skip-name-resolve"); // grant entries by address
    expect(args).not.toContain("--user=root");
  });

  it("says what to do for the failures MariaDB reports most", () => {
    expect(mariadbAdvice("[ERROR] Can't start server: Bind on TCP/IP port. Got error: 98: Address already in use", "/d", 6085)).toMatch(
      /Port 6085 .* GRAINYARD_PORT_BASE/,
    );
    expect(mariadbAdvice("[ERROR] mariadbd: Can't lock aria control file", "/d", 1)).toMatch(/Another MariaDB is using \/d/);
    expect(mariadbAdvice("something else", "/d", 1)).toMatch(/delete \/d/);
  });
});

describe("with no name resolution of the host (a minimal image without /etc/hosts)", () => {
  const namespace = mountNamespacePrefix();
  const mariadbInstalled = spawnSync("sh", ["-c", "command -v mariadbd || test -x /usr/sbin/mariadbd"]).status === 0;
  const skipReason =
    "reason" in namespace ? namespace.reason : !mariadbInstalled ? "MariaDB is not installed here (npm test installs it)" : undefined;
  // An empty hosts file and a resolver that consults only files: neither the host's name nor
  // "localhost" resolves inside the namespace; the real /etc files are never touched.
  const emptyHosts = join(dir, "hosts");
  const filesOnly = join(dir, "nsswitch.conf");
  writeFileSync(emptyHosts, "");
  writeFileSync(filesOnly, "hosts: files\n");
  const hidden: [string, string][] = [
    [emptyHosts, "/etc/hosts"],
    [filesOnly, "/etc/nsswitch.conf"],
  ];

  it("initialises, starts, serves the app user over TCP 127.0.0.1 and stops", { timeout: 90_000 }, async (context) => {
    if (skipReason) {
      console.warn(`skipped: ${skipReason}`);
      context.skip(skipReason);
    }
    const instance = join(dir, "instance");
    const control = join(dir, "control");
    const port = testPortBase() + 17;
    const script = `
      import { spawnSync } from "node:child_process";
      import { hostname } from "node:os";
      import { writeFileSync } from "node:fs";
      const { startMariadb, mariadbConfig, installDbArguments } = await import(${JSON.stringify(join(import.meta.dirname, "mariadb.ts"))});
      const lookups = Object.fromEntries(["localhost", hostname()].map((name) => [name, spawnSync("getent", ["hosts", name]).status]));
      // The control: the same tool without --force refuses here, as it did on minimal images.
      writeFileSync(${JSON.stringify(`${control}.cnf`)}, mariadbConfig({ dir: ${JSON.stringify(control)}, port: ${port}, runAsRoot: process.getuid() === 0 }));
      const refused = spawnSync("mariadb-install-db", installDbArguments(${JSON.stringify(`${control}.cnf`)}, process.getuid() === 0).filter((a) => a !== "--force"), { encoding: "utf8" });
      const db = await startMariadb({ dir: ${JSON.stringify(instance)}, port: ${port}, appPassword: "no-hosts-check-26" });
      await db.createDatabase("grainyard_nohosts");
      const tcp = spawnSync("mariadb", ["--no-defaults", "--protocol=tcp", "--host=127.0.0.1", "--port=${port}", "--user=grainyard",
        "--password=no-hosts-check-26", "--batch", "--skip-column-names", "grainyard_nohosts", "-e", "SELECT CURRENT_USER(), @@bind_address, @@skip_name_resolve"], { encoding: "utf8" });
      await db.stop();
      console.log(JSON.stringify({ lookups, refused: { status: refused.status, output: refused.stdout + refused.stderr }, tcp: { status: tcp.status, out: tcp.stdout.trim(), err: tcp.stderr } }));
    `;
    const [command, args] = inNamespace((namespace as { prefix: string[] }).prefix, hidden, [
      process.execPath,
      "--import",
      tsxLoader,
      "--input-type=module",
      "-e",
      script,
    ]);
    const child = spawn(command, args, { stdio: ["ignore", "pipe", "pipe"] });
    let output = "";
    child.stdout!.on("data", (chunk) => (output += chunk));
    child.stderr!.on("data", (chunk) => (output += chunk));
    const code = await new Promise<number | null>((r) => child.on("close", r));
    expect(code, output).toBe(0);
    const result = JSON.parse(output.trim().split("\n").at(-1)!) as {
      lookups: Record<string, number>;
      refused: { status: number; output: string };
      tcp: { status: number; out: string; err: string };
    };
    // The check is real: nothing resolves in there, and the old way of initialising refuses.
    expect(
      Object.values(result.lookups).every((status) => status !== 0),
      JSON.stringify(result.lookups),
    ).toBe(true);
    expect(result.refused.status).not.toBe(0);
    expect(result.refused.output).toMatch(/could be looked up/);
    expect(result.tcp, JSON.stringify(result.tcp)).toMatchObject({ status: 0, out: "grainyard@127.0.0.1\t127.0.0.1\t1" });
  });

  it("`npm run services` starts every service and Ctrl-C stops it cleanly", { timeout: 120_000 }, async (context) => {
    if (skipReason) {
      console.warn(`skipped: ${skipReason}`);
      context.skip(skipReason);
    }
    const [command, args] = inNamespace((namespace as { prefix: string[] }).prefix, hidden, [process.execPath, bootstrap, "services"]);
    const runner = startRunner(
      command,
      args,
      runnerEnvironment({ GRAINYARD_TEST_PORT_BASE: String(testPortBase() + 20), GRAINYARD_DATA_DIR: join(dir, "stack"), CI: "true" }),
    );
    await runner.waitFor(/test services are up|✗/, 90_000);
    expect(runner.output()).toMatch(/test services are up/);
    runner.interrupt();
    await runner.exited;
    expect(runner.output()).toMatch(/stopped cleanly/);
    expect(processesMarked(runner.marker)).toEqual([]);
  });
});
