#!/usr/bin/env node
// Entry point of `npm start`, `npm run dev` and `npm test` on a machine that may have only
// Node.js and npm: installs the pinned pnpm and the workspace dependencies when they are
// missing, then hands over to the TypeScript stack runner (src/cli.ts) through tsx.
// Plain JavaScript with no dependencies on purpose: nothing is installed yet when it runs.
import { spawn, spawnSync } from "node:child_process";
import { existsSync } from "node:fs";
import { dirname, join, resolve } from "node:path";
import { fileURLToPath } from "node:url";

const PNPM_VERSION = "12.4.2";
const root = resolve(dirname(fileURLToPath(import.meta.url)), "../..");
const mode = process.argv[2] ?? "start";

function say(line) {
  process.stdout.write(`[grainyard] ${line}\n`);
}
function fail(line) {
  process.stderr.write(`[grainyard] ✗ ${line}\n`);
  process.exit(1);
}

function pnpmVersion() {
  const result = spawnSync("pnpm", ["--version"], { encoding: "utf8" });
  return result.status === 0 ? result.stdout.trim() : null;
}

const [major, minor] = process.versions.node.split(".").map(Number);
if (major < 20 || (major === 20 && minor < 19)) fail(`Node.js 20.19 or newer is needed; this is ${process.version}.`);

if (pnpmVersion() !== PNPM_VERSION) {
  say(`installing pnpm ${PNPM_VERSION} with npm…`);
  const result = spawnSync("npm", ["install", "--global", `pnpm@${PNPM_VERSION}`], { stdio: ["ignore", "ignore", "inherit"] });
  if (result.status !== 0 || pnpmVersion() !== PNPM_VERSION)
    fail(`could not install pnpm ${PNPM_VERSION} with npm (exit ${result.status}).`);
}

say("installing workspace dependencies (pnpm install --frozen-lockfile)…");
const install = spawnSync("pnpm", ["install", "--frozen-lockfile", "--reporter=silent"], {
  cwd: root,
  stdio: ["ignore", "inherit", "inherit"],
  env: { ...process.env, CI: process.env.CI ?? "" },
});
if (install.status !== 0) fail(`pnpm install failed (exit ${install.status}); see the lines above.`);

const tsx = join(root, "packages/devstack/node_modules/.bin/tsx");
if (!existsSync(tsx)) fail("tsx is missing after install; try deleting node_modules and starting again.");

const child = spawn(tsx, [join(root, "packages/devstack/src/cli.ts"), mode, ...process.argv.slice(3)], { cwd: root, stdio: "inherit" });
// Ctrl-C reaches the child through the terminal's process group; SIGTERM is passed on by hand.
// The child shuts the stack down and exits; this wrapper then exits with its code.
process.on("SIGINT", () => {});
process.on("SIGTERM", () => child.kill("SIGTERM"));
child.on("exit", (code, signal) => process.exit(code ?? (signal ? 1 : 0)));
