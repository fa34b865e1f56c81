import { join } from "node:path";
import { colourEnvironment } from "../tools.mjs";
import { apiEntry, prepareDatabase, startApi, tsx, waitForApi, type DemoAccount } from "./api-process.ts";
import { ensureTestTools } from "./chromium.ts";
import { Lifecycle } from "./lifecycle.ts";
import { say } from "./log.ts";
import { waitUntil } from "./ports.ts";
import { nodeWithTsx, runStep, startProcess, tail } from "./processes.ts";
import { profileFor, repoRoot } from "./profile.ts";
import { startStack, writeEnvironmentFile, type RunningStack } from "./stack.ts";
import { printSummary, runTestSuites, summaryExitCode } from "./test-run.ts";
import { buildWebIfStale, webDist } from "./web-build.ts";

function banner(lines: string[]) {
  const width = Math.max(...lines.map((l) => l.length)) + 2;
  process.stdout.write(`\n┌${"─".repeat(width)}┐\n${lines.map((l) => `│ ${l.padEnd(width - 1)}│`).join("\n")}\n└${"─".repeat(width)}┘\n\n`);
}

function demoAccountLines(accounts: DemoAccount[]): string[] {
  return accounts.map((a) => `  ${a.role.padEnd(6)} ${a.email.padEnd(32)} ${a.password.padEnd(26)} ${a.name}`);
}

/** Starts the test profile's services and registers their stop. */
async function testServices(lifecycle: Lifecycle, fresh: boolean): Promise<RunningStack> {
  const stack = await startStack(profileFor("test"), {
    fresh,
    signal: lifecycle.signal,
    track: (name, stop) => lifecycle.onStop(name, stop, 90_000),
  });
  return stack;
}

async function serve(lifecycle: Lifecycle, mode: "start" | "dev"): Promise<"running"> {
  const profile = profileFor("local");
  const started = Date.now();
  const extraPorts = mode === "dev" ? [{ port: profile.ports.vite, purpose: "Vite dev server" }] : [];
  const stack = await startStack(profile, {
    fresh: false,
    extraPorts,
    signal: lifecycle.signal,
    track: (name, stop) => lifecycle.onStop(name, stop, 90_000),
  });

  const viteUrl = `http://127.0.0.1:${profile.ports.vite}`;
  const appUrl = `http://127.0.0.1:${profile.ports.app}`;
  const publicUrl = mode === "dev" ? viteUrl : appUrl;
  const environment = stack.apiEnvironment("grainyard", {
    NODE_ENV: "development",
    PUBLIC_URL: publicUrl,
    WEB_DIST: webDist,
    LOG_LEVEL: "info",
  });
  writeEnvironmentFile(join(profile.dataDir, "api.env"), environment);
  const demoAccounts = await prepareDatabase(stack, "grainyard", environment, { signal: lifecycle.signal });

  const logFile = join(profile.dataDir, "api.log");
  if (mode === "start") {
    await buildWebIfStale(lifecycle.signal);
    const api = startApi(environment, logFile);
    lifecycle.onStop("the API", () => api.stop());
    await waitForApi(appUrl, api, logFile, lifecycle.signal);
    void api.exited.then((code) =>
      lifecycle.fail(`the API stopped unexpectedly (exit ${code}); the end of its log (${logFile}):\n${tail(logFile, 15)}`),
    );
  } else {
    const api = startProcess(tsx, ["watch", "--clear-screen=false", apiEntry], {
      cwd: join(repoRoot, "apps/api"),
      env: { ...process.env, ...environment },
    });
    lifecycle.onStop("the API (tsx watch)", () => api.stop());
    await waitForApi(appUrl, api, undefined, lifecycle.signal);
    // Vite itself (no pnpm in between, which would report the stop as a failure).
    const vite = startProcess(
      join(repoRoot, "apps/web/node_modules/.bin/vite"),
      ["--host", "127.0.0.1", "--port", String(profile.ports.vite), "--strictPort"],
      { cwd: join(repoRoot, "apps/web"), env: { ...process.env, GRAINYARD_API_URL: appUrl } },
    );
    lifecycle.onStop("the Vite dev server", () => vite.stop());
    await waitUntil(async () => (await fetch(viteUrl)).ok, 60_000, "the Vite dev server", lifecycle.signal);
  }

  banner([
    `Grainyard is running (${((Date.now() - started) / 1000).toFixed(1)} s)`,
    "",
    `  App:    ${publicUrl}`,
    `  Inbox:  ${stack.inboxUrl}   (every e-mail the app sends)`,
    ...(mode === "start" ? [`  Logs:   ${logFile}`] : [`  API:    ${appUrl}`]),
    "",
    "Demo accounts (Lakemont):",
    ...demoAccountLines(demoAccounts),
    "",
    "Press Ctrl-C to stop.",
  ]);
  return "running";
}

