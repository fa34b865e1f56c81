import { spawn, type ChildProcess, type SpawnOptions } from "node:child_process";
import { createWriteStream, existsSync, readFileSync } from "node:fs";
import { createRequire } from "node:module";
import { join } from "node:path";
import { pathToFileURL } from "node:url";
import { runTool } from "../tools.mjs";
import { Interrupted, StackError } from "./log.ts";
import { repoRoot } from "./profile.ts";

export interface ManagedProcess {
  child: ChildProcess;
  exited: Promise<number>;
  stop(): Promise<void>;
}

/** True while any process is left in the process group `pgid`. */
function groupAlive(pgid: number): boolean {
  try {
    process.kill(-pgid, 0);
    return true;
  } catch {
    return false;
  }
}

function signalGroup(pgid: number, signal: NodeJS.Signals): void {
  try {
    process.kill(-pgid, signal);
  } catch {
    // already gone
  }
}

async function waitForGroupToEnd(pgid: number, ms: number): Promise<boolean> {
  const deadline = Date.now() + ms;
  while (groupAlive(pgid)) {
    if (Date.now() > deadline) return false;
    await new Promise((r) => setTimeout(r, 50));
  }
  return true;
}

/**
 * Starts a long-running child in its own process group; its output goes to `logFile` (or the
 * terminal when none). A terminal's Ctrl-C does not reach it: the runner stops it, in order, by
 * sending SIGTERM to the whole group (a wrapper and what it started alike), SIGKILL after 10 s.
 */
export function startProcess(command: string, args: string[], options: SpawnOptions & { logFile?: string }): ManagedProcess {
  const { logFile, ...spawnOptions } = options;
  const child = spawn(command, args, {
    ...spawnOptions,
    detached: true,
    stdio: logFile ? ["ignore", "pipe", "pipe"] : ["ignore", "inherit", "inherit"],
  });
  if (logFile) {
    const out = createWriteStream(logFile, { flags: "a" });
    child.stdout?.pipe(out);
    child.stderr?.pipe(out);
  }
  const exited = new Promise<number>((resolvePromise) => {
    child.on("exit", (code, signal) => resolvePromise(code ?? (signal ? 128 : 0)));
    child.on("error", () => resolvePromise(127));
  });
  const pgid = child.pid;
  return {
    child,
    exited,
    async stop() {
      if (!pgid) return;
      signalGroup(pgid, "SIGTERM");
      if (await waitForGroupToEnd(pgid, 10_000)) return;
      signalGroup(pgid, "SIGKILL");
      if (!(await waitForGroupToEnd(pgid, 5_000)))
        throw new StackError(`${command} (process group ${pgid}) is still running after SIGKILL; stop it with \`kill -9 -${pgid}\`.`);
    },
  };
}

/** The tsx loader, so TypeScript entry points run in one plain node process (no tsx wrapper process). */
const tsxLoader = pathToFileURL(createRequire(import.meta.url).resolve("tsx")).href;

/** `node --import tsx <script> …args`: the command and arguments that run a TypeScript file. */
export function nodeWithTsx(script: string, args: string[] = []): [string, string[]] {
  return [process.execPath, ["--import", tsxLoader, script, ...args]];
}

/**
 * Runs a command to completion. `quiet` steps show progress only when slow and their output only
 * on failure (with what to do); the others print straight to the terminal (benchmarks).
 */
export async function runStep(
  step: string,
  command: string,
  args: string[],
  options: SpawnOptions & { quiet?: boolean; advice?: (output: string) => string; signal?: AbortSignal } = {},
): Promise<string> {
  const { quiet, advice, signal, ...spawnOptions } = options;
  if (quiet) {
    const { stdout } = await runTool({
      label: step,
      command,
      args,
      cwd: spawnOptions.cwd?.toString(),
      env: spawnOptions.env,
      advice,
      signal,
      logFile: join(repoRoot, ".data/logs", `${step.replace(/[^a-z0-9]+/gi, "-")}.log`),
    });
    return stdout;
  }
  const child = spawn(command, args, { ...spawnOptions, stdio: ["ignore", "inherit", "inherit"] });
  const onAbort = () => child.kill("SIGTERM");
  signal?.addEventListener("abort", onAbort, { once: true });
  const code = await new Promise<number>((resolvePromise, reject) => {
    child.on("error", (error) => reject(new StackError(`${step} could not start: ${error.message}`)));
    child.on("exit", (exitCode, exitSignal) => resolvePromise(exitCode ?? (exitSignal ? 128 : 0)));
  }).finally(() => signal?.removeEventListener("abort", onAbort));
  if (signal?.aborted) throw new Interrupted(step);
  if (code !== 0) throw new StackError(`${step} failed (exit ${code}); its output is above.`);
  return "";
}

export function tail(file: string, lines = 20): string {
  if (!existsSync(file)) return "";
  return readFileSync(file, "utf8").trim().split("\n").slice(-lines).join("\n");
}
