import { randomBytes } from "node:crypto";
import { existsSync, mkdirSync, readFileSync, rmSync } from "node:fs";
import { join } from "node:path";
import { CHROMIUM } from "./chromium.ts";
import { reportFailure } from "./lifecycle.ts";
import { Interrupted, say, warn } from "./log.ts";
import { startProcess, tail, type ManagedProcess } from "./processes.ts";
import { repoRoot } from "./profile.ts";
import type { RunningStack } from "./stack.ts";
import { buildWebIfStale } from "./web-build.ts";
import { prepareDatabase, startApi, waitForApi, type DemoAccount } from "./api-process.ts";
import { startApiInstances } from "./instances.ts";
import { startMariadb } from "./mariadb.ts";
import { startReplica } from "./replica.ts";

export interface SuiteResult {
  name: string;
  passed: number;
  failed: number;
  skipped: number;
  exitCode: number;
  seconds: number;
}

const resultsDir = join(repoRoot, "test-results");

/**
 * Runs a suite's command in its own process group with the runner's colour settings (see
 * colourEnvironment: no escape codes in CI logs or files). Stopping the runner stops the suite.
 */
async function runSuiteCommand(args: string[], environment: Record<string, string>, signal: AbortSignal): Promise<number> {
  if (signal.aborted) throw new Interrupted("the test suites");
  const suite = startProcess("pnpm", args, { cwd: repoRoot, env: { ...process.env, ...environment } });
  const onAbort = () => void suite.stop();
  signal.addEventListener("abort", onAbort, { once: true });
  const exitCode = await suite.exited;
  signal.removeEventListener("abort", onAbort);
  if (signal.aborted) {
    await suite.stop();
    throw new Interrupted("the test suites");
  }
  return exitCode;
}

/** Runs one package's vitest suite with a JSON report, so the runner can add up the counts. */
async function runVitest(
  name: string,
  packageName: string,
  environment: Record<string, string>,
  signal: AbortSignal,
  extraArgs: string[] = [],
): Promise<SuiteResult> {
  const report = join(resultsDir, `${name}.json`);
  rmSync(report, { force: true });
  const started = Date.now();
  say(`suite ${name}…`);
  const exitCode = await runSuiteCommand(
    [
      "--filter",
      packageName,
      "exec",
      "vitest",
      "run",
      ...extraArgs,
      "--reporter=default",
      "--reporter=json",
      `--outputFile.json=${report}`,
    ],
    environment,
    signal,
  );
  const seconds = (Date.now() - started) / 1000;
  if (!existsSync(report)) return { name, passed: 0, failed: 1, skipped: 0, exitCode: exitCode || 1, seconds };
  const json = JSON.parse(readFileSync(report, "utf8")) as {
    numPassedTests: number;
    numFailedTests: number;
    numPendingTests: number;
    numTodoTests: number;
    numTotalTests: number;
  };
  const failedFiles = exitCode !== 0 && json.numFailedTests === 0 ? 1 : 0; // a file that failed to load counts as one failure
  return {
    name,
    passed: json.numPassedTests,
    failed: json.numFailedTests + failedFiles,
    skipped: json.numPendingTests + json.numTodoTests,
    exitCode,
    seconds,
  };
}

/** Lint and format checks (type checks, ESLint, Prettier, knip): one "test" that passes or fails. */
async function runLint(signal: AbortSignal): Promise<SuiteResult> {
  const started = Date.now();
  say("lint (type checks, ESLint, Prettier, knip)…");
  const exitCode = await runSuiteCommand(["lint"], {}, signal);
  return {
    name: "lint",
    passed: exitCode === 0 ? 1 : 0,
    failed: exitCode === 0 ? 0 : 1,
    skipped: 0,
    exitCode,
    seconds: (Date.now() - started) / 1000,
  };
}

/** The suites `npm test` runs, in order. */
export const SUITES = ["lint", "slab-math", "contracts", "web", "payments-fake", "devstack", "api", "e2e", "many", "replica"] as const;

/**
 * `GRAINYARD_TEST_SUITES=many,replica npm test` runs only those suites (a developer's shortcut; CI
 * runs them all). Unknown names are refused, so a typo never reads as a green run of nothing.
 */
export function chosenSuites(value: string | undefined): Set<string> {
  if (!value?.trim()) return new Set(SUITES);
  const names = value
    .split(",")
    .map((name) => name.trim())
    .filter(Boolean);
  const unknown = names.filter((name) => !(SUITES as readonly string[]).includes(name));
  if (unknown.length) throw new Error(`GRAINYARD_TEST_SUITES: no suite named ${unknown.join(", ")} (the suites: ${SUITES.join(", ")})`);
  return new Set(names);
}

