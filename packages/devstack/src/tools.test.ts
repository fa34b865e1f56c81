import { spawnSync } from "node:child_process";
import { mkdtempSync, rmSync, writeFileSync } from "node:fs";
import { createRequire } from "node:module";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, afterEach, describe, expect, it, vi } from "vitest";
import { colourEnvironment, failureReport, Interrupted, relevantOutput, runTool, stripEscapes, ToolFailure } from "../tools.mjs";

const dir = mkdtempSync(join(tmpdir(), "devstack-tools-"));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

/** Captures what the runner prints to stdout while `work` runs. */
async function printed<T>(work: () => Promise<T>): Promise<{ lines: string[]; result: T | Error }> {
  const lines: string[] = [];
  const spy = vi.spyOn(process.stdout, "write").mockImplementation((chunk: string | Uint8Array) => {
    lines.push(...String(chunk).split("\n").filter(Boolean));
    return true;
  });
  try {
    const result = await work().catch((error: Error) => error);
    return { lines, result };
  } finally {
    spy.mockRestore();
  }
}

/** A node one-liner as a tool: `node -e <script>`. */
const nodeTool = (script: string) => ({ command: process.execPath, args: ["-e", script] });

afterEach(() => vi.restoreAllMocks());

describe("relevantOutput: the part of a failed tool's output worth showing", () => {
  it("keeps a short output whole, without escape codes, blank or bar-only lines", () => {
    const output = "\u001b[31mERR_PNPM_FETCH_404\u001b[39m GET https://registry.example/x: Not Found\n\n++++++++++\r\nsecond line  \n";
    expect(relevantOutput(output)).toEqual(["ERR_PNPM_FETCH_404 GET https://registry.example/x: Not Found", "second line"]);
  });

  it("folds repeats and pnpm's rewritten progress line", () => {
    const output = [
      ...Array(300).fill(
        "Waiting for cache lock: Could not get lock /var/lib/dpkg/lock-frontend. It is held by process 812 (unattended-upgr)...",
      ),
      "Progress: resolved 1, reused 0, downloaded 0, added 0",
      "Progress: resolved 400, reused 380, downloaded 20, added 400",
      "E: Unable to acquire the dpkg frontend lock (/var/lib/dpkg/lock-frontend), is another process using it?",
    ].join("\n");
    expect(relevantOutput(output)).toEqual([
      "Waiting for cache lock: Could not get lock /var/lib/dpkg/lock-frontend. It is held by process 812 (unattended-upgr)... (×300)",
      "Progress: resolved 400, reused 380, downloaded 20, added 400",
      "E: Unable to acquire the dpkg frontend lock (/var/lib/dpkg/lock-frontend), is another process using it?",
    ]);
  });

  it("shortens a long output to its error lines from early on and its end, saying how much was left out", () => {
    const lines = [
      "npm http fetch GET 200 https://registry.npmjs.org/a 12ms",
      "npm error code ECONNRESET",
      ...Array.from({ length: 200 }, (_, i) => `npm http fetch GET 200 https://registry.npmjs.org/p${i} 5ms`),
      "npm error network aborted",
    ];
    const shown = relevantOutput(lines.join("\n"), 40);
    expect(shown.length).toBeLessThanOrEqual(40);
    expect(shown[0]).toBe("npm error code ECONNRESET");
    expect(shown[1]).toMatch(/^… \d+ more lines …$/);
    expect(shown.at(-1)).toBe("npm error network aborted");
    expect(shown).not.toContain("npm http fetch GET 200 https://registry.npmjs.org/p0 5ms");
  });
});

describe("failureReport", () => {
  it("names the step and exit, the command, the tool's output and one sentence of what to do", () => {
    const report = failureReport({
      label: "initialising a private MariaDB data folder (mariadb-install-db)",
      command: "mariadb-install-db",
      args: ["--defaults-file=/srv/my data/my.cnf", "--skip-test-db"],
      code: 1,
      output:
        "Neither host 'box' nor 'localhost' could be looked up with\n'/usr/bin/resolveip'\nrestart this script with the --force option\n",
      seconds: 0.4,
      advice: "Give the host a name in /etc/hosts, then run the command again.",
    });
    expect(report.split("\n")).toEqual([
      "[grainyard] ✗ initialising a private MariaDB data folder (mariadb-install-db) failed (exit 1) after 0.4 s",
      "[grainyard]   command: mariadb-install-db '--defaults-file=/srv/my data/my.cnf' --skip-test-db",
      "[grainyard]   │ Neither host 'box' nor 'localhost' could be looked up with",
      "[grainyard]   │ '/usr/bin/resolveip'",
      "[grainyard]   │ restart this script with the --force option",
      "[grainyard]   What to do: Give the host a name in /etc/hosts, then run the command again.",
    ]);
  });
});

