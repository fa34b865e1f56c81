import { spawn, type ChildProcess, type SpawnOptions } from "node:child_process";
import { createWriteStream, existsSync, readFileSync } from "node:fs";
import { StackError } from "./log.ts";

export interface ManagedProcess {
  child: ChildProcess;
  exited: Promise<number>;
  stop(): Promise<void>;
}

/** Starts a long-running child; its output goes to `logFile` (or the terminal when none). */
export function startProcess(command: string, args: string[], options: SpawnOptions & { logFile?: string }): ManagedProcess {
  const { logFile, ...spawnOptions } = options;
  const child = spawn(command, args, { ...spawnOptions, stdio: logFile ? ["ignore", "pipe", "pipe"] : ["ignore", "inherit", "inherit"] });
  if (logFile) {
    const out = createWriteStream(logFile, { flags: "a" });
    child.stdout?.pipe(out);
    child.stderr?.pipe(out);
  }
  const exited = new Promise<number>((resolvePromise) => child.on("exit", (code, signal) => resolvePromise(code ?? (signal ? 128 : 0))));
  let done = false;
  void exited.then(() => (done = true));
  return {
    child,
    exited,
    async stop() {
      if (done) return;
      child.kill("SIGTERM");
      const timer = setTimeout(() => child.kill("SIGKILL"), 10_000);
      await exited;
      clearTimeout(timer);
    },
  };
}

/** Runs a command to completion; a non-zero exit becomes a StackError naming the step. */
export async function runStep(
  step: string,
  command: string,
  args: string[],
  options: SpawnOptions & { quiet?: boolean } = {},
): Promise<string> {
  const { quiet, ...spawnOptions } = options;
  const child = spawn(command, args, { ...spawnOptions, stdio: quiet ? ["ignore", "pipe", "pipe"] : ["ignore", "inherit", "inherit"] });
  let output = "";
  child.stdout?.on("data", (chunk) => (output += chunk));
  child.stderr?.on("data", (chunk) => (output += chunk));
  const code = await new Promise<number>((resolvePromise, reject) => {
    child.on("error", (error) => reject(new StackError(`${step}: ${error.message}`)));
    child.on("exit", (exitCode, signal) => resolvePromise(exitCode ?? (signal ? 128 : 0)));
  });
  if (code !== 0) {
    const lastLines = output.trim().split("\n").slice(-1)[0] ?? "";
    throw new StackError(`${step} failed (exit ${code})${lastLines ? `: ${lastLines}` : ""}`);
  }
  return output;
}

export function tail(file: string, lines = 20): string {
  if (!existsSync(file)) return "";
  return readFileSync(file, "utf8").trim().split("\n").slice(-lines).join("\n");
}
