import type { Browser, BrowserContext, ConsoleMessage, Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { appUrl, desktop, launchChromium, listingIdOf, openPage, phone, screenshot, signIn } from "./browser.ts";

/*
 * The public pages as the server renders them: a slab page reads without JavaScript, and with it
 * the browser takes the server's HTML over (hydration) without redrawing it, without asking the
 * API for what came with the page, and without a mismatch between the two. Lakemont demo data.
 */

// A set no other suite buys (the payouts suite sells the walnut pair): two photos, so the gallery steps.
const SET_TITLE = "Curly sugar maple, bookmatched pair";
const BUYER = { email: "ana.theo@lakemont-home.test", password: "first-dining-table-26" };

let browser: Browser;
let setId = "";
beforeAll(async () => {
  browser = await launchChromium();
  setId = await listingIdOf(SET_TITLE);
});
afterAll(async () => browser?.close());

const contextFor = (size: "phone" | "desktop", options: { javaScriptEnabled?: boolean } = {}) =>
  browser.newContext({
    ...(size === "phone" ? { viewport: phone, deviceScaleFactor: 2, isMobile: true, hasTouch: true } : { viewport: desktop }),
    locale: "en-US",
    ...options,
  });

/** Everything the console says about hydration (Vue reports a mismatch even in a production build). */
function watchHydration(page: Page): string[] {
  const said: string[] = [];
  const listen = (message: ConsoleMessage) => {
    if (/hydrat|mismatch/i.test(message.text())) said.push(`${message.type()}: ${message.text()}`);
  };
  page.on("console", listen);
  page.on("pageerror", (error) => said.push(`page error: ${error.message}`));
  return said;
}

/** The API calls the page makes (photos aside). */
function watchApi(page: Page): string[] {
  const calls: string[] = [];
  page.on("request", (request) => {
    const url = new URL(request.url());
    if (url.pathname.startsWith("/api/") && !url.pathname.includes("/photos/")) calls.push(`${request.method()} ${url.pathname}`);
  });
  return calls;
}

/** Waits until the browser has taken the page over (entry-client marks the app). */
const hydrated = (page: Page) => page.waitForSelector("#app[data-ready]", { state: "attached", timeout: 15_000 });

describe("a slab page", () => {
  it("shows the slab with JavaScript turned off: photo, title, price, measurements", async () => {
    for (const size of ["phone", "desktop"] as const) {
      const context: BrowserContext = await contextFor(size, { javaScriptEnabled: false });
      const page = await context.newPage();
      const response = await page.goto(`${appUrl}/slabs/${setId}`);
      expect(response?.status()).toBe(200);
      await expect(page.title()).resolves.toBe(`${SET_TITLE} · Grainyard`);
      await expect(page.locator("h1").innerText()).resolves.toBe(SET_TITLE);
      expect(await page.locator('[data-test="slab-price"]').innerText()).toMatch(/^\$[\d,]+\.\d\d$/);
      expect(await page.locator('[data-test="slab-weight"]').innerText()).toMatch(/lb/);
      // The first photo is drawn (it arrived without any script).
      await expect
        .poll(() => page.locator(".gallery__image").evaluate((image: HTMLImageElement) => image.complete && image.naturalWidth > 0))
        .toBe(true);
      await screenshot(page, `slab-no-js-${size === "phone" ? "390" : "1280"}`, { fullPage: false });
      await context.close();
    }
  });

  it("hydrates without a mismatch and without asking again for what came with the page", async () => {
    for (const size of ["phone", "desktop"] as const) {
      const context = await contextFor(size);
      const page = await context.newPage();
      const hydration = watchHydration(page);
      const api = watchApi(page);
      await page.goto(`${appUrl}/slabs/${setId}`);
      await hydrated(page);
      await page.waitForLoadState("networkidle");
      expect(hydration).toEqual([]);
      // Only the session (who is signed in) is asked for: the slab and its price came with the page.
      expect(api).toEqual(["GET /api/v1/session"]);
      // The page is live: the units switch redraws the measurements, the gallery steps.
      const weight = await page.locator('[data-test="slab-weight"]').innerText();
      await page.locator('[data-test="units-toggle"] label', { hasText: "Metric" }).first().click();
      await expect.poll(() => page.locator('[data-test="slab-weight"]').innerText()).not.toBe(weight);
      expect(await page.locator('[data-test="slab-weight"]').innerText()).toMatch(/kg/);
      await page.locator(".gallery__step--next").click();
      await expect.poll(() => page.locator(".gallery__count").innerText()).toBe("2 of 2");
      await screenshot(page, `slab-hydrated-${size === "phone" ? "390" : "1280"}`, { fullPage: false });
      await context.close();
    }
  });

  it("hydrates for a signed-in buyer too, then shows their heart and the buy button", async () => {
    const context = await contextFor("desktop");
    const page = await context.newPage();
    await signIn(page, BUYER);
    const hydration = watchHydration(page);
    await page.goto(`${appUrl}/slabs/${setId}`);
    await hydrated(page);
    await expect.poll(() => page.locator('[data-test="buy"]').count(), { timeout: 10_000 }).toBe(1);
    expect(await page.locator('[data-test="favourite-toggle"]').count()).toBeGreaterThan(0);
    expect(hydration).toEqual([]);
    await context.close();
  });

  it("would be caught: a page whose HTML differs from what the browser draws reports the mismatch", async () => {
    // The check above must be able to fail: change the server's HTML on its way to the browser.
    const context = await contextFor("desktop");
    const page = await context.newPage();
    await page.route(`${appUrl}/slabs/${setId}`, async (route) => {
      const response = await route.fetch();
      const html = (await response.text()).replace(/(<h1 id="slab-title"[^>]*>)[^<]*/, "$1Something else");
      await route.fulfill({ response, body: html });
    });
    const hydration = watchHydration(page);
    await page.goto(`${appUrl}/slabs/${setId}`);
    await hydrated(page);
    await expect.poll(() => hydration.length).toBeGreaterThan(0);
    await context.close();
  });

  it("answers an unknown slab with 404 and a way back to the catalogue", async () => {
    const context = await contextFor("phone");
    const page = await context.newPage();
    const response = await page.goto(`${appUrl}/slabs/00000000-0000-4000-8000-000000000000`);
    expect(response?.status()).toBe(404);
    await hydrated(page);
    expect(await page.locator('[data-test="slab-not-found"]').innerText()).toContain("isn't for sale here");
    await page.locator('[data-test="slab-not-found"] a', { hasText: "See the slabs for sale" }).click();
    await page.waitForURL(`${appUrl}/browse`);
    await context.close();
  });
});

describe("the catalogue and the home page", () => {
  it("hydrate without a mismatch, each with the data that came with it", async () => {
    for (const path of ["/", "/browse", "/browse?species=black-walnut&sort=price_low"]) {
      const context = await contextFor("phone");
      const page = await context.newPage();
      const hydration = watchHydration(page);
      const api = watchApi(page);
      await page.goto(`${appUrl}${path}`);
      await hydrated(page);
      await page.waitForLoadState("networkidle");
      expect(hydration, path).toEqual([]);
      expect(api, path).toEqual(["GET /api/v1/session"]);
      await context.close();
    }
  });
});

describe("the catalogue on a phone", () => {
  it("shows slab cards on the first screen; filters and the table fit open in a sheet with their count on the button", async () => {
    const context = await contextFor("phone");
    const page = await context.newPage();
    await openPage(page, "/browse?species=black-walnut,white-oak&ready=1");
    const first = page.locator('[data-test="catalogue-card"]').first();
    const box = await first.boundingBox();
    expect(box, "a card is on the page").not.toBeNull();
    // The card's top and its photo are within the 844 px of the first screen.
    expect(box!.y).toBeLessThan(phone.height - 200);
    const photo = await first.locator("img").boundingBox();
    expect(photo!.y + photo!.height / 2).toBeLessThan(phone.height);
    // No filter panel in the way: the two filters (species, ready) are counted on the button.
    expect((await page.locator('[data-test="filters-count"]').innerText()).replace(/\D/g, "")).toBe("2");
    await screenshot(page, "browse-phone-first-screen-390", { fullPage: false });

    await page.locator('[data-test="filters-toggle"]').click();
    const sheet = page.locator('[data-test="catalogue-sheet"]');
    await expect.poll(() => sheet.isVisible()).toBe(true);
    expect(await sheet.getByRole("checkbox", { name: /White oak/ }).isChecked()).toBe(true);
    await screenshot(page, "browse-phone-filters-390", { fullPage: false });
    await page.locator('[data-test="sheet-done"]').click();
    await expect.poll(() => sheet.isVisible()).toBe(false);

    // The table fit: searched from its own sheet, which closes on the answer.
    await page.locator('[data-test="fit-toggle"]').click();
    await page.locator("#fit-seats").fill("8");
    await page.locator('[data-test="fit-search"]').click();
    await page.waitForURL(/seats=8/);
    await expect.poll(() => page.locator('[data-test="fit-toggle"]').innerText()).toContain("Table for 8");
    await expect.poll(() => sheet.isVisible()).toBe(false);
    await context.close();
  });

  it("keeps the filters in a column and the fit above the slabs on a wide screen", async () => {
    const context = await contextFor("desktop");
    const page = await context.newPage();
    await openPage(page, "/browse");
    expect(await page.locator('[data-test="filters-panel"]').isVisible()).toBe(true);
    expect(await page.locator('[data-test="fit-panel"]').isVisible()).toBe(true);
    expect(await page.locator('[data-test="filters-toggle"]').isVisible()).toBe(false);
    await screenshot(page, "browse-desktop-1280", { fullPage: false });
    await context.close();
  });
});

describe("no layout shift", () => {
  it("keeps the page still while the fonts, the scripts and the session arrive late", async () => {
    // Late fonts: the metric-matched fallbacks take the same room. Late scripts and session: the
    // server's page is already whole, and signed-out is what the server drew.
    const shifts: Record<string, number> = {};
    for (const [size, path] of [
      ["phone", `/slabs/${setId}`],
      ["phone", "/browse"],
      ["phone", "/"],
      ["desktop", `/slabs/${setId}`],
      ["desktop", "/browse"],
    ] as const) {
      const context = await contextFor(size);
      const page = await context.newPage();
      await page.addInitScript(() => {
        const shifted = window as unknown as { layoutShift: number };
        shifted.layoutShift = 0;
        new PerformanceObserver((list) => {
          for (const entry of list.getEntries() as (PerformanceEntry & { value: number; hadRecentInput: boolean })[])
            if (!entry.hadRecentInput) shifted.layoutShift += entry.value;
        }).observe({ type: "layout-shift", buffered: true });
      });
      const later = (ms: number) => new Promise((resolve) => setTimeout(resolve, ms));
      await page.route(/\.woff2$/, async (route) => (await later(1_500), route.continue()));
      await page.route(/\/assets\/.*\.js$/, async (route) => (await later(300), route.continue()));
      await page.route(/\/api\/v1\/session$/, async (route) => (await later(800), route.continue()));
      await openPage(page, path);
      await page.waitForLoadState("networkidle");
      await page.evaluate(() => document.fonts.ready);
      shifts[`${size} ${path}`] = await page.evaluate(() => (window as unknown as { layoutShift: number }).layoutShift);
      await context.close();
    }
    for (const [page, shift] of Object.entries(shifts)) expect(shift, page).toBeLessThanOrEqual(0.05);
  });
});
