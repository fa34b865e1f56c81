import { existsSync, readdirSync } from "node:fs";
import { join, resolve } from "node:path";
import { colourEnvironment } from "../tools.mjs";
import { apiEntry, prepareDatabase, startApi, tsx, waitForApi, type DemoAccount } from "./api-process.ts";
import { instanceCount, instancePorts, startApiInstances } from "./instances.ts";
import { instancesBenchmark } from "./instances-bench.ts";
import { CHROMIUM, ensureTestTools } from "./chromium.ts";
import { Lifecycle } from "./lifecycle.ts";
import { say, StackError, warn } from "./log.ts";
import { assertPortFree, waitUntil } from "./ports.ts";
import { nodeWithTsx, runStep, startProcess, tail } from "./processes.ts";
import { profileFor, repoRoot } from "./profile.ts";
import { replicaWanted, startReplica } from "./replica.ts";
import { stopLeftoverMariadb } from "./mariadb.ts";
import { readEnvironmentFile, startStack, writeEnvironmentFile, type RunningStack } from "./stack.ts";
import { printSummary, runTestSuites, summaryExitCode } from "./test-run.ts";
import { buildWebIfStale, webDist } from "./web-build.ts";

function banner(lines: string[]) {
  const width = Math.max(...lines.map((l) => l.length)) + 2;
  process.stdout.write(`\n┌${"─".repeat(width)}┐\n${lines.map((l) => `│ ${l.padEnd(width - 1)}│`).join("\n")}\n└${"─".repeat(width)}┘\n\n`);
}

function demoAccountLines(accounts: DemoAccount[]): string[] {
  return accounts.map((a) => `  ${a.role.padEnd(6)} ${a.email.padEnd(32)} ${a.password.padEnd(26)} ${a.name}`);
}