async function test(lifecycle: Lifecycle): Promise<number> {
  await ensureTestTools(lifecycle.signal);
  const stack = await testServices(lifecycle, true);
  const results = await runTestSuites(stack, lifecycle.signal);
  // The summary comes after the services have stopped, so that `Total: …` is the last line.
  lifecycle.setEpilogue(() => printSummary(results));
  return summaryExitCode(results);
}

/** The test profile's services alone, for running one suite by hand (see DEVELOPERS.md). */
async function services(lifecycle: Lifecycle): Promise<"running"> {
  const stack = await testServices(lifecycle, false);
  const environment = stack.apiEnvironment("grainyard_unused", {
    NODE_ENV: "test",
    BCRYPT_COST: "4",
    LOG_LEVEL: "silent",
    GRAINYARD_TEST_STACK: "1",
  });
  const file = join(stack.profile.dataDir, "test.env");
  writeEnvironmentFile(file, environment);
  say(`test services are up; in another shell: set -a; . ${file}; set +a; pnpm --filter @grainyard/api test`);
  return "running";
}

/**
 * `npm run bench`: slab-math and photo benchmarks, then the catalogue search benchmark against a
 * national-scale catalogue (seeded once into its own database on the test profile's MariaDB).
 */
async function bench(lifecycle: Lifecycle): Promise<number> {
  const stack = await testServices(lifecycle, false);
  const { signal } = lifecycle;
  const environment = stack.apiEnvironment("grainyard_bench", { NODE_ENV: "test", BCRYPT_COST: "4", LOG_LEVEL: "silent" });
  const env = { ...process.env, ...environment };
  const cwd = join(repoRoot, "apps/api");
  const step = (name: string, script: string) => runStep(name, ...nodeWithTsx(script), { cwd, env, signal });
  await runStep("slab-math benchmark", "pnpm", ["--filter", "@grainyard/slab-math", "bench"], { cwd: repoRoot, signal });
  await step("photo benchmark", "bench/photo-pipeline.ts");
  await stack.mariadb.createDatabase("grainyard_bench");
  await step("migrating the benchmark database", "src/cli/migrate.ts");
  say("seeding the national-scale catalogue (once; about 25 s)…");
  await step("seeding the national-scale catalogue", "src/cli/seed-national.ts");
  await step("catalogue search benchmark", "../../tests/bench/catalogue-search.ts");
  return 0;
}

// Children (pnpm, vitest, the API, apt…) inherit these: no escape codes in CI logs or files.
const colours = colourEnvironment(process.env, Boolean(process.stdout.isTTY));
if (colours.FORCE_COLOR === undefined) delete process.env.FORCE_COLOR;
if (colours.NO_COLOR !== undefined) process.env.NO_COLOR = colours.NO_COLOR;

const jobs: Record<string, [signalExitCode: number, job: (lifecycle: Lifecycle) => Promise<number | "running">]> = {
  start: [0, (lifecycle) => serve(lifecycle, "start")],
  dev: [0, (lifecycle) => serve(lifecycle, "dev")],
  test: [130, test],
  services: [0, services],
  bench: [130, bench],
};
const mode = process.argv[2] ?? "start";
const job = jobs[mode];
if (!job) {
  process.stderr.write(`[grainyard] ✗ unknown mode "${mode}"; use ${Object.keys(jobs).join(", ")}\n`);
  process.exit(2);
}
const lifecycle = new Lifecycle(job[0]);
await lifecycle.run(() => job[1](lifecycle));
