import { spawn, spawnSync } from "node:child_process";
import { cpSync, mkdirSync, mkdtempSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, describe, expect, it } from "vitest";
import { aptAdvice } from "./apt.ts";
import { inNamespace, mountNamespacePrefix, tsxLoader } from "./runner-harness.ts";

describe("aptAdvice", () => {
  it("tells a held lock, an interrupted dpkg, an unknown package and a network failure apart", () => {
    expect(aptAdvice("E: Could not get lock /var/lib/dpkg/lock-frontend. It is held by process 812 (unattended-upgr)")).toMatch(
      /automatic updates/,
    );
    expect(aptAdvice("E: dpkg was interrupted, you must manually run 'dpkg --configure -a' to correct the problem.")).toMatch(
      /dpkg --configure -a/,
    );
    expect(aptAdvice("E: Unable to locate package chromium")).toMatch(/sources\.list/);
    expect(aptAdvice("Err:1 http://deb.debian.org/debian bookworm InRelease\n  Temporary failure resolving 'deb.debian.org'")).toMatch(
      /Debian mirrors/,
    );
  });
});

const dir = mkdtempSync(join(tmpdir(), "devstack-apt-"));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

/** Holds POSIX (fcntl) locks on the given files, as apt and dpkg take them, for `seconds`. */
const HOLDER = `use strict; use Fcntl qw(F_SETLKW F_WRLCK SEEK_SET O_RDWR O_CREAT);
my $seconds = shift @ARGV; my @held;
for my $path (@ARGV) { sysopen(my $fh, $path, O_RDWR|O_CREAT) or die "open $path: $!";
  my $lock = pack("s s x4 q q l x4", F_WRLCK, SEEK_SET, 0, 0, 0); fcntl($fh, F_SETLKW, $lock) or die "lock $path: $!"; push @held, $fh; }
$| = 1; print "held\\n"; sleep $seconds;`;

describe("apt's lock held by another program (automatic updates on a freshly booted machine)", () => {
  const namespace = mountNamespacePrefix();
  const has = (tool: string) => spawnSync("sh", ["-c", `command -v ${tool}`]).status === 0;
  const skipReason =
    "reason" in namespace
      ? namespace.reason
      : process.getuid?.() !== 0
        ? "apt-get needs root"
        : !has("apt-get") || !has("perl")
          ? "apt-get or perl is missing (not a Debian system)"
          : undefined;

  it("waits with a message, then installs; gives up after the bounded wait with what to do", { timeout: 90_000 }, async (context) => {
    if (skipReason) {
      console.warn(`skipped: ${skipReason}`);
      context.skip(skipReason);
    }
    // apt works on private copies of its state inside the namespace: the machine's own apt and
    // dpkg state, caches and logs are never touched, and nothing is downloaded or installed.
    const state = join(dir, "state");
    cpSync("/var/lib/dpkg", join(state, "dpkg"), { recursive: true });
    cpSync("/var/lib/apt", join(state, "apt"), { recursive: true });
    mkdirSync(join(state, "cache/archives/partial"), { recursive: true });
    mkdirSync(join(state, "log"), { recursive: true });
    mkdirSync(join(state, "no-sources"), { recursive: true });
    writeFileSync(join(dir, "hold.pl"), HOLDER);
    const script = `
      import { spawn } from "node:child_process";
      const { aptInstall } = await import(${JSON.stringify(join(import.meta.dirname, "apt.ts"))});
      const hold = (seconds, ...files) => new Promise((resolve) => {
        const holder = spawn("perl", [${JSON.stringify(join(dir, "hold.pl"))}, String(seconds), ...files], { stdio: ["ignore", "pipe", "inherit"] });
        holder.stdout.once("data", () => resolve(holder));
      });
      const options = (lockWaitSeconds) => ({ why: "for the lock check", lockWaitSeconds,
        aptOptions: ["-o", "Dir::Etc::sourcelist=/dev/null", "-o", "Dir::Etc::sourceparts=${join(state, "no-sources")}"],
        installOptions: ["--no-download"] });
      const timed = async (work) => { const started = Date.now(); await work(); return Date.now() - started; };
      const result = {};
      let holder = await hold(3, "/var/lib/apt/lists/lock", "/var/lib/dpkg/lock-frontend");
      result.listsLocked = await timed(() => aptInstall(["coreutils"], options(60)));
      holder = await hold(3, "/var/lib/dpkg/lock-frontend");
      result.dpkgLocked = await timed(() => aptInstall(["coreutils"], options(60)));
      holder = await hold(60, "/var/lib/dpkg/lock-frontend");
      result.failure = await aptInstall(["coreutils"], options(2)).then(() => "installed", (error) => error.message);
      holder.kill();
      console.log(JSON.stringify(result));
    `;
    const [command, args] = inNamespace(
      (namespace as { prefix: string[] }).prefix,
      [
        [join(state, "dpkg"), "/var/lib/dpkg"],
        [join(state, "apt"), "/var/lib/apt"],
        [join(state, "cache"), "/var/cache/apt"],
        [join(state, "log"), "/var/log/apt"],
      ],
      [process.execPath, "--import", tsxLoader, "--input-type=module", "-e", script],
    );
    const child = spawn(command, args, { stdio: ["ignore", "pipe", "pipe"] });
    let output = "";
    child.stdout.on("data", (chunk) => (output += chunk));
    child.stderr.on("data", (chunk) => (output += chunk));
    const code = await new Promise<number | null>((r) => child.on("close", r));
    expect(code, output).toBe(0);
    const result = JSON.parse(output.trim().split("\n").at(-1)!) as { listsLocked: number; dpkgLocked: number; failure: string };
    // Both waits happened (the holder let go after 3 s) and were announced, naming the holder.
    expect(result.listsLocked).toBeGreaterThan(2000);
    expect(result.dpkgLocked).toBeGreaterThan(2000);
    expect(
      output.match(/apt's lock is held by "perl" \(often the system's automatic updates right after boot\); waiting up to/g),
    ).toHaveLength(3);
    // apt's own option bounded the last wait; the report shows apt's words and what to do.
    expect(result.failure).toContain("✗ apt-get install coreutils failed (exit 100)");
    expect(result.failure).toContain("-o DPkg::Lock::Timeout=2");
    expect(result.failure).toMatch(/│ E: Unable to acquire the dpkg frontend lock/);
    expect(result.failure).toMatch(/What to do: Another program still holds apt's lock/);
  });
});
