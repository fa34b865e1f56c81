// Helpers for the devstack's own tests: start the real runner (bootstrap.mjs) as a terminal would,
// in its own process group, send it the terminal's signals, find anything it left running, and
// run a check inside a private mount namespace (a hidden /etc/hosts) where the machine allows it.
import { spawn, spawnSync, type ChildProcess } from "node:child_process";
import { randomUUID } from "node:crypto";
import { readdirSync, readFileSync } from "node:fs";
import { createRequire } from "node:module";
import { join } from "node:path";
import { pathToFileURL } from "node:url";
import { repoRoot } from "./profile.ts";

export const bootstrap = join(repoRoot, "packages/devstack/bootstrap.mjs");
export const tsxLoader = pathToFileURL(createRequire(import.meta.url).resolve("tsx")).href;

/** The test profile's port base; the devstack's tests use base+10 and up (the suite's own stack uses base…base+6). */
export function testPortBase(): number {
  return Number(process.env.GRAINYARD_TEST_PORT_BASE ?? 6080);
}

/** The environment for a runner under test: no leftovers of the test stack it may run inside. */
export function runnerEnvironment(extra: Record<string, string>): NodeJS.ProcessEnv {
  const env = Object.fromEntries(Object.entries(process.env).filter(([key]) => !/^(VITEST|GRAINYARD_|DATABASE_|NODE_ENV$)/.test(key)));
  return { ...env, ...extra };
}

export interface RunnerUnderTest {
  child: ChildProcess;
  /** Everything printed so far (stdout and stderr). */
  output(): string;
  /** Resolves when the output matches `pattern`; rejects when the runner exits first or `ms` pass. */
  waitFor(pattern: RegExp, ms: number): Promise<void>;
  exited: Promise<{ code: number | null; signal: NodeJS.Signals | null }>;
  /** Like a terminal's Ctrl-C: SIGINT to every process in the runner's foreground group. */
  interrupt(): void;
  /** A unique variable every process the runner starts inherits (see processesMarked). */
  marker: string;
}

/** Starts `command args` in a new process group (like a shell starts a foreground job). */
export function startRunner(command: string, args: string[], env: NodeJS.ProcessEnv): RunnerUnderTest {
  const marker = `GRAINYARD_TEST_MARK=${randomUUID()}`;
  const [key, value] = marker.split("=") as [string, string];
  const child = spawn(command, args, { cwd: repoRoot, env: { ...env, [key]: value }, detached: true, stdio: ["ignore", "pipe", "pipe"] });
  let text = "";
  const listeners = new Set<() => void>();
  const take = (chunk: Buffer) => {
    text += chunk.toString("utf8");
    for (const listener of listeners) listener();
  };
  child.stdout!.on("data", take);
  child.stderr!.on("data", take);
  const exited = new Promise<{ code: number | null; signal: NodeJS.Signals | null }>((resolvePromise) =>
    child.on("close", (code, signal) => {
      resolvePromise({ code, signal });
      for (const listener of listeners) listener();
    }),
  );
  let done = false;
  void exited.then(() => (done = true));
  return {
    child,
    marker,
    exited,
    output: () => text,
    waitFor(pattern, ms) {
      return new Promise<void>((resolvePromise, reject) => {
        const check = () => {
          if (pattern.test(text)) finish(resolvePromise);
          else if (done) finish(() => reject(new Error(`the runner ended before printing ${pattern}; its output:\n${text}`)));
        };
        const timer = setTimeout(() => finish(() => reject(new Error(`no ${pattern} within ${ms} ms; the output so far:\n${text}`))), ms);
        const finish = (then: () => void) => {
          clearTimeout(timer);
          listeners.delete(check);
          then();
        };
        listeners.add(check);
        check();
      });
    },
    interrupt() {
      try {
        process.kill(-child.pid!, "SIGINT");
      } catch {
        // the group has ended already
      }
    },
  };
}

/** Processes (other than zombies) whose environment carries `marker`: whatever a runner left behind. */
export function processesMarked(marker: string): { pid: number; command: string }[] {
  const found: { pid: number; command: string }[] = [];
  for (const entry of readdirSync("/proc")) {
    if (!/^\d+$/.test(entry)) continue;
    try {
      const environ = readFileSync(`/proc/${entry}/environ`, "latin1").split("\0");
      if (!environ.includes(marker)) continue;
      const command = readFileSync(`/proc/${entry}/cmdline`, "latin1").split("\0").join(" ").trim();
      found.push({ pid: Number(entry), command });
    } catch {
      // gone, or not ours to read
    }
  }
  return found;
}

/**
 * The command prefix that gives a check its own mount namespace (so it can hide /etc/hosts
 * without touching the real one), or why this machine does not allow it.
 */
export function mountNamespacePrefix(): { prefix: string[] } | { reason: string } {
  if (process.platform !== "linux") return { reason: "mount namespaces are a Linux feature" };
  const attempts = [
    ["unshare", "--mount"],
    ["unshare", "--map-root-user", "--mount"],
  ];
  const errors: string[] = [];
  for (const prefix of attempts) {
    const probe = spawnSync(prefix[0]!, [...prefix.slice(1), "true"], { encoding: "utf8" });
    if (probe.status === 0) return { prefix };
    errors.push(`${prefix.join(" ")}: ${(probe.error?.message ?? probe.stderr).trim()}`);
  }
  return { reason: `this machine does not allow a private mount namespace (${errors.join("; ")})` };
}

/** A shell script run in the namespace: bind-mount each [file, over] pair, then exec the command. */
export function inNamespace(prefix: string[], mounts: [string, string][], command: string[]): [string, string[]] {
  const quote = (word: string) => `'${word.replace(/'/g, `'\\''`)}'`;
  const script = [
    "set -e",
    ...mounts.map(([file, over]) => `mount --bind ${quote(file)} ${quote(over)}`),
    `exec ${command.map(quote).join(" ")}`,
  ].join("\n");
  return [prefix[0]!, [...prefix.slice(1), "sh", "-c", script]];
}