/** How to get past the second factor of demo accounts that have one (the admin). */
function secondFactorLines(accounts: DemoAccount[]): string[] {
  return accounts.flatMap((a) =>
    a.secondFactor
      ? [
          `Second factor of ${a.email} (asked after the password):`,
          `  add the key ${a.secondFactor.secret} to an authenticator app (time-based, 6 digits),`,
          `  or print the current code: pnpm --filter @grainyard/api demo:code`,
        ]
      : [],
  );
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
  const extraPorts = mode === "dev" ? [{ port: profile.ports.vite, purpose: "Vite hot-reload socket" }] : [];
  const wanted = mode === "start" ? instanceCount() : 1;
  const replicated = mode === "start" && replicaWanted();
  if (replicated) {
    // A replica left running by a start that was killed holds its port: shut it down first (it is made afresh anyway).
    await stopLeftoverMariadb(join(profile.dataDir, "mariadb-replica"));
    extraPorts.push({ port: profile.ports.replica, purpose: "MariaDB read replica" });
  }
  if (wanted > 1)
    for (const [index, port] of instancePorts(profile.ports.app, wanted).entries())
      extraPorts.push({ port, purpose: `API instance api-${index + 1}` });
  const stack = await startStack(profile, {
    fresh: false,
    extraPorts,
    replicated,
    signal: lifecycle.signal,
    track: (name, stop) => lifecycle.onStop(name, stop, 90_000),
  });

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
  const demoAccounts = await prepareDatabase(stack, "grainyard", environment, { signal: lifecycle.signal });

  let logFile = join(profile.dataDir, "api.log");
  const count = wanted;
  if (replicated) {
    // The catalogue, slab, yard and sitemap pages read from it; everything else (and every write) from the primary.
    const replica = await startReplica({
      primary: stack.mariadb,
      dir: join(profile.dataDir, "mariadb-replica"),
      port: profile.ports.replica,
      appPassword: stack.databasePassword,
      databases: ["grainyard"],
      signal: lifecycle.signal,
      track: (name, stop) => lifecycle.onStop(name, stop, 90_000),
    });
    environment.DATABASE_REPLICA_HOST = replica.endpoint.host;
    environment.DATABASE_REPLICA_PORT = String(replica.endpoint.port);
  } else if (replicaWanted()) warn("GRAINYARD_REPLICA is for `npm start`; `npm run dev` reads from the primary only.");
  if (mode === "start") {
    await buildWebIfStale(lifecycle.signal);
    const { instances } = await startApiInstances({
      environment,
      count,
      appPort: profile.ports.app,
      dataDir: profile.dataDir,
      logName: "api",
      signal: lifecycle.signal,
      track: (name, stop) => lifecycle.onStop(name, stop),
    });
    for (const instance of instances) {
      void instance.process.exited.then((code) => {
        if (lifecycle.signal.aborted) return; // stopped on purpose
        const log = `the end of its log (${instance.logFile}):\n${tail(instance.logFile, 15)}`;
        // One of several: HAProxy sends its requests to the others.
        if (count > 1) warn(`${instance.name} stopped unexpectedly (exit ${code}); the other instances carry on; ${log}`);
        else lifecycle.fail(`the API stopped unexpectedly (exit ${code}); ${log}`);
      });
    }
    if (count > 1) logFile = join(profile.dataDir, "api-*.log");
  } else {
    if (instanceCount() > 1) warn("GRAINYARD_INSTANCES is for `npm start`; `npm run dev` runs one API with reload.");
    // tsx reloads the API when its code changes; Vite (inside it) reloads the pages when theirs does.
    const api = startProcess(tsx, ["watch", "--clear-screen=false", "--exclude", join(repoRoot, "apps/web/**"), apiEntry], {
      cwd: join(repoRoot, "apps/api"),
      env: { ...process.env, ...environment },
    });
    lifecycle.onStop("the API (tsx watch)", () => api.stop());
    await waitForApi(appUrl, api, undefined, lifecycle.signal);
    // The first page compiles the render through Vite: ask for it once so the first person does not wait.
    await waitUntil(async () => (await fetch(`${appUrl}/`)).ok, 60_000, "the first server-rendered page", lifecycle.signal);
  }

  banner([
    `Grainyard is running (${((Date.now() - started) / 1000).toFixed(1)} s)`,
    "",
    `  App:    ${appUrl}${count > 1 ? `   (HAProxy over ${count} API instances on ports ${instancePorts(profile.ports.app, count).join(", ")})` : ""}`,
    `  Inbox:  ${stack.inboxUrl}   (every e-mail the app sends)`,
    ...(replicated
      ? [`  Replica: MariaDB on 127.0.0.1:${profile.ports.replica} (catalogue, slab, yard and sitemap pages read from it)`]
      : []),
    ...(mode === "start" ? [`  Logs:   ${logFile}`] : [`  Hot reload: Vite inside the API (its socket on port ${profile.ports.vite})`]),
    "",
    "Demo accounts (Lakemont):",
    ...demoAccountLines(demoAccounts),
    "",
    ...secondFactorLines(demoAccounts),
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

const BENCH_PARTS = ["slab-math", "photos", "catalogue", "instances", "lighthouse"] as const;

/** `GRAINYARD_BENCH=instances,lighthouse npm run bench` runs only those parts; unknown names are refused. */
function chosenBenchParts(value: string | undefined): Set<string> {
  if (!value?.trim()) return new Set(BENCH_PARTS);
  const names = value
    .split(",")
    .map((name) => name.trim())
    .filter(Boolean);
  const unknown = names.filter((name) => !(BENCH_PARTS as readonly string[]).includes(name));
  if (unknown.length) throw new StackError(`GRAINYARD_BENCH: no part named ${unknown.join(", ")} (the parts: ${BENCH_PARTS.join(", ")})`);
  return new Set(names);
}

/**
 * `npm run bench`: slab-math and photo benchmarks, the catalogue search benchmark against a
 * national-scale catalogue (seeded once into its own database on the test profile's MariaDB), the
 * same search through HAProxy over 1, 2 and 3 instances, then Lighthouse on the demo's public pages.
 */
async function bench(lifecycle: Lifecycle): Promise<number> {
  const parts = chosenBenchParts(process.env.GRAINYARD_BENCH);
  if (parts.size < BENCH_PARTS.length) say(`only the benchmarks ${[...parts].join(", ")} (GRAINYARD_BENCH)`);
  const stack = await testServices(lifecycle, false);
  const { signal } = lifecycle;
  const environment = stack.apiEnvironment("grainyard_bench", { NODE_ENV: "test", BCRYPT_COST: "4", LOG_LEVEL: "silent" });
  const env = { ...process.env, ...environment };
  const cwd = join(repoRoot, "apps/api");
  const step = (name: string, script: string) => runStep(name, ...nodeWithTsx(script), { cwd, env, signal });
  if (parts.has("slab-math"))
    await runStep("slab-math benchmark", "pnpm", ["--filter", "@grainyard/slab-math", "bench"], { cwd: repoRoot, signal });
  if (parts.has("photos")) await step("photo benchmark", "bench/photo-pipeline.ts");
  if (parts.has("catalogue") || parts.has("instances")) {
    await stack.mariadb.createDatabase("grainyard_bench");
    await step("migrating the benchmark database", "src/cli/migrate.ts");
    say("seeding the national-scale catalogue (once; about 25 s)…");
    await step("seeding the national-scale catalogue", "src/cli/seed-national.ts");
  }
  if (parts.has("catalogue")) await step("catalogue search benchmark", "../../tests/bench/catalogue-search.ts");
  if (parts.has("instances")) await instancesBenchmark(stack, "grainyard_bench", signal);
  if (parts.has("lighthouse")) await lighthouseBenchmark(stack, lifecycle);
  return 0;
}

/**
 * Lighthouse on the demo's public pages (tests/bench/lighthouse.ts): the built app served by the API
 * on the Lakemont demo data, in its own database on the test profile's app port.
 */
async function lighthouseBenchmark(stack: RunningStack, lifecycle: Lifecycle): Promise<void> {
  const { signal } = lifecycle;
  await ensureTestTools(signal);
  const environment = stack.apiEnvironment("grainyard_lighthouse", {
    NODE_ENV: "test",
    BCRYPT_COST: "4",
    LOG_LEVEL: "warn",
    WEB_DIST: webDist,
  });
  say("preparing the demo for Lighthouse (migrations, Lakemont data once, the built app)…");
  await prepareDatabase(stack, "grainyard_lighthouse", environment, { signal });
  await buildWebIfStale(signal);
  const logFile = join(stack.profile.dataDir, "api-lighthouse.log");
  const api = startApi(environment, logFile);
  try {
    await waitForApi(environment.PUBLIC_URL!, api, logFile, signal);
    await runStep("Lighthouse benchmark", ...nodeWithTsx("bench/lighthouse.ts"), {
      cwd: join(repoRoot, "tests"),
      env: { ...process.env, APP_URL: environment.PUBLIC_URL!, CHROMIUM_PATH: CHROMIUM },
      signal,
    });
  } finally {
    await api.stop();
  }
}

const apiCli = (name: string) => join(repoRoot, "apps/api/src/cli", `${name}.ts`);
const backupsDir = () => resolve(process.env.GRAINYARD_BACKUP_DIR ?? join(repoRoot, ".data/backups"));
const portInUse = (port: number) =>
  assertPortFree(port, "").then(
    () => false,
    () => true,
  );

/**
 * `npm run backup`: against the running local stack when `npm start` is up (the dump is consistent
 * while the app takes writes), otherwise with the local services started just for it (no API).
 */
async function backup(lifecycle: Lifecycle): Promise<number> {
  const profile = profileFor("local");
  const cwd = join(repoRoot, "apps/api");
  const env = { ...process.env, GRAINYARD_BACKUP_DIR: backupsDir() };
  const envFile = join(profile.dataDir, "api.env");
  if (existsSync(envFile) && (await portInUse(profile.ports.mariadb))) {
    say(`backing up the running local stack (MariaDB on 127.0.0.1:${profile.ports.mariadb})…`);
    await runStep("backup", ...nodeWithTsx(apiCli("backup")), {
      cwd,
      env: { ...env, ...readEnvironmentFile(envFile) },
      signal: lifecycle.signal,
    });
    return 0;
  }
  if (!existsSync(join(profile.dataDir, "mariadb", "data")))
    throw new StackError(`nothing to back up: the local stack has no data yet (${profile.dataDir}); start it once with npm start.`);
  say("Grainyard is not running: starting its local services (not the app) for the backup…");
  const stack = await startStack(profile, {
    fresh: false,
    signal: lifecycle.signal,
    track: (name, stop) => lifecycle.onStop(name, stop, 90_000),
  });
  const environment = stack.apiEnvironment("grainyard", { NODE_ENV: "development", LOG_LEVEL: "warn" });
  await runStep("backup", ...nodeWithTsx(apiCli("backup")), { cwd, env: { ...env, ...environment }, signal: lifecycle.signal });
  return 0;
}

/**
 * `npm run restore -- <folder>`: checks the backup's checksums first, refuses while Grainyard runs
 * (the app would write into the database and bucket being replaced, and keep stale caches), then
 * starts the local services alone, replaces the database and the photo bucket, and stops them.
 */
async function restore(lifecycle: Lifecycle): Promise<number> {
  const given = process.argv[3];
  const profile = profileFor("local");
  const root = backupsDir();
  if (!given) {
    const found = existsSync(root)
      ? readdirSync(root)
          .filter((name) => /^\d{4}-\d{2}-\d{2}T[\d-]+Z$/.test(name))
          .sort()
      : [];
    throw new StackError(
      `[grainyard] ✗ give the backup folder to restore: npm run restore -- <folder>${found.length ? `\n  backups in ${root}:\n${found.map((name) => `    ${join(root, name)}`).join("\n")}` : ` (none in ${root} yet; npm run backup makes one)`}`,
    );
  }
  // npm runs scripts in the repository root; a relative folder is meant from where npm was called.
  const folder = resolve(process.env.INIT_CWD ?? process.cwd(), given);
  const cwd = join(repoRoot, "apps/api");
  await runStep("checking the backup", ...nodeWithTsx(apiCli("restore"), ["--check", folder]), { cwd, signal: lifecycle.signal });
  if ((await portInUse(profile.ports.app)) || (await portInUse(profile.ports.mariadb)))
    throw new StackError(
      `Grainyard is running (port ${profile.ports.app} or ${profile.ports.mariadb} is in use): stop npm start (Ctrl-C) first. A restore replaces the database and the photo bucket; the app must not write into them meanwhile. Nothing was changed.`,
    );
  say("starting the local services (not the app) for the restore…");
  const stack = await startStack(profile, {
    fresh: false,
    signal: lifecycle.signal,
    track: (name, stop) => lifecycle.onStop(name, stop, 90_000),
  });
  const environment = stack.apiEnvironment("grainyard", { NODE_ENV: "development", LOG_LEVEL: "warn" });
  await stack.mariadb.createDatabase("grainyard");
  await runStep("restore", ...nodeWithTsx(apiCli("restore"), [folder]), {
    cwd,
    env: { ...process.env, ...environment },
    signal: lifecycle.signal,
  });
  say("restored; start Grainyard with npm start");
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
  backup: [130, backup],
  restore: [130, restore],
};
const mode = process.argv[2] ?? "start";
const job = jobs[mode];
if (!job) {
  process.stderr.write(`[grainyard] ✗ unknown mode "${mode}"; use ${Object.keys(jobs).join(", ")}\n`);
  process.exit(2);
}
const lifecycle = new Lifecycle(job[0]);
await lifecycle.run(() => job[1](lifecycle));
