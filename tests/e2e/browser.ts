import { mkdirSync } from "node:fs";
import { join } from "node:path";
import { chromium, type Browser, type Page } from "playwright-core";

/** The real stack the test runner started: the app on one port, the mail sink's inbox on another. */
export const appUrl = required("APP_URL");
export const inboxUrl = required("INBOX_URL");
const screenshotDir = process.env.SCREENSHOT_DIR ?? join(import.meta.dirname, "../../test-results/screenshots");

function required(name: string): string {
  const value = process.env[name];
  if (!value) throw new Error(`${name} is not set: run the end-to-end suite through \`npm test\`.`);
  return value;
}

export const phone = { width: 390, height: 844 };
export const desktop = { width: 1280, height: 800 };

/** Debian's Chromium, headless, with no network beyond loopback; never a downloaded browser. */
export function launchChromium(): Promise<Browser> {
  return chromium.launch({
    executablePath: process.env.CHROMIUM_PATH ?? "/usr/bin/chromium",
    args: ["--headless", "--no-sandbox", "--disable-gpu", "--disable-quic", "--no-first-run", "--disable-background-networking", "--disable-component-update", "--disable-sync"],
  });
}

export async function screenshot(page: Page, name: string): Promise<void> {
  mkdirSync(screenshotDir, { recursive: true });
  await page.screenshot({ path: join(screenshotDir, `${name}.png`), fullPage: true });
}

/** The newest message the mail sink received for an address, waiting a little for delivery. */
export async function newestMailTo(address: string): Promise<{ subject: string; text: string }> {
  const deadline = Date.now() + 10_000;
  while (Date.now() < deadline) {
    const response = await fetch(`${inboxUrl}/api/messages?to=${encodeURIComponent(address)}`);
    const { messages } = (await response.json()) as { messages: { subject: string; text: string }[] };
    if (messages.length) return messages[0]!;
    await new Promise((r) => setTimeout(r, 200));
  }
  throw new Error(`no mail reached ${address}`);
}

/** Collects console errors and failed requests so a broken page fails the test. */
export function watchForPageErrors(page: Page): string[] {
  const problems: string[] = [];
  page.on("pageerror", (error) => problems.push(`page error: ${error.message}`));
  page.on("console", (message) => {
    if (message.type() === "error" && !/status of 40[13]|status of 409|status of 422/.test(message.text())) problems.push(`console: ${message.text()}`);
  });
  return problems;
}
