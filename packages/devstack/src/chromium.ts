import { existsSync } from "node:fs";
import { aptInstall, needsRoot } from "./apt.ts";
import { StackError } from "./log.ts";

export const CHROMIUM = process.env.CHROMIUM_PATH ?? "/usr/bin/chromium";

/**
 * Debian packages the test suites use: Chromium for the end-to-end tests (never a browser
 * download), and libheif's example tools, whose heif-enc makes a real HEIC phone photo for the
 * photo tests, and HAProxy for the several-instances suite. Installed in one apt-get run when any is missing.
 */
const TEST_TOOLS = [
  { binary: CHROMIUM, debianPackage: "chromium" },
  { binary: "/usr/bin/heif-enc", debianPackage: "libheif-examples" },
  // The load balancer of the several-instances suite (its system service is never started).
  { binary: "/usr/sbin/haproxy", debianPackage: "haproxy" },
];

export async function ensureTestTools(signal?: AbortSignal): Promise<void> {
  const missing = TEST_TOOLS.filter((tool) => !existsSync(tool.binary));
  if (missing.length === 0) return;
  const packages = missing.map((tool) => tool.debianPackage);
  if (process.getuid?.() !== 0) throw needsRoot(packages, "for the tests");
  await aptInstall(packages, { why: "for the tests", noServiceStart: true, signal });
  const stillMissing = missing.filter((tool) => !existsSync(tool.binary));
  if (stillMissing.length)
    throw new StackError(
      `apt-get installed ${packages.join(", ")}, but ${stillMissing.map((t) => t.binary).join(" and ")} is still missing: check \`dpkg -L ${stillMissing[0]!.debianPackage}\`.`,
    );
}
