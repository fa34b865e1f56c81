import { existsSync } from "node:fs";
import { spawnSync } from "node:child_process";
import { say, StackError } from "./log.ts";

export const CHROMIUM = process.env.CHROMIUM_PATH ?? "/usr/bin/chromium";

/**
 * Debian packages the test suites use: Chromium for the end-to-end tests (never a browser
 * download), and libheif's example tools, whose heif-enc makes a real HEIC phone photo for the
 * photo tests. Installed in one apt-get run when any is missing.
 */
const TEST_TOOLS = [
  { binary: CHROMIUM, debianPackage: "chromium" },
  { binary: "/usr/bin/heif-enc", debianPackage: "libheif-examples" },
];

export function ensureTestTools(): void {
  const missing = TEST_TOOLS.filter((tool) => !existsSync(tool.binary));
  if (missing.length === 0) return;
  const packages = missing.map((tool) => tool.debianPackage);
  if (process.getuid?.() !== 0)
    throw new StackError(`missing for the tests: ${packages.join(", ")} — run \`apt-get install -y ${packages.join(" ")}\` once as root.`);
  say(`installing Debian's ${packages.join(" and ")} for the tests (about a minute, once)…`);
  const result = spawnSync(
    "sh",
    ["-c", `export DEBIAN_FRONTEND=noninteractive; apt-get update -qq && apt-get install -y -qq ${packages.join(" ")} >/dev/null`],
    { stdio: ["ignore", "inherit", "inherit"] },
  );
  const stillMissing = missing.filter((tool) => !existsSync(tool.binary));
  if (result.status !== 0 || stillMissing.length)
    throw new StackError(
      `apt-get could not install ${stillMissing.map((t) => t.debianPackage).join(", ") || packages.join(", ")} (exit ${result.status}).`,
    );
}
