import { get as httpGet } from "node:http";
import { join } from "node:path";
import { StackError } from "./log.ts";
import { waitUntil } from "./ports.ts";
import { nodeWithTsx, runStep, startProcess, tail, type ManagedProcess } from "./processes.ts";
import { repoRoot } from "./profile.ts";
import type { RunningStack } from "./stack.ts";

/** tsx's command line, for `tsx watch` in `npm run dev` (everything else runs through nodeWithTsx). */
export const tsx = join(repoRoot, "packages/devstack/node_modules/.bin/tsx");
export const apiEntry = join(repoRoot, "apps/api/src/main.ts");
const apiCli = (name: string) => join(repoRoot, "apps/api/src/cli", `${name}.ts`);

/** A GET's status through node:http (fetch refuses the Fetch standard's "bad ports", 10080 among them). */
function statusOf(url: string, timeoutMs: number): Promise<number> {
  return new Promise((resolvePromise, reject) => {
    const request = httpGet(url, { timeout: timeoutMs }, (response) => {
      response.resume();
      resolvePromise(response.statusCode ?? 0);
    });
    request.on("timeout", () => request.destroy(new Error("timed out")));
    request.on("error", reject);
  });
}

/** Starts the API as one node process (its own process group; its output goes to `logFile`). */
export function startApi(environment: Record<string, string>, logFile: string): ManagedProcess {
  const [command, args] = nodeWithTsx(apiEntry);
  return startProcess(command, args, { cwd: join(repoRoot, "apps/api"), env: { ...process.env, ...environment }, logFile });
}

export async function waitForApi(url: string, api: ManagedProcess, logFile?: string, signal?: AbortSignal): Promise<void> {
  let exitCode: number | null = null;
  void api.exited.then((code) => (exitCode = code));
  await waitUntil(
    async () => {
      if (exitCode !== null)
        throw new StackError(
          `the API stopped while starting (exit ${exitCode})${logFile ? `; the end of its log (${logFile}):\n${tail(logFile, 15)}` : ""}`,
        );
      return (await statusOf(`${url}/api/health`, 2_000)) === 200;
    },
    60_000,
    "the API",
    signal,
  );
}

/** Migrations and demo data for one database, through the api's own CLI. */
export async function prepareDatabase(
  stack: RunningStack,
  database: string,
  environment: Record<string, string>,
  options: { seed?: boolean; signal?: AbortSignal } = {},
): Promise<DemoAccount[]> {
  await stack.mariadb.createDatabase(database);
  const [command, args] = nodeWithTsx(apiCli("prepare"), options.seed === false ? ["--no-seed"] : []);
  const output = await runStep("running migrations and seeding", command, args, {
    cwd: join(repoRoot, "apps/api"),
    env: { ...process.env, ...environment },
    quiet: true,
    signal: options.signal,
    advice: () =>
      `Read the error above (the database is ${database} on 127.0.0.1:${stack.mariadb.endpoint.port}); a half-applied migration is undone by deleting ${stack.profile.dataDir}, which loses the local data.`,
  });
  return JSON.parse(output.trim().split("\n").at(-1) ?? "[]") as DemoAccount[];
}

export interface DemoAccount {
  role: string;
  email: string;
  password: string;
  name: string;
  /** The demo admin's second factor: its secret (made once by the seed, kept in the database) and the address a QR code holds. */
  secondFactor?: { secret: string; otpauthUrl: string };
}