export async function runTestSuites(stack: RunningStack, signal: AbortSignal): Promise<SuiteResult[]> {
  mkdirSync(resultsDir, { recursive: true });
  const chosen = chosenSuites(process.env.GRAINYARD_TEST_SUITES);
  if (chosen.size < SUITES.length) say(`only the suites ${[...chosen].join(", ")} (GRAINYARD_TEST_SUITES)`);
  const results: SuiteResult[] = [];
  const run = async (name: (typeof SUITES)[number], suite: () => Promise<SuiteResult>) => {
    if (chosen.has(name)) results.push(await suite());
  };
  const testEnvironment = stack.apiEnvironment("grainyard_unused", {
    NODE_ENV: "test",
    BCRYPT_COST: "4",
    LOG_LEVEL: "silent",
    GRAINYARD_TEST_STACK: "1",
  });

  await run("lint", () => runLint(signal));
  // Unit suites (no services).
  await run("slab-math", () => runVitest("slab-math", "@grainyard/slab-math", {}, signal));
  await run("contracts", () => runVitest("contracts", "@grainyard/contracts", {}, signal));
  await run("web", () => runVitest("web", "@grainyard/web", {}, signal));
  await run("payments-fake", () => runVitest("payments-fake", "@grainyard/payments-fake", {}, signal));
  await run("devstack", () => runVitest("devstack", "@grainyard/devstack", testEnvironment, signal));
  // API integration: supertest against real MariaDB schemas, real SMTP, real S3 API; the server-rendered
  // pages' suite reads the built web app, so it is built first.
  if (chosen.has("api")) await buildWebIfStale(signal);
  await run("api", () => runVitest("api", "@grainyard/api", testEnvironment, signal));

  // End-to-end: the built web app served by the API, driven in Debian's Chromium.
  // GRAINYARD_TEST_CLOCK: the e2e suite may move the API's clock forward (hold periods); only ever with NODE_ENV=test.
  const e2eEnvironment = stack.apiEnvironment("grainyard_e2e", {
    NODE_ENV: "test",
    BCRYPT_COST: "4",
    LOG_LEVEL: "info",
    WEB_DIST: join(repoRoot, "apps/web/dist"),
    GRAINYARD_TEST_CLOCK: "1",
  });
  let api: ManagedProcess | undefined;
  const apiLog = join(stack.profile.dataDir, "api-e2e.log");
  if (chosen.has("e2e"))
    try {
      const e2eDemo = await prepareDatabase(stack, "grainyard_e2e", e2eEnvironment, { signal });
      await buildWebIfStale(signal);
      api = startApi(e2eEnvironment, apiLog);
      await waitForApi(e2eEnvironment.PUBLIC_URL!, api, apiLog, signal);
      results.push(
        await runVitest(
          "e2e",
          "@grainyard/tests",
          {
            APP_URL: e2eEnvironment.PUBLIC_URL!,
            INBOX_URL: stack.inboxUrl,
            CHROMIUM_PATH: CHROMIUM,
            SCREENSHOT_DIR: join(resultsDir, "screenshots"),
            // The demo admin's second factor, as `npm start` prints it: the suites compute its codes.
            DEMO_ADMIN_TOTP_SECRET: demoAdminSecret(e2eDemo),
          },
          signal,
          ["--config", "vitest.e2e.config.ts"],
        ),
      );
    } catch (error) {
      if (error instanceof Interrupted) throw error;
      warn("end-to-end set-up failed:");
      reportFailure(error);
      if (existsSync(apiLog)) warn(`API log tail:\n${tail(apiLog, 15)}`);
      results.push({ name: "e2e", passed: 0, failed: 1, skipped: 0, exitCode: 1, seconds: 0 });
    } finally {
      await api?.stop();
    }

  await run("many", () => runManyInstances(stack, signal));
  await run("replica", () => runReplicaSuite(stack, testEnvironment, signal));
  return results;
}

/** The seeded demo admin's second-factor secret (the seed makes one per database). */
function demoAdminSecret(accounts: DemoAccount[]): string {
  const secret = accounts.find((account) => account.role === "admin")?.secondFactor?.secret;
  if (!secret) throw new Error("the demo seed gave the admin no second factor");
  return secret;
}

/**
 * The read-replica suite (apps/api, `*.replica.test.ts`): a MariaDB primary with a binary log and
 * a read replica following it by GTID, both private to this suite (the test stack's own MariaDB
 * keeps no binary log, so the other suites pay nothing for it), each stopped by its own handle.
 * The suite may shut the replica down itself (its fallback test), through a control account that
 * may only watch, start and stop replication and shut the server down.
 */
