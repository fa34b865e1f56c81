import { mkdirSync } from "node:fs";
import { request as httpRequest } from "node:http";
import { join } from "node:path";
import { generate } from "otplib";
import { chromium, type Browser, type Page, type Response } from "playwright-core";
import { expect } from "vitest";

/** The real stack the test runner started: the app on one port, the mail sink's inbox on another. */
export const appUrl = required("APP_URL");
const inboxUrl = required("INBOX_URL");
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
    args: [
      "--headless",
      "--no-sandbox",
      "--disable-gpu",
      "--disable-quic",
      "--no-first-run",
      "--disable-background-networking",
      "--disable-component-update",
      "--disable-sync",
      // Chromium refuses a few ports outright (10080 among them, ERR_UNSAFE_PORT); a test port base may land on one.
      `--explicitly-allowed-ports=${[appUrl, inboxUrl]
        .map((url) => new URL(url).port)
        .filter(Boolean)
        .join(",")}`,
    ],
  });
}

/**
 * Opens a public page (rendered on the server) and waits until the browser has taken it over: its
 * buttons and fields are on screen at once, but only work after hydration (entry-client marks the
 * app then). Private pages are drawn by the browser, so their elements only appear once they work.
 */
export async function openPage(page: Page, path: string): Promise<Response | null> {
  const response = await page.goto(new URL(path, appUrl).href);
  await page.waitForSelector("#app[data-ready]", { state: "attached", timeout: 15_000 });
  return response;
}

/** A PNG in the screenshot folder: the whole page, or only what is on screen (`fullPage: false`, for dialogs). */
export async function screenshot(page: Page, name: string, options: { fullPage?: boolean } = {}): Promise<void> {
  mkdirSync(screenshotDir, { recursive: true });
  await page.screenshot({ path: join(screenshotDir, `${name}.png`), fullPage: options.fullPage ?? true });
}

/**
 * Waits until the page is still: two frames painted and every CSS transition and animation (a
 * dialog fading in, a sheet sliding) finished. A condition, not a guess at how long they take.
 */
export async function settled(page: Page): Promise<void> {
  await page.evaluate(async () => {
    await new Promise((resolve) => requestAnimationFrame(() => requestAnimationFrame(resolve)));
    await Promise.all(document.getAnimations().map((animation) => animation.finished.catch(() => undefined)));
  });
}

/** The newest message with this subject (exact, or matching) the mail sink received for an address, waiting for delivery. */
export async function newestMailTo(address: string, subject: RegExp | string): Promise<{ subject: string; text: string }> {
  // E-mails leave the API's outbox just after the answer: wait for the one this step causes, not just any.
  const deadline = Date.now() + 30_000;
  while (Date.now() < deadline) {
    const response = await fetch(`${inboxUrl}/api/messages?to=${encodeURIComponent(address)}`);
    const { messages } = (await response.json()) as { messages: { subject: string; text: string }[] };
    const found = messages.find((message) => (typeof subject === "string" ? message.subject === subject : subject.test(message.subject)));
    if (found) return found;
    await new Promise((r) => setTimeout(r, 200));
  }
  throw new Error(`no mail matching ${subject} reached ${address}`);
}

/** Collects console errors and failed requests so a broken page fails the test. */
export function watchForPageErrors(page: Page): string[] {
  const problems: string[] = [];
  page.on("pageerror", (error) => problems.push(`page error: ${error.message}`));
  page.on("console", (message) => {
    if (message.type() === "error" && !/status of 40[13]|status of 409|status of 422/.test(message.text()))
      problems.push(`console: ${message.text()}`);
  });
  return problems;
}

/**
 * A JSON request to the app from the test itself, through node:http: Node's fetch refuses the
 * Fetch standard's "bad ports" (10080 among them), and a test port base may land on one.
 */
export function appJson<T = unknown>(
  path: string,
  options: { method?: "GET" | "POST"; body?: unknown } = {},
): Promise<{ status: number; body: T }> {
  const payload = options.body === undefined ? undefined : JSON.stringify(options.body);
  return new Promise((resolvePromise, reject) => {
    const request = httpRequest(
      new URL(path, appUrl),
      {
        method: options.method ?? "GET",
        headers: {
          accept: "application/json",
          ...(payload ? { "content-type": "application/json", "content-length": Buffer.byteLength(payload) } : {}),
        },
        timeout: 15_000,
      },
      (response) => {
        const chunks: Buffer[] = [];
        response.on("data", (chunk: Buffer) => chunks.push(chunk));
        response.on("end", () => {
          const text = Buffer.concat(chunks).toString("utf8");
          try {
            resolvePromise({ status: response.statusCode ?? 0, body: (text ? JSON.parse(text) : undefined) as T });
          } catch (error) {
            reject(error);
          }
        });
        response.on("error", reject);
      },
    );
    request.on("timeout", () => request.destroy(new Error("timed out")));
    request.on("error", reject);
    request.end(payload);
  });
}

