/*
 * Catalogue search benchmark, in one run on one machine (see `npm run bench`); the HTTP load comes
 * from a separate process (load-generator.mjs), as real clients would:
 *   1. a bare Express endpoint returning a JSON page of the same size as the search's answer,
 *   2. the catalogue search API (the real app, real MariaDB with the national-scale seed),
 *   3. the raw SQL of that search's page query through mysql2.
 * Prints requests/s and p50/p95/p99 latency for each, and the ratios. Figures only: no assertion.
 * Goals (issue): search p95 ≤ 25 ms; API throughput ≥ 50 % of the bare endpoint at 50 connections;
 * API time ≤ 1.5 × raw SQL time.
 */
import type { AddressInfo } from "node:net";
import { spawn } from "node:child_process";
import { join } from "node:path";
import express from "express";
import mysql from "mysql2/promise";
import { catalogueQuerySchema } from "../../packages/contracts/src/index.ts";
import { createApp } from "../../apps/api/src/app.ts";
import { loadConfig } from "../../apps/api/src/config.ts";
import { createDataSource } from "../../apps/api/src/db/data-source.ts";
import { createMailer } from "../../apps/api/src/integrations/mail.ts";
import { createPayments } from "../../apps/api/src/integrations/payments-stripe.ts";
import { createPhotoStorage } from "../../apps/api/src/integrations/storage.ts";
import { createLogger } from "../../apps/api/src/logger.ts";
import { createCatalogueService } from "../../apps/api/src/services/catalogue-service.ts";
import { findPlace } from "../../apps/api/src/services/places.ts";

const CONNECTIONS = 50;
/** Measured seconds per endpoint, split into interleaved rounds (a slow spell of a shared machine then touches every endpoint alike). */
const SECONDS = Number(process.env.BENCH_SECONDS ?? 15);
const ROUNDS = Number(process.env.BENCH_ROUNDS ?? 3);
/** Unmeasured seconds per endpoint first, so every server is compiled and its caches filled before timing starts. */
const WARM_UP_SECONDS = 2;
/** A typical buyer's filter set: two species, a length and width range, dry, newest first. */
const TYPICAL = "species=black-walnut,white-oak&lengthMin=1800&widthMin=500&moistureMax=10&sort=newest&limit=24";

const config = loadConfig({ ...process.env, LOG_LEVEL: "silent" });
const dataSource = createDataSource(config.database);
await dataSource.initialize();
const [{ count }] = (await dataSource.query("SELECT COUNT(*) AS count FROM catalogue_entry")) as { count: string }[];

async function serveApi(catalogueCache: boolean) {
  const app = createApp({
    config: { ...config, catalogueCache },
    dataSource,
    mailer: createMailer(config.mail),
    storage: createPhotoStorage(config.storage),
    payments: createPayments(config.payments),
    logger: createLogger("silent"),
  });
  const server = app.listen(0, "127.0.0.1");
  await new Promise((r) => server.once("listening", r));
  return { server, url: `http://127.0.0.1:${(server.address() as AddressInfo).port}/api/v1/catalogue?${TYPICAL}` };
}
// The API with its short answer cache (as deployed) and without it (every request reaches MariaDB).
const { server: apiServer, url: apiUrl } = await serveApi(true);
const { server: uncachedServer, url: uncachedUrl } = await serveApi(false);
const sample = await (await fetch(apiUrl)).text();

const bare = express();
bare.get("/page", (_req, res) => {
  res.type("application/json").send(sample);
});
const bareServer = bare.listen(0, "127.0.0.1");
await new Promise((r) => bareServer.once("listening", r));
const bareUrl = `http://127.0.0.1:${(bareServer.address() as AddressInfo).port}/page`;

// The SQL the API runs for the page (TypeORM's query with its parameters), run straight through mysql2.
const catalogue = createCatalogueService({ dataSource, cursorSecret: config.sessionSecret, cache: false });
const input = catalogueQuerySchema.parse(Object.fromEntries(new URLSearchParams(TYPICAL)));
const plan = await catalogue.prepareSearch(input);
if (!plan.page) throw new Error("The benchmark's typical search sorts by a column, not by distance.");
const { sql: pageSql, parameters: pageParameters } = plan.page;
const { sql: countSql, parameters: countParameters } = plan.count;
const explain = (await dataSource.query(`EXPLAIN ${pageSql}`, pageParameters)) as Record<string, unknown>[];
const explainCount = (await dataSource.query(`EXPLAIN ${countSql}`, countParameters)) as Record<string, unknown>[];

interface Figures {
  name: string;
  requestsPerSecond: number;
  p50: number;
  p95: number;
  p99: number;
}

interface Sample {
  latencies: number[];
  seconds: number;
}

function percentiles(name: string, samples: Sample[]): Figures {
  const latencies = samples.flatMap((s) => s.latencies);
  const seconds = samples.reduce((sum, s) => sum + s.seconds, 0);
  latencies.sort((a, b) => a - b);
  const at = (p: number) => latencies[Math.min(latencies.length - 1, Math.floor((p / 100) * latencies.length))] ?? NaN;
  return { name, requestsPerSecond: latencies.length / seconds, p50: at(50), p95: at(95), p99: at(99) };
}

/**
 * autocannon drives the HTTP endpoints from a separate process (load-generator.mjs), as real
 * clients would be; every response time is kept, so p95 is exact.
 */
