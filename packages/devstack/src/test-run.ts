import { existsSync, mkdirSync, readFileSync, rmSync } from "node:fs";
import { join } from "node:path";
import { CHROMIUM } from "./chromium.ts";
import { say, warn } from "./log.ts";
import { startProcess, tail, type ManagedProcess } from "./processes.ts";
import { repoRoot } from "./profile.ts";
import type { RunningStack } from "./stack.ts";
import { buildWebIfStale } from "./web-build.ts";
import { apiEntry, prepareDatabase, tsx, waitForApi } from "./api-process.ts";
import { spawn } from "node:child_process";

interface SuiteResult {
  name: string;
  passed: number;
  failed: number;
  skipped: number;
  exitCode: number;
  seconds: number;
}

const resultsDir = join(repoRoot, "test-results");

/** Runs one package's vitest suite with a JSON report, so the runner can add up the counts. */
async function runVitest(
  name: string,
  packageName: string,
  environment: Record<string, string>,
  extraArgs: string[] = [],
): Promise<SuiteResult> {
  const report = join(resultsDir, `${name}.json`);
  rmSync(report, { force: true });
  const started = Date.now();
  say(`suite ${name}…`);
  const child = spawn(
    "pnpm",
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
    {
      cwd: repoRoot,
      env: { ...process.env, ...environment, FORCE_COLOR: process.env.CI ? "0" : "1" },
      stdio: ["ignore", "inherit", "inherit"],
    },
  );
  const exitCode = await new Promise<number>((resolvePromise) => child.on("exit", (code) => resolvePromise(code ?? 1)));
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
async function runLint(): Promise<SuiteResult> {
  const started = Date.now();
  say("lint (type checks, ESLint, Prettier, knip)…");
  const child = spawn("pnpm", ["lint"], {
    cwd: repoRoot,
    env: { ...process.env, FORCE_COLOR: process.env.CI ? "0" : "1" },
    stdio: ["ignore", "inherit", "inherit"],
  });
  const exitCode = await new Promise<number>((resolvePromise) => child.on("exit", (code) => resolvePromise(code ?? 1)));
  return {
    name: "lint",
    passed: exitCode === 0 ? 1 : 0,
    failed: exitCode === 0 ? 0 : 1,
    skipped: 0,
    exitCode,
    seconds: (Date.now() - started) / 1000,
  };
}

export async function runTestSuites(stack: RunningStack): Promise<number> {
  mkdirSync(resultsDir, { recursive: true });
  const results: SuiteResult[] = [];
  const testEnvironment = stack.apiEnvironment("grainyard_unused", {
    NODE_ENV: "test",
    BCRYPT_COST: "4",
    LOG_LEVEL: "silent",
    GRAINYARD_TEST_STACK: "1",
  });

  results.push(await runLint());
  // Unit suites (no services).
  results.push(await runVitest("slab-math", "@grainyard/slab-math", {}));
  results.push(await runVitest("contracts", "@grainyard/contracts", {}));
  results.push(await runVitest("web", "@grainyard/web", {}));
  results.push(await runVitest("payments-fake", "@grainyard/payments-fake", {}));
  results.push(await runVitest("devstack", "@grainyard/devstack", testEnvironment));
  // API integration: supertest against real MariaDB schemas, real SMTP, real S3 API; the server-rendered
  // pages' suite reads the built web app, so it is built first.
  await buildWebIfStale();
  results.push(await runVitest("api", "@grainyard/api", testEnvironment));

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
  try {
    await prepareDatabase(stack, "grainyard_e2e", e2eEnvironment);
    await buildWebIfStale();
    api = startProcess(tsx, [apiEntry], {
      cwd: join(repoRoot, "apps/api"),
      env: { ...process.env, ...e2eEnvironment },
      logFile: apiLog,
    });
    await waitForApi(e2eEnvironment.PUBLIC_URL!, api, apiLog);
    results.push(
      await runVitest(
        "e2e",
        "@grainyard/tests",
        {
          APP_URL: e2eEnvironment.PUBLIC_URL!,
          INBOX_URL: stack.inboxUrl,
          CHROMIUM_PATH: CHROMIUM,
          SCREENSHOT_DIR: join(resultsDir, "screenshots"),
        },
        ["--config", "vitest.e2e.config.ts"],
      ),
    );
  } catch (error) {
    warn(`end-to-end set-up failed: ${error instanceof Error ? error.message : String(error)}`);
    if (existsSync(apiLog)) warn(`API log tail:\n${tail(apiLog, 15)}`);
    results.push({ name: "e2e", passed: 0, failed: 1, skipped: 0, exitCode: 1, seconds: 0 });
  } finally {
    await api?.stop();
  }

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
  return failed > 0 || empty.length > 0 || results.some((r) => r.exitCode !== 0) ? 1 : 0;
}