/** The id of a seeded listing, found by its title in the catalogue (every page of it: the demo has many slabs). */
export async function listingIdOf(title: string): Promise<string> {
  let cursor: string | null = null;
  for (let page = 0; page < 20; page++) {
    const answer: { body: { results: { listingId: string; title: string }[]; nextCursor: string | null } } = await appJson(
      `/api/v1/catalogue?limit=60${cursor ? `&cursor=${encodeURIComponent(cursor)}` : ""}`,
    );
    const body = answer.body;
    const item = body.results.find((i) => i.title === title);
    if (item) return item.listingId;
    cursor = body.nextCursor;
    if (!cursor) break;
  }
  throw new Error(`the seeded listing "${title}" is not in the catalogue`);
}

/** Someone who signs in: with `totpSecret`, an account with a second factor (its code is asked after the password). */
export interface SignInAs {
  email: string;
  password: string;
  totpSecret?: string;
}

/**
 * The Lakemont demo admin. Admins need a second factor: the seed makes the secret once per database and
 * the test runner passes it on as `npm start` prints it, so these suites compute the codes an authenticator shows.
 */
export const DEMO_ADMIN: SignInAs = {
  email: "desk@grainyard.test",
  password: "lakemont-desk-2026",
  get totpSecret() {
    return required("DEMO_ADMIN_TOTP_SECRET");
  },
};

const STEP_MS = 30_000;

/** The code an authenticator app with this secret shows at `at` (RFC 6238 defaults: SHA-1, 6 digits, 30 s). */
export function codeFor(secret: string, at = Date.now()): Promise<string> {
  return generate({ secret, epoch: Math.floor(at / 1000) });
}

/**
 * The second sign-in step in the browser: types the current code. A code works once per account, so when
 * an earlier sign-in (another suite, a second browser) used this 30-second step's code already, the page
 * says so and this types the next step's code (the API takes one step of drift); when that was used too,
 * it waits for the moment the clock enters the next step — a condition, not a guess.
 */
export async function enterSecondFactorCode(page: Page, secret: string): Promise<void> {
  for (let attempt = 0; attempt < 4; attempt++) {
    const step = Math.floor(Date.now() / STEP_MS);
    for (const ahead of [0, 1]) {
      await page.getByLabel("Code from your app").fill(await codeFor(secret, (step + ahead) * STEP_MS));
      const answer = page.waitForResponse(
        (response) => response.url().endsWith("/api/v1/session/second-factor") && response.request().method() === "POST",
        { timeout: 15_000 },
      );
      await page.locator('[data-test="submit-code"]').click();
      const response = await answer;
      if (response.ok()) return;
      const code = ((await response.json()) as { error?: { code?: string } }).error?.code;
      if (code !== "second_factor_used") throw new Error(`the code step refused the code: ${response.status()} ${code}`);
    }
    await expect.poll(() => Math.floor(Date.now() / STEP_MS), { timeout: STEP_MS + 5_000, interval: 250 }).toBeGreaterThan(step);
  }
  throw new Error("the code step refused every code it tried");
}

/** Signs in through the form (and the code step, for an account with a second factor) and waits to leave the sign-in pages. */
export async function signIn(page: Page, who: SignInAs) {
  await page.goto(`${appUrl}/sign-in`);
  await page.getByLabel("E-mail").fill(who.email);
  await page.getByLabel("Password").fill(who.password);
  await page.locator('[data-test="submit"]').click();
  if (who.totpSecret) {
    await page.waitForURL((url) => url.pathname === "/sign-in/code", { timeout: 15_000 });
    await enterSecondFactorCode(page, who.totpSecret);
  }
  await page.waitForURL((url) => !url.pathname.startsWith("/sign-in"), { timeout: 15_000 });
}

/** Everything the mail sink holds for an address, newest first. */
export async function mailsTo(address: string): Promise<{ subject: string; text: string }[]> {
  const response = await fetch(`${inboxUrl}/api/messages?to=${encodeURIComponent(address)}`);
  return ((await response.json()) as { messages: { subject: string; text: string }[] }).messages;
}

/** Waits for an e-mail to an address whose subject matches. */
export const mailArrives = (address: string, subject: RegExp) =>
  expect.poll(async () => (await mailsTo(address)).some((m) => subject.test(m.subject)), { timeout: 15_000 }).toBe(true);
