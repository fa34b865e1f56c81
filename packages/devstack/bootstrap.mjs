#!/usr/bin/env node
// Entry point of `npm start`, `npm run dev`, `npm test`, `npm run services`, `npm run bench`,
// `npm run backup` and `npm run restore` on a
// machine that may have only Node.js and npm: installs the pinned pnpm and the workspace
// dependencies when they are missing, then hands over to the TypeScript stack runner (src/cli.ts),
// loaded through tsx's loader in a plain `node` process.
// Plain JavaScript with no dependencies on purpose: nothing is installed yet when it runs.
import { spawn, spawnSync } from "node:child_process";
import { createRequire } from "node:module";
import { dirname, join, resolve } from "node:path";
import { fileURLToPath, pathToFileURL } from "node:url";
import { colourEnvironment, Interrupted, looksLikeNetworkTrouble, runTool, say, StackError } from "./tools.mjs";

const PNPM_VERSION = "12.4.2";
const root = resolve(dirname(fileURLToPath(import.meta.url)), "../..");
const mode = process.argv[2] ?? "start";
const logs = join(root, ".data/logs");
const environment = colourEnvironment(process.env, Boolean(process.stdout.isTTY));

/** @param {string} message */
function fail(message) {
  process.stderr.write(message.includes("\n") ? `${message}\n` : `[grainyard] ✗ ${message}\n`);
  process.exit(1);
}

function pnpmVersion() {
  const result = spawnSync("pnpm", ["--version"], { encoding: "utf8", env: environment });
  return result.status === 0 ? result.stdout.trim() : null;
}

/** @param {string} output */
function npmAdvice(output) {
  if (looksLikeNetworkTrouble(output))
    return "npm could not reach its registry: check the network (and any proxy: `npm config get proxy`, `npm config get registry`), then run the command again.";
  if (/\bEACCES\b|permission denied/i.test(output))
    return "npm may not write to its global folder: run the command as root, or give npm a prefix you own (`npm config set prefix ~/.local`) and put its bin folder on PATH.";
  return `Fix what npm reports above, or install pnpm ${PNPM_VERSION} yourself (\`npm install --global pnpm@${PNPM_VERSION}\`), then run the command again.`;
}

/** @param {string} output */
function pnpmAdvice(output) {
  if (/ERR_PNPM_OUTDATED_LOCKFILE|lockfile.*(not up to date|out of date)/i.test(output))
    return "pnpm-lock.yaml does not match the package.json files: run `pnpm install` once to update the lock file, commit it, then run the command again.";
  if (looksLikeNetworkTrouble(output))
    return "pnpm could not download packages: check the network (and any proxy or registry setting in .npmrc), then run the command again.";
  if (/ENOSPC|no space left/i.test(output)) return "The disk is full: free some space, then run the command again.";
  return "Fix what pnpm reports above (deleting node_modules and running the command again often helps after an interrupted install).";
}

// While this wrapper installs things, Ctrl-C stops the step in progress and ends here.
const interrupted = new AbortController();
let runner = /** @type {import("node:child_process").ChildProcess | undefined} */ (undefined);
for (const signal of /** @type {const} */ (["SIGINT", "SIGTERM", "SIGHUP"])) {
  process.on(signal, () => {
    // The runner gets a terminal's Ctrl-C itself; passing every signal on as well also covers a
    // signal sent to this process alone (npm, a process manager). The runner ignores repeats.
    if (runner) runner.kill(signal);
    else interrupted.abort();
  });
}

/** @param {() => Promise<unknown>} step */
async function install(step) {
  try {
    await step();
  } catch (error) {
    if (error instanceof Interrupted) {
      say("stopped cleanly (nothing had started yet)");
      process.exit(130);
    }
    fail(error instanceof StackError ? error.message : String(error));
  }
}

const [major, minor] = process.versions.node.split(".").map(Number);
if (major < 20 || (major === 20 && minor < 19))
  fail(
    `Node.js 20.19 or newer is needed; this is ${process.version}. Install a newer Node.js (for example from nodejs.org), then run the command again.`,
  );

if (pnpmVersion() !== PNPM_VERSION) {
  await install(() =>
    runTool({
      label: `installing pnpm ${PNPM_VERSION} with npm`,
      command: "npm",
      args: ["install", "--global", `pnpm@${PNPM_VERSION}`, "--no-fund", "--no-audit", "--loglevel=http"],
      env: environment,
      advice: npmAdvice,
      signal: interrupted.signal,
      logFile: join(logs, "npm-install-pnpm.log"),
    }),
  );
  if (pnpmVersion() !== PNPM_VERSION)
    fail(
      `npm installed pnpm, but \`pnpm --version\` does not answer ${PNPM_VERSION}: put npm's global bin folder (\`npm prefix --global\`/bin) first on PATH, then run the command again.`,
    );
}

await install(() =>
  runTool({
    label: "installing workspace dependencies (pnpm install --frozen-lockfile)",
    command: "pnpm",
    args: ["install", "--frozen-lockfile", "--reporter=append-only"],
    cwd: root,
    env: environment,
    advice: pnpmAdvice,
    signal: interrupted.signal,
    logFile: join(logs, "pnpm-install.log"),
  }),
);

let tsxLoader;
try {
  tsxLoader = pathToFileURL(createRequire(join(root, "packages/devstack/package.json")).resolve("tsx")).href;
} catch {
  fail("tsx is missing after pnpm install: delete node_modules and run the command again.");
}
if (interrupted.signal.aborted) {
  say("stopped cleanly (nothing had started yet)");
  process.exit(130);
}

// The runner is a plain node process (no tsx command-line wrapper in between: it would pass a
// Ctrl-C on again and kill the runner when it does not answer within a few milliseconds).
runner = spawn(
  process.execPath,
  ["--import", String(tsxLoader), join(root, "packages/devstack/src/cli.ts"), mode, ...process.argv.slice(3)],
  {
    cwd: root,
    stdio: "inherit",
    env: environment,
  },
);
runner.on("exit", (code, signal) => {
  // Killed by a signal before its handlers were in place (the first moments after start):
  // nothing had been started yet, so nothing is left behind.
  if (code === null && (signal === "SIGINT" || signal === "SIGTERM" || signal === "SIGHUP")) {
    say("stopped cleanly (nothing had started yet)");
    process.exit(130);
  }
  if (code === null)
    process.stderr.write(
      `[grainyard] ✗ the stack runner was killed (${signal}) before it could stop what it started; the next start shuts down a MariaDB it left running.\n`,
    );
  process.exit(code ?? 1);
});
