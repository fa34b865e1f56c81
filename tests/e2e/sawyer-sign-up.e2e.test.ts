import type { Browser } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { appUrl, desktop, launchChromium, newestMailTo, phone, screenshot, watchForPageErrors, openPage } from "./browser.ts";

let browser: Browser;
beforeAll(async () => {
  browser = await launchChromium();
});
afterAll(async () => browser?.close());

describe("a sawyer joins from a phone", () => {
  it("signs up, confirms the e-mail from the inbox, signs in, reaches the yard and signs out", async () => {
    const context = await browser.newContext({ viewport: phone, deviceScaleFactor: 2, isMobile: true, hasTouch: true });
    const page = await context.newPage();
    const problems = watchForPageErrors(page);
    const email = `mill-${Date.now()}@lakemont.test`;
    const password = "silver-maple-stack-26";

    await page.goto(`${appUrl}/join`);
    await page.locator('[data-test="role-sawyer"]').click();
    await page.getByLabel("Your name").fill("Rosa Delacroix");
    await page.getByLabel("E-mail").fill(email);
    await page.getByLabel("Password").fill(password);
    await page.getByLabel("Yard name").fill("Delacroix Street Timber");
    await page.getByLabel("Pickup town").fill("Lakemont");
    await screenshot(page, "join-sawyer-390");
    await page.locator('[data-test="submit"]').click();
    await expect.poll(() => page.locator('[data-test="check-inbox"]').isVisible(), { timeout: 15_000 }).toBe(true);
    expect(await page.locator('[data-test="check-inbox"]').innerText()).toContain(email);

    // The link comes through real SMTP into the mail sink.
    const mail = await newestMailTo(email, /confirm/i);
    expect(mail.subject).toMatch(/confirm/i);
    const link = /https?:\/\/\S+\/verify-email\?token=[A-Za-z0-9_-]+/.exec(mail.text)?.[0];
    expect(link, "verification link in the e-mail").toBeTruthy();
    expect(link!.startsWith(appUrl)).toBe(true);
    await page.goto(link!);
    await expect.poll(() => page.locator('[data-test="verified"]').isVisible(), { timeout: 15_000 }).toBe(true);

    await page.goto(`${appUrl}/sign-in`);
    await page.getByLabel("E-mail").fill(email);
    await page.getByLabel("Password").fill(password);
    await page.locator('[data-test="submit"]').click();
    await page.waitForURL(`${appUrl}/yard`, { timeout: 15_000 });
    await expect.poll(() => page.locator('[data-test="yard-home"]').isVisible(), { timeout: 15_000 }).toBe(true);
    expect(await page.locator("body").innerText()).toContain("Delacroix Street Timber");
    expect(await page.locator('[data-test="unverified-banner"]').count()).toBe(0);
    await screenshot(page, "yard-home-390");

    const toggle = page.locator('[data-test="menu-toggle"]');
    if (await toggle.isVisible()) await toggle.click();
    await page.locator('[data-test="sign-out"]').first().click();
    // Signed out for real: the yard now asks for sign-in.
    await expect
      .poll(async () => (await page.request.get(`${appUrl}/api/v1/session`)).json().then((b) => b.account), { timeout: 10_000 })
      .toBeNull();
    await page.goto(`${appUrl}/yard`);
    await page.waitForURL(/\/sign-in/, { timeout: 15_000 });

    expect(problems).toEqual([]);
    await context.close();
  });

  it("shows the same yard at desktop width, and the main pages render at both widths", async () => {
    // A seeded, verified sawyer from the Lakemont demo.
    for (const [label, viewport] of [
      ["1280", desktop],
      ["390", phone],
    ] as const) {
      const context = await browser.newContext({ viewport });
      const page = await context.newPage();
      const problems = watchForPageErrors(page);
      await openPage(page, `/`);
      await expect.poll(() => page.locator("h1").first().isVisible(), { timeout: 15_000 }).toBe(true);
      await screenshot(page, `home-${label}`);
      await page.goto(`${appUrl}/sign-in`);
      await page.getByLabel("E-mail").fill("yard@ridgeback-timber.test");
      await page.getByLabel("Password").fill("ridgeback-bandmill-2026");
      await page.locator('[data-test="submit"]').click();
      await page.waitForURL(`${appUrl}/yard`, { timeout: 15_000 });
      await expect.poll(() => page.locator('[data-test="yard-home"]').isVisible(), { timeout: 15_000 }).toBe(true);
      expect(await page.locator("body").innerText()).toContain("Ridgeback Urban Timber");
      await screenshot(page, `yard-home-${label}`);
      const missing = await openPage(page, `/no-such-page`);
      // A real 404 from the server (search engines and link checkers see it), with the app's page.
      expect(missing?.status()).toBe(404);
      await expect.poll(() => page.locator("body").innerText(), { timeout: 10_000 }).toMatch(/404|couldn.t find/i);
      await screenshot(page, `not-found-${label}`);
      // Chromium reports the page's own 404 on the console; nothing else may go wrong.
      expect(problems.filter((problem) => !/status of 404/.test(problem))).toEqual([]);
      expect(problems.filter((problem) => /status of 404/.test(problem))).toHaveLength(1);
      await context.close();
    }
  });

  it("a wrong password shows a clear message and the sixth wrong try is held back", async () => {
    const context = await browser.newContext({ viewport: phone });
    const page = await context.newPage();
    await page.goto(`${appUrl}/sign-in`);
    // An address no other test signs in with: the hold lasts the limit's window, and suites run in any order.
    const email = `held-back-${Date.now()}@lakemont.test`;
    for (let attempt = 1; attempt <= 6; attempt++) {
      await page.getByLabel("E-mail").fill(email);
      await page.getByLabel("Password").fill(`not-it-${attempt}-password`);
      await page.locator('[data-test="submit"]').click();
      const expected = attempt < 6 ? /do not match/i : /too many sign-in attempts/i;
      await expect.poll(() => page.locator("body").innerText(), { timeout: 10_000 }).toMatch(expected);
    }
    await screenshot(page, "sign-in-limited-390");
    await context.close();
  });
});
