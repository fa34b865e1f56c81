import { join } from "node:path";
import { startApi, waitForApi } from "./api-process.ts";
import { startHaproxy } from "./haproxy.ts";
import { StackError } from "./log.ts";
import type { ManagedProcess } from "./processes.ts";

/** At most this many API instances (their ports are the profile's base + 41 … + 49). */
const MAX_INSTANCES = 9;

/** GRAINYARD_INSTANCES: how many API processes `npm start` runs (1 unless told otherwise). */
export function instanceCount(raw = process.env.GRAINYARD_INSTANCES): number {
  if (raw === undefined || raw === "") return 1;
  const count = Number(raw);
  if (!Number.isInteger(count) || count < 1 || count > MAX_INSTANCES)
    throw new StackError(`GRAINYARD_INSTANCES must be a whole number from 1 to ${MAX_INSTANCES}, not "${raw}".`);
  return count;
}

/** Each instance's own loopback port behind the load balancer, from the app port. */
export function instancePorts(appPort: number, count: number): number[] {
  return Array.from({ length: count }, (_, index) => appPort + 41 + index);
}

export interface RunningInstance {
  name: string;
  port: number;
  url: string;
  process: ManagedProcess;
  logFile: string;
}

/**
 * The API on the app port: one process as always, or (count > 1) `count` processes on their own
 * ports, named api-1 … api-N, behind HAProxy on the app port. Every process is registered with
 * `track` the moment it exists; HAProxy is registered last, so it stops first.
 */
export async function startApiInstances(options: {
  environment: Record<string, string>;
  count: number;
  appPort: number;
  dataDir: string;
  /** Log file name stem: `api` gives api.log, or api-1.log … api-N.log. */
  logName: string;
  signal?: AbortSignal;
  track: (name: string, stop: () => Promise<void>) => void;
}): Promise<{ instances: RunningInstance[]; haproxy: ManagedProcess | null }> {
  const appUrl = `http://127.0.0.1:${options.appPort}`;
  if (options.count === 1) {
    const logFile = join(options.dataDir, `${options.logName}.log`);
    const api = startApi(options.environment, logFile);
    options.track("the API", () => api.stop());
    await waitForApi(appUrl, api, logFile, options.signal);
    return { instances: [{ name: "api", port: options.appPort, url: appUrl, process: api, logFile }], haproxy: null };
  }
  const ports = instancePorts(options.appPort, options.count);
  const instances = ports.map((port, index): RunningInstance => {
    const name = `api-${index + 1}`;
    const logFile = join(options.dataDir, `${options.logName}-${index + 1}.log`);
    const api = startApi(
      {
        ...options.environment,
        PORT: String(port),
        GRAINYARD_INSTANCE: name,
        // The client's address comes from the load balancer's X-Forwarded-For (it is on loopback).
        TRUST_PROXY: "loopback",
      },
      logFile,
    );
    options.track(`the API (${name})`, () => api.stop());
    return { name, port, url: `http://127.0.0.1:${port}`, process: api, logFile };
  });
  await Promise.all(instances.map((instance) => waitForApi(instance.url, instance.process, instance.logFile, options.signal)));
  const haproxy = await startHaproxy({
    dir: join(options.dataDir, "haproxy"),
    port: options.appPort,
    backends: instances.map((instance) => ({ name: instance.name, port: instance.port })),
    signal: options.signal,
    track: options.track,
  });
  await waitForApi(appUrl, instances[0]!.process, instances[0]!.logFile, options.signal);
  return { instances, haproxy };
}
