import { chmodSync, existsSync, rmSync, writeFileSync } from "node:fs";
import { join } from "node:path";
import { looksLikeNetworkTrouble, runTool } from "../tools.mjs";
import { Interrupted, say, StackError, ToolFailure } from "./log.ts";
import { repoRoot } from "./profile.ts";

/** How long apt waits for its lock (held by the system's automatic updates on a freshly booted machine). */
const APT_LOCK_WAIT_SECONDS = 300;

const POLICY_RC_D = "/usr/sbin/policy-rc.d";

/** One plain sentence of what to do when apt-get fails, from its output. */
export function aptAdvice(output: string): string {
  if (/Could not get lock|Unable to acquire the dpkg frontend lock|Unable to lock/i.test(output))
    return "Another program still holds apt's lock (often the system's automatic updates after boot): wait until it has finished (`ps -e | grep -E 'apt|dpkg|unattended'`), then run the command again.";
  if (/dpkg was interrupted/i.test(output))
    return "An earlier install was cut short: run `dpkg --configure -a` as root, then run the command again.";
  if (/Unable to locate package|has no installation candidate/i.test(output))
    return "apt does not know this package: make sure /etc/apt/sources.list (or /etc/apt/sources.list.d/) names Debian 12's main archive, then run the command again.";
  if (looksLikeNetworkTrouble(output) || /\b404\s+Not Found|Hash Sum mismatch/i.test(output))
    return "apt could not download from the Debian mirrors: check the network (and any proxy in /etc/apt/apt.conf.d/), then run the command again.";
  if (/No space left|You don't have enough free space/i.test(output))
    return "The disk is full: free some space, then run the command again.";
  return "Fix what apt reports above (running the same apt-get command by hand shows more), then run the command again.";
}

export interface AptOptions {
  /** Why these packages are needed, for the progress line ("for the end-to-end tests"). */
  why: string;
  /** Keep apt from starting the packages' system services (a policy-rc.d answering 101 while installing). */
  noServiceStart?: boolean;
  signal?: AbortSignal;
  lockWaitSeconds?: number;
  /** Extra `-o` options for every apt-get call (the tests point apt at private state). */
  aptOptions?: string[];
  /** Install options after `install -y` (the tests add --no-download). */
  installOptions?: string[];
}

const LISTS_LOCKED = /Could not get lock \S*lists\/lock|Unable to lock directory \S*lists/i;

/**
 * `apt-get update` then `apt-get install -y <packages>` as root, with progress. apt's own lock
 * timeout (DPkg::Lock::Timeout) makes the install wait for the package lock; `apt-get update` does
 * not honour that option for its lists lock (apt 2.6), so the update is retried for the same time.
 * Either wait is announced once, with who holds the lock.
 */
export async function aptInstall(packages: string[], options: AptOptions): Promise<void> {
  const lockWait = options.lockWaitSeconds ?? APT_LOCK_WAIT_SECONDS;
  const base = ["-o", `DPkg::Lock::Timeout=${lockWait}`, ...(options.aptOptions ?? [])];
  const env = { ...process.env, DEBIAN_FRONTEND: "noninteractive" };
  const logFile = join(repoRoot, ".data/logs/apt-get.log");
  let lockNoticeShown = false;
  const lockNotice = (line: string) => {
    if (lockNoticeShown || !/Waiting for cache lock|Could not get lock/i.test(line)) return;
    lockNoticeShown = true;
    const holder = /held by process \d+ \(([^)]+)\)/.exec(line)?.[1];
    say(
      `apt's lock is held by ${holder ? `"${holder}"` : "another program"} (often the system's automatic updates right after boot); waiting up to ${Math.round(lockWait / 60) || 1} min for it…`,
    );
  };

  let createdPolicy = false;
  if (options.noServiceStart && !existsSync(POLICY_RC_D)) {
    writeFileSync(POLICY_RC_D, "#!/bin/sh\n# Written by Grainyard's stack runner while apt installs; removed afterwards.\nexit 101\n");
    chmodSync(POLICY_RC_D, 0o755);
    createdPolicy = true;
  }
  try {
    say(`installing Debian's ${packages.join(" and ")} ${options.why} (about a minute, once)…`);
    const waitStarted = Date.now();
    const deadline = waitStarted + lockWait * 1000;
    let lastBeat = waitStarted;
    for (let attempt = 0; ; attempt++) {
      try {
        await runTool({
          label: "apt-get update",
          command: "apt-get",
          args: [...base, "update"],
          env,
          advice: aptAdvice,
          announce: attempt === 0,
          signal: options.signal,
          onLine: lockNotice,
          logFile,
        });
        break;
      } catch (error) {
        if (!(error instanceof ToolFailure) || !LISTS_LOCKED.test(error.output) || Date.now() > deadline) throw error;
        lockNotice(/Could not get lock[^\n]*/.exec(error.output)?.[0] ?? "Could not get lock");
        if (Date.now() - lastBeat >= 30_000) {
          say(`  … still waiting for apt's lock (${Math.round((Date.now() - waitStarted) / 1000)} s)`);
          lastBeat = Date.now();
        }
        await new Promise((r) => setTimeout(r, 2000));
        if (options.signal?.aborted) throw new Interrupted("apt-get update");
      }
    }
    await runTool({
      label: `apt-get install ${packages.join(" ")}`,
      command: "apt-get",
      args: [...base, "install", "-y", ...(options.installOptions ?? []), ...packages],
      env,
      advice: aptAdvice,
      signal: options.signal,
      onLine: lockNotice,
      logFile,
    });
  } finally {
    if (createdPolicy) rmSync(POLICY_RC_D, { force: true });
  }
}

/** The first line of advice when something must be installed and this is not root. */
export function needsRoot(packages: string[], why: string): StackError {
  return new StackError(
    `${packages.join(" and ")} ${packages.length > 1 ? "are" : "is"} needed ${why} and this is not root: run \`apt-get install -y ${packages.join(" ")}\` once as root, then run the command again.`,
  );
}
