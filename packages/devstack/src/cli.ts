import { join } from "node:path";
import { CHROMIUM, ensureTestTools } from "./chromium.ts";
import { say, warn } from "./log.ts";
import { startProcess, tail, type ManagedProcess } from "./processes.ts";
import { profileFor, repoRoot } from "./profile.ts";
import { startStack, writeEnvironmentFile } from "./stack.ts";
import { runTestSuites } from "./test-run.ts";
import { apiEntry, prepareDatabase, tsx, waitForApi, type DemoAccount } from "./api-process.ts";
import { runStep } from "./processes.ts";
import { buildWebIfStale, webDist } from "./web-build.ts";
import { waitUntil } from "./ports.ts";

function banner(lines: string[]) {
  const width = Math.max(...lines.map((l) => l.length)) + 2;
  process.stdout.write(`\n┌${"─".repeat(width)}┐\n${lines.map((l) => `│ ${l.padEnd(width - 1)}│`).join("\n")}\n└${"─".repeat(width)}┘\n\n`);
}

function demoAccountLines(accounts: DemoAccount[]): string[] {
  return accounts.map((a) => `  ${a.role.padEnd(6)} ${a.email.padEnd(32)} ${a.password.padEnd(26)} ${a.name}`);
}

async function serve(mode: "start" | "dev"): Promise<void> {
  const profile = profileFor("local");
  const started = Date.now();
  const extraPorts = mode === "dev" ? [{ port: profile.ports.vite, purpose: "Vite hot-reload socket" }] : [];
  const stack = await startStack(profile, { fresh: false, extraPorts });
  const children: ManagedProcess[] = [];
  let shuttingDown = false;
  const shutdown = async (code: number) => {
    if (shuttingDown) return;
    shuttingDown = true;
    say("stopping…");
    for (const child of children.reverse()) await child.stop();
    await stack.stop();
    say("stopped cleanly");
    process.exit(code);
  };
  process.on("SIGINT", () => void shutdown(0));
  process.on("SIGTERM", () => void shutdown(0));

  try {
    const appUrl = `http://127.0.0.1:${profile.ports.app}`;
    const environment = stack.apiEnvironment("grainyard", {
      NODE_ENV: "development",
      PUBLIC_URL: appUrl,
      WEB_DIST: webDist,
      LOG_LEVEL: "info",
      // dev: the API renders the pages through Vite in middleware mode (hot reload on the Vite port's socket).
      ...(mode === "dev" ? { WEB_DEV_ROOT: join(repoRoot, "apps/web"), WEB_DEV_HMR_PORT: String(profile.ports.vite) } : {}),
    });
    writeEnvironmentFile(join(profile.dataDir, "api.env"), environment);
    say("applying migrations and the Lakemont demo data…");
    const demoAccounts = await prepareDatabase(stack, "grainyard", environment);

    const logFile = join(profile.dataDir, "api.log");
    if (mode === "start") {
      await buildWebIfStale();
      const api = startProcess(tsx, [apiEntry], { cwd: join(repoRoot, "apps/api"), env: { ...process.env, ...environment }, logFile });
      children.push(api);
      await waitForApi(appUrl, api, logFile);
      void api.exited.then((code) => {
        if (!shuttingDown) {
          warn(`the API stopped unexpectedly (exit ${code}); last log line: ${tail(logFile, 1)}`);
          void shutdown(1);
        }
      });
    } else {
      // tsx reloads the API when its code changes; Vite (inside it) reloads the pages when theirs does.
      const api = startProcess(tsx, ["watch", "--clear-screen=false", "--exclude", join(repoRoot, "apps/web/**"), apiEntry], {
        cwd: join(repoRoot, "apps/api"),
        env: { ...process.env, ...environment },
      });
      children.push(api);
      await waitForApi(appUrl, api);
      // The first page compiles the render through Vite: ask for it once so the first person does not wait.
      await waitUntil(async () => (await fetch(`${appUrl}/`)).ok, 60_000, "the first server-rendered page");
    }

    banner([
      `Grainyard is running (${((Date.now() - started) / 1000).toFixed(1)} s)`,
      "",
      `  App:    ${appUrl}`,
      `  Inbox:  ${stack.inboxUrl}   (every e-mail the app sends)`,
      ...(mode === "start" ? [`  Logs:   ${logFile}`] : [`  Hot reload: Vite inside the API (its socket on port ${profile.ports.vite})`]),
      "",
      "Demo accounts (Lakemont):",
      ...demoAccountLines(demoAccounts),
      "",
      "Press Ctrl-C to stop.",
    ]);
  } catch (error) {
    warn(error instanceof Error ? error.message : String(error));
    await shutdown(1);
  }
}