describe("runTool", () => {
  it("stays quiet apart from its first line when the tool is quick", async () => {
    const { lines, result } = await printed(() => runTool({ label: "a quick step", ...nodeTool("console.log('done')") }));
    expect(lines).toEqual(["[grainyard] a quick step…"]);
    expect(result).toMatchObject({ stdout: "done\n" });
  });

  it("shows the tool's latest line with the elapsed time while it is slow, then a closing line", async () => {
    const script =
      "let i = 0; const t = setInterval(() => { console.log('Progress: resolved ' + ++i); if (i === 8) clearInterval(t); }, 100);";
    const { lines } = await printed(() => runTool({ label: "a slow step", ...nodeTool(script), quietMs: 150, progressEveryMs: 300 }));
    const progress = lines.filter((line) => line.includes("│ Progress: resolved"));
    expect(progress.length).toBeGreaterThan(0);
    expect(progress.length).toBeLessThan(8); // at most one line per progressEveryMs, not every line
    expect(progress[0]).toMatch(/│ Progress: resolved \d+ {2}\(\d+\.\d s\)$/);
    expect(lines.at(-1)).toMatch(/^\[grainyard\] ✓ a slow step \(\d+\.\d s\)$/);
  });

  it("prints a heartbeat when a slow tool says nothing for a while", async () => {
    const { lines } = await printed(() =>
      runTool({ label: "a silent step", ...nodeTool("console.log('starting'); setTimeout(() => {}, 1500)"), quietMs: 0, heartbeatMs: 400 }),
    );
    expect(lines.some((line) => /… still a silent step \(\d+\.\d s; no output for \d+ s\)$/.test(line))).toBe(true);
  });

  it("rejects with the whole report when the tool fails", async () => {
    const script = "console.log('resolving'); console.error('npm error code ETIMEDOUT'); process.exitCode = 3";
    const { result } = await printed(() => runTool({ label: "installing pnpm", ...nodeTool(script), advice: () => "Check the network." }));
    expect(result).toBeInstanceOf(ToolFailure);
    const report = (result as ToolFailure).message;
    expect(report).toContain("✗ installing pnpm failed (exit 3)");
    expect(report).toContain("│ resolving\n");
    expect(report).toContain("│ npm error code ETIMEDOUT");
    expect(report).toMatch(/What to do: Check the network\.$/);
  });

  it("writes a long failed output to the log file and points at it", async () => {
    const logFile = join(dir, "logs", "long.log");
    const script = "for (let i = 0; i < 500; i++) console.log('line ' + i); process.exitCode = 1";
    const { result } = await printed(() => runTool({ label: "a chatty step", ...nodeTool(script), logFile }));
    expect((result as ToolFailure).message).toContain(`whole output: ${logFile}`);
    expect(spawnSync("wc", ["-l", logFile], { encoding: "utf8" }).stdout).toMatch(/^500 /);
  });

  it("says plainly when the tool is not installed", async () => {
    const { result } = await printed(() => runTool({ label: "running a missing tool", command: "grainyard-no-such-tool", args: [] }));
    expect((result as ToolFailure).message).toContain("grainyard-no-such-tool was not found (it is not installed, or not on PATH)");
    expect((result as ToolFailure).message).toContain("What to do: install grainyard-no-such-tool or put it on PATH");
  });

  it("stops the tool and rejects with Interrupted when the runner is stopping", async () => {
    const controller = new AbortController();
    const started = Date.now();
    const { result } = await printed(() => {
      const run = runTool({
        label: "a long step",
        ...nodeTool("console.log('up'); setTimeout(() => {}, 60000)"),
        signal: controller.signal,
      });
      setTimeout(() => controller.abort(), 200);
      return run;
    });
    expect(result).toBeInstanceOf(Interrupted);
    expect(Date.now() - started).toBeLessThan(10_000);
  });
});

describe("colourEnvironment", () => {
  it("turns colours off with CI set, and never passes FORCE_COLOR=0 on (read as 'on' by some libraries)", () => {
    expect(colourEnvironment({ CI: "true", FORCE_COLOR: "0" }, true)).toEqual({ CI: "true", NO_COLOR: "1" });
    expect(colourEnvironment({ CI: "1" }, true)).toEqual({ CI: "1", NO_COLOR: "1" });
    expect(colourEnvironment({ CI: "true", FORCE_COLOR: "1" }, false)).toEqual({ CI: "true", NO_COLOR: "1" });
  });

  it("turns colours off when the output is not a terminal, unless the user forced them on", () => {
    expect(colourEnvironment({}, false)).toEqual({ NO_COLOR: "1" });
    expect(colourEnvironment({ FORCE_COLOR: "0" }, true)).toEqual({ NO_COLOR: "1" });
    expect(colourEnvironment({ FORCE_COLOR: "1" }, false)).toEqual({ FORCE_COLOR: "1" });
  });

  it("leaves a terminal outside CI as the user has it", () => {
    expect(colourEnvironment({ TERM: "xterm" }, true)).toEqual({ TERM: "xterm" });
    expect(colourEnvironment({ CI: "false" }, true)).toEqual({ CI: "false" });
  });

  it("gives a CI log from the test runner without escape codes (the old FORCE_COLOR=0 gave them)", () => {
    const project = mkdtempSync(join(dir, "vitest-"));
    writeFileSync(join(project, "sum.test.mjs"), 'test("adds", () => { expect(1 + 1).toBe(2); });\n');
    const vitest = join(createRequire(import.meta.url).resolve("vitest/package.json"), "../vitest.mjs");
    const clean = Object.fromEntries(
      Object.entries(process.env).filter(([key]) => !/^(VITEST|NO_COLOR|FORCE_COLOR|CI$|TEST$|NODE_ENV$)/.test(key)),
    );
    const run = (env: NodeJS.ProcessEnv) =>
      spawnSync(process.execPath, [vitest, "run", "--root", project, "--globals"], { encoding: "utf8", env, timeout: 60_000 });

    const before = run({ ...clean, CI: "true", FORCE_COLOR: "0" });
    expect(before.status).toBe(0);
    expect(before.stdout).toContain("\u001b["); // the check can fail: this is what CI logs used to get

    const now = run(colourEnvironment({ ...clean, CI: "true", FORCE_COLOR: "0" }, false));
    expect(now.status).toBe(0);
    expect(now.stdout + now.stderr).toContain("1 passed");
    expect(now.stdout + now.stderr).not.toContain("\u001b");
    expect(stripEscapes(before.stdout)).toContain("1 passed");
  }, 60_000);
});