async function runReplicaSuite(stack: RunningStack, testEnvironment: Record<string, string>, signal: AbortSignal): Promise<SuiteResult> {
  const dir = join(stack.profile.dataDir, "replication");
  const { ports } = stack.profile;
  const stops: (() => Promise<void>)[] = [];
  const track = (_name: string, stop: () => Promise<void>) => void stops.push(stop);
  try {
    const primary = await startMariadb({
      dir: join(dir, "primary"),
      port: ports.replicaPrimary,
      appPassword: stack.databasePassword,
      replication: { role: "primary", serverId: 1 },
      name: "the replica suite's primary",
      signal,
      track,
    });
    const replica = await startReplica({
      primary,
      dir: join(dir, "replica"),
      port: ports.replica,
      appPassword: stack.databasePassword,
      databases: [],
      signal,
      track,
    });
    const controlPassword = randomBytes(18).toString("base64url");
    await replica.rootSql(
      [
        `CREATE USER 'grainyard_control'@'127.0.0.1' IDENTIFIED BY '${controlPassword}';`,
        "GRANT SLAVE MONITOR, REPLICATION SLAVE ADMIN, SHUTDOWN ON *.* TO 'grainyard_control'@'127.0.0.1';",
      ].join(" "),
    );
    return await runVitest(
      "replica",
      "@grainyard/api",
      {
        ...testEnvironment,
        DATABASE_PORT: String(primary.endpoint.port),
        DATABASE_REPLICA_HOST: replica.endpoint.host,
        DATABASE_REPLICA_PORT: String(replica.endpoint.port),
        REPLICA_CONTROL_USER: "grainyard_control",
        REPLICA_CONTROL_PASSWORD: controlPassword,
      },
      signal,
      ["--config", "vitest.replica.config.ts"],
    );
  } catch (error) {
    if (error instanceof Interrupted) throw error;
    warn("the read-replica set-up failed:");
    reportFailure(error);
    return { name: "replica", passed: 0, failed: 1, skipped: 0, exitCode: 1, seconds: 0 };
  } finally {
    // The replica first, then its primary.
    for (const stop of stops.reverse()) await stop().catch(() => undefined);
  }
}

/**
 * The several-instances suite: three API processes behind HAProxy on the app port (as
 * `GRAINYARD_INSTANCES=3 npm start` runs them), on their own database with the Lakemont demo data.
 */
async function runManyInstances(stack: RunningStack, signal: AbortSignal): Promise<SuiteResult> {
  const environment = stack.apiEnvironment("grainyard_many", { NODE_ENV: "test", BCRYPT_COST: "4", LOG_LEVEL: "warn" });
  const stops: (() => Promise<void>)[] = [];
  try {
    const demo = await prepareDatabase(stack, "grainyard_many", environment, { signal });
    const { instances } = await startApiInstances({
      // Every scheduled job ticks each second, so the suite sees several instances' sweeps in seconds.
      environment: { ...environment, JOB_EVERY_SECONDS: "1" },
      count: 3,
      appPort: stack.profile.ports.app,
      dataDir: stack.profile.dataDir,
      logName: "api-many",
      signal,
      track: (_name, stop) => void stops.push(stop),
    });
    return await runVitest(
      "many",
      "@grainyard/tests",
      {
        APP_URL: environment.PUBLIC_URL!,
        INSTANCE_URLS: instances.map((instance) => instance.url).join(","),
        DEMO_ADMIN_TOTP_SECRET: demoAdminSecret(demo),
        // The failure test stops two of them (SIGKILL and SIGTERM) under load.
        INSTANCE_PIDS: instances.map((instance) => instance.process.child.pid).join(","),
        DATABASE_HOST: environment.DATABASE_HOST!,
        DATABASE_PORT: environment.DATABASE_PORT!,
        DATABASE_USER: environment.DATABASE_USER!,
        DATABASE_PASSWORD: environment.DATABASE_PASSWORD!,
        DATABASE_NAME: environment.DATABASE_NAME!,
      },
      signal,
      ["--config", "vitest.many.config.ts"],
    );
  } catch (error) {
    if (error instanceof Interrupted) throw error;
    warn("the several-instances set-up failed:");
    reportFailure(error);
    return { name: "many", passed: 0, failed: 1, skipped: 0, exitCode: 1, seconds: 0 };
  } finally {
    // HAProxy first, then the instances.
    for (const stop of stops.reverse()) await stop().catch(() => undefined);
  }
}

/** 1 when any suite failed, ran no test, or exited non-zero. */
export function summaryExitCode(results: SuiteResult[]): number {
  const failed = results.some((r) => r.failed > 0 || r.exitCode !== 0 || (r.passed === 0 && r.failed === 0));
  return failed ? 1 : 0;
}

/** The summary table and the last line, `Total: N passed, N failed, N skipped`. */
export function printSummary(results: SuiteResult[]): void {
  process.stdout.write("\nSuite results\n");
  for (const r of results) {
    const flag = r.failed || r.exitCode ? "FAIL" : r.passed === 0 ? "EMPTY" : "ok";
    process.stdout.write(
      `  ${flag.padEnd(5)} ${r.name.padEnd(14)} ${String(r.passed).padStart(4)} passed ${String(r.failed).padStart(3)} failed ${String(r.skipped).padStart(3)} skipped  ${r.seconds.toFixed(1)} s\n`,
    );
  }
  const passed = results.reduce((n, r) => n + r.passed, 0);
  const failed = results.reduce((n, r) => n + r.failed, 0);
  const skipped = results.reduce((n, r) => n + r.skipped, 0);
  const empty = results.filter((r) => r.passed === 0 && r.failed === 0);
  if (empty.length) warn(`suites that ran no test: ${empty.map((r) => r.name).join(", ")}`);
  process.stdout.write(`\nTotal: ${passed} passed, ${failed} failed, ${skipped} skipped\n`);
}