async function test(): Promise<void> {
  const profile = profileFor("test");
  ensureTestTools();
  const stack = await startStack(profile, { fresh: true });
  let exitCode: number;
  const stop = async () => {
    await stack.stop();
  };
  process.on("SIGINT", () => void stop().then(() => process.exit(130)));
  process.on("SIGTERM", () => void stop().then(() => process.exit(143)));
  try {
    exitCode = await runTestSuites(stack);
  } catch (error) {
    warn(error instanceof Error ? error.message : String(error));
    exitCode = 1;
  } finally {
    await stack.stop();
  }
  process.exit(exitCode);
}

/** The test profile's services alone, for running one suite by hand (see DEVELOPERS.md). */
async function services(): Promise<void> {
  const profile = profileFor("test");
  const stack = await startStack(profile, { fresh: false });
  const environment = stack.apiEnvironment("grainyard_unused", {
    NODE_ENV: "test",
    BCRYPT_COST: "4",
    LOG_LEVEL: "silent",
    GRAINYARD_TEST_STACK: "1",
  });
  const file = join(profile.dataDir, "test.env");
  writeEnvironmentFile(file, environment);
  say(`test services are up; in another shell: set -a; . ${file}; set +a; pnpm --filter @grainyard/api test`);
  const stop = () => void stack.stop().then(() => process.exit(0));
  process.on("SIGINT", stop);
  process.on("SIGTERM", stop);
}

/**
 * `npm run bench`: slab-math and photo benchmarks, then the catalogue search benchmark against a
 * national-scale catalogue (seeded once into its own database on the test profile's MariaDB).
 */
async function bench(): Promise<void> {
  const profile = profileFor("test");
  const stack = await startStack(profile, { fresh: false });
  let code = 0;
  try {
    const environment = stack.apiEnvironment("grainyard_bench", { NODE_ENV: "test", BCRYPT_COST: "4", LOG_LEVEL: "silent" });
    const env = { ...process.env, ...environment };
    const api = join(repoRoot, "apps/api");
    await runStep("slab-math benchmark", "pnpm", ["--filter", "@grainyard/slab-math", "bench"], { cwd: repoRoot });
    await runStep("photo benchmark", tsx, ["bench/photo-pipeline.ts"], { cwd: api, env });
    stack.mariadb.createDatabase("grainyard_bench");
    await runStep("migrating the benchmark database", tsx, ["src/cli/migrate.ts"], { cwd: api, env });
    say("seeding the national-scale catalogue (once; about 25 s)…");
    await runStep("seeding the national-scale catalogue", tsx, ["src/cli/seed-national.ts"], { cwd: api, env });
    await runStep("catalogue search benchmark", tsx, ["../../tests/bench/catalogue-search.ts"], { cwd: api, env });
    await lighthouseBenchmark(stack);
  } catch (error) {
    warn(error instanceof Error ? error.message : String(error));
    code = 1;
  } finally {
    await stack.stop();
  }
  process.exit(code);
}

/**
 * Lighthouse on the demo's public pages (tests/bench/lighthouse.ts): the built app served by the API
 * on the Lakemont demo data, in its own database on the test profile's app port.
 */
async function lighthouseBenchmark(stack: Awaited<ReturnType<typeof startStack>>): Promise<void> {
  ensureTestTools();
  const environment = stack.apiEnvironment("grainyard_lighthouse", {
    NODE_ENV: "test",
    BCRYPT_COST: "4",
    LOG_LEVEL: "warn",
    WEB_DIST: webDist,
  });
  say("preparing the demo for Lighthouse (migrations, Lakemont data once, the built app)…");
  await prepareDatabase(stack, "grainyard_lighthouse", environment);
  await buildWebIfStale();
  const logFile = join(stack.profile.dataDir, "api-lighthouse.log");
  const api = startProcess(tsx, [apiEntry], { cwd: join(repoRoot, "apps/api"), env: { ...process.env, ...environment }, logFile });
  try {
    await waitForApi(environment.PUBLIC_URL!, api, logFile);
    await runStep("Lighthouse benchmark", tsx, ["bench/lighthouse.ts"], {
      cwd: join(repoRoot, "tests"),
      env: { ...process.env, APP_URL: environment.PUBLIC_URL!, CHROMIUM_PATH: CHROMIUM },
    });
  } finally {
    await api.stop();
  }
}

const mode = process.argv[2];
try {
  if (mode === "start" || mode === "dev") await serve(mode);
  else if (mode === "test") await test();
  else if (mode === "services") await services();
  else if (mode === "bench") await bench();
  else {
    warn(`unknown mode "${mode}"; use start, dev or test`);
    process.exit(2);
  }
} catch (error) {
  process.stderr.write(`[grainyard] ✗ ${error instanceof Error ? error.message : String(error)}\n`);
  process.exit(1);
}