async function cannon(name: string, url: string, seconds: number): Promise<Sample> {
  const child = spawn(process.execPath, [join(import.meta.dirname, "load-generator.mjs"), url, String(CONNECTIONS), String(seconds)], {
    stdio: ["ignore", "pipe", "inherit"],
  });
  let output = "";
  child.stdout.on("data", (chunk: Buffer) => (output += chunk.toString()));
  const code = await new Promise<number | null>((resolve) => child.on("close", resolve));
  if (code !== 0) throw new Error(`${name}: the load generator stopped with code ${code}`);
  const { latencies, failures, errors } = JSON.parse(output) as { latencies: number[]; failures: number; errors: number };
  if (failures > 0 || errors > 0) throw new Error(`${name}: ${failures} failed answers and ${errors} errors`);
  return { latencies, seconds };
}

/** The page and count queries as the API issues them, 50 at a time, straight through mysql2. */
const pool = mysql.createPool({
  host: config.database.host,
  port: config.database.port,
  user: config.database.user,
  password: config.database.password,
  database: config.database.database,
  connectionLimit: CONNECTIONS,
});
async function rawSql(seconds: number): Promise<Sample> {
  const latencies: number[] = [];
  const deadline = Date.now() + seconds * 1000;
  await Promise.all(
    Array.from({ length: CONNECTIONS }, async () => {
      while (Date.now() < deadline) {
        const started = performance.now();
        await Promise.all([pool.query(pageSql, pageParameters), pool.query(countSql, countParameters)]);
        latencies.push(performance.now() - started);
      }
    }),
  );
  return { latencies, seconds };
}

console.log(
  `\nCatalogue search benchmark — ${count} live listings, ${CONNECTIONS} connections, ${SECONDS} s each in ${ROUNDS} interleaved rounds after a ${WARM_UP_SECONDS} s warm-up`,
);
console.log(`typical query: ${TYPICAL}`);
console.log(`answer size: ${sample.length} bytes, ${(JSON.parse(sample) as { total: number }).total} matches`);
console.log("\nEXPLAIN of the page query:");
const explainRow = (row: Record<string, unknown>) => ({ table: row.table, type: row.type, key: row.key, rows: row.rows, Extra: row.Extra });
console.table(explain.map(explainRow));
console.log("EXPLAIN of the capped count query:");
console.table(explainCount.map(explainRow));

const endpoints: [string, (seconds: number) => Promise<Sample>][] = [
  ["bare Express, same JSON", (seconds) => cannon("bare Express", bareUrl, seconds)],
  ["catalogue search API", (seconds) => cannon("catalogue search API", apiUrl, seconds)],
  ["search API, cache off", (seconds) => cannon("search API, cache off", uncachedUrl, seconds)],
  ["raw SQL (mysql2)", rawSql],
];
for (const [, run] of endpoints) await run(WARM_UP_SECONDS);
const samples = endpoints.map((): Sample[] => []);
for (let round = 0; round < ROUNDS; round++) {
  for (const [i, [, run]] of endpoints.entries()) samples[i]!.push(await run(SECONDS / ROUNDS));
}
await pool.end();
const results = endpoints.map(([name], i) => percentiles(name, samples[i]!));
console.log("");
console.table(
  results.map((r) => ({
    endpoint: r.name,
    "requests/s": Math.round(r.requestsPerSecond),
    "p50 ms": r.p50.toFixed(1),
    "p95 ms": r.p95.toFixed(1),
    "p99 ms": r.p99.toFixed(1),
  })),
);
const [bareFigures, apiFigures, uncachedFigures, sqlFigures] = results as [Figures, Figures, Figures, Figures];
console.log(
  `API throughput / bare endpoint: ${((apiFigures.requestsPerSecond / bareFigures.requestsPerSecond) * 100).toFixed(0)} %  (goal ≥ 50 %)`,
);
console.log(`API p95: ${apiFigures.p95.toFixed(1)} ms  (goal ≤ 25 ms)`);
console.log(
  `uncached API p50 / raw SQL p50: ${(uncachedFigures.p50 / sqlFigures.p50).toFixed(2)} ×, p95: ${(uncachedFigures.p95 / sqlFigures.p95).toFixed(2)} ×  (goal ≤ 1.5 ×)`,
);
console.log(`uncached API: ${Math.round(uncachedFigures.requestsPerSecond)} requests/s, p95 ${uncachedFigures.p95.toFixed(1)} ms`);

// Other shapes of search, one at a time with the answer cache off (the service alone, no HTTP):
// what a buyer waits for on a first search at national scale.
const town = findPlace("Chicago, IL")!.id;
const shapes = [
  "sort=newest",
  "species=white-oak",
  "seats=8",
  "seats=8&sort=price_low",
  `near=${town}&radiusKm=100`,
  `near=${town}&radiusKm=100&sort=nearest`,
  `near=${town}&sort=nearest`,
  "features=burl&sets=bookmatched",
  "priceMax=50000&sort=largest",
];
const shapeRows = [];
for (const shape of shapes) {
  const parsed = catalogueQuerySchema.parse(Object.fromEntries(new URLSearchParams(shape)));
  const times: number[] = [];
  let total = 0;
  for (let run = 0; run < 25; run++) {
    const started = performance.now();
    total = (await catalogue.search(parsed)).total;
    if (run >= 5) times.push(performance.now() - started);
  }
  times.sort((a, b) => a - b);
  shapeRows.push({
    search: shape.replace(town, "Chicago"),
    matches: total,
    "median ms": times[Math.floor(times.length / 2)]!.toFixed(1),
    "slowest ms": times.at(-1)!.toFixed(1),
  });
}
console.log("\nOther searches, one at a time, answer cache off (20 runs each after 5 unmeasured):");
console.table(shapeRows);

apiServer.close();
uncachedServer.close();
bareServer.close();
await dataSource.destroy();
process.exit(0);
