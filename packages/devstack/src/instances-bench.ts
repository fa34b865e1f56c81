import { spawn } from "node:child_process";
import { cpus } from "node:os";
import { join } from "node:path";
import { startApi, waitForApi } from "./api-process.ts";
import { startHaproxy } from "./haproxy.ts";
import { instancePorts } from "./instances.ts";
import { say } from "./log.ts";
import type { ManagedProcess } from "./processes.ts";
import { repoRoot } from "./profile.ts";
import type { RunningStack } from "./stack.ts";

/** The same typical buyer's search as tests/bench/catalogue-search.ts. */
const TYPICAL = "species=black-walnut,white-oak&lengthMin=1800&widthMin=500&moistureMax=10&sort=newest&limit=24";
const CONNECTIONS = 50;
const SECONDS = Number(process.env.BENCH_INSTANCE_SECONDS ?? 8);
const WARM_UP_SECONDS = 2;
const loadGenerator = join(repoRoot, "tests/bench/load-generator.mjs");

interface Figures {
  requests: number;
  /** Answers other than 200 by status, and connection errors. */
  failures: string;
  seconds: number;
  p50: number;
  p95: number;
  p99: number;
}

/** autocannon in a process of its own (tests/bench/load-generator.mjs) against one URL for `seconds`. */
async function load(url: string, seconds: number, signal: AbortSignal): Promise<Figures> {
  const child = spawn(process.execPath, [loadGenerator, url, String(CONNECTIONS), String(seconds)], {
    cwd: join(repoRoot, "tests"),
    stdio: ["ignore", "pipe", "inherit"],
    signal,
  });
  let output = "";
  child.stdout.on("data", (chunk: Buffer) => (output += chunk.toString()));
  const code = await new Promise<number | null>((resolvePromise) => {
    child.on("close", resolvePromise);
    child.on("error", () => resolvePromise(-1));
  });
  if (code !== 0) throw new Error(`the load generator stopped with code ${code}`);
  const { latencies, statuses, errors } = JSON.parse(output) as { latencies: number[]; statuses: Record<string, number>; errors: number };
  const failures = [...Object.entries(statuses).map(([status, count]) => `${count} × ${status}`), ...(errors ? [`${errors} errors`] : [])];
  latencies.sort((a, b) => a - b);
  const at = (p: number) => latencies[Math.min(latencies.length - 1, Math.floor((p / 100) * latencies.length))] ?? Number.NaN;
  return { requests: latencies.length, failures: failures.join(", ") || "0", seconds, p50: at(50), p95: at(95), p99: at(99) };
}

/**
 * Catalogue search throughput through HAProxy over 1, 2 and 3 API instances, with the answer cache
 * off and on (issue 13's proof), on the national-scale catalogue in `database`. Three instances are
 * started per cache setting; HAProxy is started over the first 1, 2, then 3 of them, so every
 * figure pays the same load-balancer hop. Loopback only, bounded time; figures only, no assertion.
 */
export async function instancesBenchmark(stack: RunningStack, database: string, signal: AbortSignal): Promise<void> {
  const { ports, dataDir } = stack.profile;
  const rows: Record<string, string | number>[] = [];
  for (const cache of ["off", "on"] as const) {
    const environment = stack.apiEnvironment(database, { NODE_ENV: "test", BCRYPT_COST: "4", LOG_LEVEL: "warn", CATALOGUE_CACHE: cache });
    const running: ManagedProcess[] = [];
    try {
      const instances = instancePorts(ports.app, 3).map((port, index) => {
        const name = `api-${index + 1}`;
        const logFile = join(dataDir, `api-bench-${index + 1}.log`);
        const api = startApi({ ...environment, PORT: String(port), GRAINYARD_INSTANCE: name, TRUST_PROXY: "loopback" }, logFile);
        running.push(api);
        return { name, port, api, logFile };
      });
      await Promise.all(instances.map((i) => waitForApi(`http://127.0.0.1:${i.port}`, i.api, i.logFile, signal)));
      for (const count of [1, 2, 3]) {
        say(`catalogue search through HAProxy over ${count} instance${count > 1 ? "s" : ""}, answer cache ${cache}…`);
        const haproxy = await startHaproxy({
          dir: join(dataDir, "haproxy-bench"),
          port: ports.app,
          backends: instances.slice(0, count).map((i) => ({ name: i.name, port: i.port })),
          signal,
        });
        try {
          const url = `http://127.0.0.1:${ports.app}/api/v1/catalogue?${TYPICAL}`;
          await load(url, WARM_UP_SECONDS, signal);
          const figures = await load(url, SECONDS, signal);
          rows.push({
            instances: count,
            "answer cache": cache,
            "requests/s": Math.round(figures.requests / figures.seconds),
            "p50 ms": figures.p50.toFixed(1),
            "p95 ms": figures.p95.toFixed(1),
            "p99 ms": figures.p99.toFixed(1),
            "not 200": figures.failures,
          });
        } finally {
          await haproxy.stop();
        }
      }
    } finally {
      for (const api of running.reverse()) await api.stop();
    }
  }
  process.stdout.write(
    `\nCatalogue search through HAProxy over 1, 2 and 3 API instances (${CONNECTIONS} connections, ${SECONDS} s each after ${WARM_UP_SECONDS} s warm-up, ${cpus().length} cores shared by MariaDB, HAProxy, the load generator and the instances)\n`,
  );
  console.table(rows);
  process.stdout.write(
    [
      "Read: each API instance is one Node.js event loop, so one instance uses at most one core. On this machine the",
      "cores are also MariaDB's, HAProxy's and the load generator's, so a second instance gains what the second core",
      "has left and a third mostly adds context switching. With the cache on, a repeated search costs no query and",
      "the instances' JSON work is what scales. With it off, MariaDB does most of the work for every answer: more",
      "instances only send it more queries at once on the same two cores, so throughput falls as they are added;",
      "instances pay off when they run on cores (machines) of their own and the database has room to spare.",
      "Answers other than 200 would be HAProxy's 503s for an instance taken out (three failed /api/health/serving",
      "checks); the HAProxy log is under the data folder.",
      "",
    ].join("\n"),
  );
}
