import { existsSync, readdirSync, statSync } from "node:fs";
import { join } from "node:path";
import { say } from "./log.ts";
import { runStep } from "./processes.ts";
import { repoRoot } from "./profile.ts";

const WEB_SOURCES = [
  "apps/web/src",
  "apps/web/public",
  "apps/web/index.html",
  "apps/web/vite.config.ts",
  "apps/web/package.json",
  "packages/contracts/src",
  "packages/slab-math/src",
];

function newestChange(path: string): number {
  if (!existsSync(path)) return 0;
  const stat = statSync(path);
  if (!stat.isDirectory()) return stat.mtimeMs;
  let newest = stat.mtimeMs;
  for (const entry of readdirSync(path)) newest = Math.max(newest, newestChange(join(path, entry)));
  return newest;
}

export const webDist = join(repoRoot, "apps/web/dist");
/** The last file each build writes: the browser's half, then the server's render. */
const builtFiles = [join(webDist, "client", "index.html"), join(webDist, "server", "entry-server.js")];

/** Builds the web app with Vite (both halves) unless the last build is newer than every source file. */
export async function buildWebIfStale(signal?: AbortSignal, force = false): Promise<void> {
  const builtAt = Math.min(...builtFiles.map((file) => (existsSync(file) ? statSync(file).mtimeMs : 0)));
  const changedAt = Math.max(...WEB_SOURCES.map((p) => newestChange(join(repoRoot, p))));
  if (!force && builtAt > changedAt) {
    say("web app is already built and up to date");
    return;
  }
  await runStep("building the web app (vite build)", "pnpm", ["--filter", "@grainyard/web", "build"], {
    cwd: repoRoot,
    quiet: true,
    signal,
    advice: () => "Fix the build error above in apps/web (or packages it imports), then run the command again.",
  });
}
