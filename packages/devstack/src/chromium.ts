import { existsSync } from "node:fs";
import { spawnSync } from "node:child_process";
import { say, StackError } from "./log.ts";

export const CHROMIUM = process.env.CHROMIUM_PATH ?? "/usr/bin/chromium";

/** End-to-end tests drive Debian's Chromium; install it when it is missing (never a browser download). */
export function ensureChromium(): string {
  if (existsSync(CHROMIUM)) return CHROMIUM;
  if (process.getuid?.() !== 0) throw new StackError(`Chromium is missing at ${CHROMIUM}: run \`apt-get install -y chromium\` once as root.`);
  say("installing Debian's chromium for the end-to-end tests (about a minute, once)…");
  const result = spawnSync("sh", ["-c", "export DEBIAN_FRONTEND=noninteractive; apt-get update -qq && apt-get install -y -qq chromium >/dev/null"], { stdio: ["ignore", "inherit", "inherit"] });
  if (result.status !== 0 || !existsSync(CHROMIUM)) throw new StackError(`apt-get could not install chromium (exit ${result.status}).`);
  return CHROMIUM;
}
