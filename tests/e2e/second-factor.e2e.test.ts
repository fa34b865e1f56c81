import type { Browser, Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import {
  DEMO_ADMIN,
  appUrl,
  codeFor,
  desktop,
  enterSecondFactorCode,
  launchChromium,
  mailArrives,
  phone,
  screenshot,
  settled,
  signIn,
  watchForPageErrors,
} from "./browser.ts";

/*
 * The second factor in Chromium: the demo admin signs in with the password and then the code its
 * authenticator shows (computed from the seeded secret); a sawyer sets one up from a phone (QR code,
 * the key as text, a first code, the recovery codes shown once), signs in with a recovery code, and
 * removes it again. Tamarack Lane's yard is used by no other suite, and ends as it began.
 */
const SAWYER = { email: "hello@tamarack-lane.test", password: "tamarack-lane-2026" };

let browser: Browser;
beforeAll(async () => {
  browser = await launchChromium();
});
afterAll(async () => browser?.close());

/** A screenshot at phone and at desktop width, from the top. */
async function shots(page: Page, name: string) {
  for (const [size, viewport] of [
    ["phone", phone],
    ["desktop", desktop],
  ] as const) {
    await page.setViewportSize(viewport);
    const sideways = await page.evaluate(() => document.documentElement.scrollWidth - window.innerWidth);
    expect(sideways, `${name} at ${size} scrolls sideways by ${sideways}px`).toBeLessThanOrEqual(0);
    await page.evaluate(() => window.scrollTo(0, 0));
    await settled(page);
    await screenshot(page, `second-factor-${name}-${size}`);
  }
  await page.setViewportSize(phone);
}

describe("the second factor", () => {
  it("the demo admin signs in with the password, then the code from the app, and reaches the desk", async () => {
    const context = await browser.newContext({ viewport: phone, deviceScaleFactor: 2, isMobile: true, hasTouch: true });
    const page = await context.newPage();
    const problems = watchForPageErrors(page);
    await page.goto(`${appUrl}/sign-in`);
    await page.getByLabel("E-mail").fill(DEMO_ADMIN.email);
    await page.getByLabel("Password").fill(DEMO_ADMIN.password);
    await page.locator('[data-test="submit"]').click();
    await page.waitForURL(`${appUrl}/sign-in/code`);
    await expect.poll(() => page.locator('[data-test="code-step-email"]').textContent()).toBe(DEMO_ADMIN.email);
    // Nobody is signed in yet: the desk's data is refused.
    expect((await (await page.request.get(`${appUrl}/api/v1/session`)).json()).account).toBeNull();
    await shots(page, "code-step");

    // A wrong code is refused by the API with a clear message beside the field.
    await page.getByLabel("Code from your app").fill("000000");
    await page.locator('[data-test="submit-code"]').click();
    await expect.poll(() => page.locator('[data-test="code-error"]').getAttribute("data-code")).toBe("second_factor_wrong");
    expect(await page.locator("#code").getAttribute("aria-invalid")).toBe("true");
    await shots(page, "code-step-error");

    // The current code (the helper waits for the next one if another suite just used this one).
    await enterSecondFactorCode(page, DEMO_ADMIN.totpSecret!);
    await page.waitForURL(`${appUrl}/admin`);
    expect((await (await page.request.get(`${appUrl}/api/v1/admin/dashboard`)).json()).dashboard).toBeTruthy();
    expect(problems).toEqual([]);
    await context.close();
  });

  it("a sawyer sets one up from a phone, saves the recovery codes, signs in with one, and removes it", async () => {
    const context = await browser.newContext({ viewport: phone, deviceScaleFactor: 2, isMobile: true, hasTouch: true });
    const page = await context.newPage();
    const problems = watchForPageErrors(page);
    await signIn(page, SAWYER);
    await page.goto(`${appUrl}/account/security`);
    await expect.poll(() => page.locator('[data-test="second-factor-status"]').textContent()).toContain("Off");
    await shots(page, "security-off");

    await page.locator('[data-test="start-set-up"]').click();
    await page.locator('[data-test="qr-code"]').waitFor();
    await expect
      .poll(() => page.locator('[data-test="qr-code"]').evaluate((img: HTMLImageElement) => img.complete && img.naturalWidth))
      .toBeGreaterThan(0);
    const secret = ((await page.locator('[data-test="secret"]').textContent()) ?? "").replace(/\s/g, "");
    expect(secret).toMatch(/^[A-Z2-7]{32}$/);
    await shots(page, "set-up");

    await page.getByLabel("Code from your app").fill(await codeFor(secret));
    await page.locator('[data-test="confirm-set-up"]').click();
    const codes = page.locator('[data-test="recovery-code-list"] code');
    await expect.poll(() => codes.count()).toBe(10);
    const recoveryCodes = await codes.allTextContents();
    // "Done" waits for the person to say the codes are saved.
    expect(await page.locator('[data-test="codes-done"]').isDisabled()).toBe(true);
    const download = page.waitForEvent("download");
    await page.locator('[data-test="download-codes"]').click();
    expect((await download).suggestedFilename()).toBe("grainyard-recovery-codes.txt");
    await shots(page, "recovery-codes");
    await page.locator('[data-test="codes-saved"]').click();
    await page.locator('[data-test="codes-done"]').click();
    await expect.poll(() => page.locator('[data-test="second-factor-status"]').textContent()).toContain("10 recovery codes left");
    await mailArrives(SAWYER.email, /a second factor is now on/i);
    await shots(page, "security-on");

    // Signing in again: the password, then (a lost phone) a recovery code.
    const { csrfToken } = await (await page.request.get(`${appUrl}/api/v1/session`)).json();
    expect((await page.request.delete(`${appUrl}/api/v1/session`, { headers: { "x-csrf-token": csrfToken } })).status()).toBe(200);
    await page.goto(`${appUrl}/sign-in`);
    await page.getByLabel("E-mail").fill(SAWYER.email);
    await page.getByLabel("Password").fill(SAWYER.password);
    await page.locator('[data-test="submit"]').click();
    await page.waitForURL(`${appUrl}/sign-in/code`);
    await page.locator('[data-test="switch-code-kind"]').click();
    await page.getByLabel("Recovery code", { exact: true }).fill(recoveryCodes[0]!);
    await shots(page, "recovery-step");
    await page.locator('[data-test="submit-code"]').click();
    await page.waitForURL(`${appUrl}/yard`);
    await mailArrives(SAWYER.email, /a recovery code was used/i);

    // Removing it takes the password and a code (another recovery code here).
    await page.goto(`${appUrl}/account/security`);
    await expect.poll(() => page.locator('[data-test="second-factor-status"]').textContent()).toContain("9 recovery codes left");
    await page.locator('[data-test="open-removal"]').click();
    await page.getByLabel("Your password").fill(SAWYER.password);
    await page.getByLabel("Code from your app (or a recovery code)").fill(recoveryCodes[1]!);
    await shots(page, "removal");
    await page.locator('[data-test="confirm-removal"]').click();
    await expect.poll(() => page.locator('[data-test="second-factor-status"]').textContent()).toContain("Off");
    await mailArrives(SAWYER.email, /second factor was removed/i);
    expect(problems).toEqual([]);
    await context.close();
  });
});
