import { get as httpGet } from "node:http";
import { join } from "node:path";
import { StackError } from "./log.ts";
import { waitUntil } from "./ports.ts";
import { runStep, tail, type ManagedProcess } from "./processes.ts";
import { repoRoot } from "./profile.ts";
import type { RunningStack } from "./stack.ts";

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

export async function waitForApi(url: string, api: ManagedProcess, logFile?: string): Promise<void> {
  let exitCode: number | null = null;
  void api.exited.then((code) => (exitCode = code));
  await waitUntil(
    async () => {
      if (exitCode !== null)
        throw new StackError(`the API stopped while starting (exit ${exitCode})${logFile ? `: ${tail(logFile, 1)}` : ""}`);
      return (await statusOf(`${url}/api/health`, 2_000)) === 200;
    },
    60_000,
    "the API",
  );
}

/** Migrations and demo data for one database, through the api's own CLI. */
export async function prepareDatabase(
  stack: RunningStack,
  database: string,
  environment: Record<string, string>,
  seed = true,
): Promise<DemoAccount[]> {
  stack.mariadb.createDatabase(database);
  const output = await runStep("running migrations and seeding", tsx, [apiCli("prepare"), ...(seed ? [] : ["--no-seed"])], {
    cwd: join(repoRoot, "apps/api"),
    env: { ...process.env, ...environment },
    quiet: true,
  });
  return JSON.parse(output.trim().split("\n").at(-1) ?? "[]") as DemoAccount[];
}

export interface DemoAccount {
  role: string;
  email: string;
  password: string;
  name: string;
}
