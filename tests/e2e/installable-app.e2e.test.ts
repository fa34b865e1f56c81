import type { Browser, Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { appJson, appUrl, launchChromium, phone, screenshot, signIn, watchForPageErrors } from "./browser.ts";

/*
 * The sawyer's installable app at phone size: a web app manifest with icons and a service worker.
 * Started again without a connection, the app's shell opens (not the browser's offline page) and
 * the listing draft kept on the phone is there to carry on with; nothing from the API is ever in
 * the service worker's cache. Ridgeback Urban Timber from the Lakemont demo.
 */
const SAWYER = { email: "yard@ridgeback-timber.test", password: "ridgeback-bandmill-2026" };
const DRAFT_TITLE = "Silver maple bench slab, started in the yard";

/** The titles of the listing drafts in this browser's IndexedDB (where the app keeps them). */
function draftTitles(page: Page): Promise<string[]> {
  return page.evaluate(
    () =>
      new Promise<string[]>((resolve, reject) => {
        const opening = indexedDB.open("grainyard-drafts");
        opening.onerror = () => reject(opening.error);
        opening.onsuccess = () => {
          const database = opening.result;
          if (!database.objectStoreNames.contains("drafts")) return resolve([]);
          const all = database.transaction("drafts").objectStore("drafts").getAll();
          all.onsuccess = () => resolve((all.result as { fields?: { title?: string } }[]).map((draft) => draft.fields?.title ?? ""));
          all.onerror = () => reject(all.error);
        };
      }),
  );
}

let browser: Browser;
beforeAll(async () => {
  browser = await launchChromium();
});
afterAll(async () => browser?.close());

describe("the sawyer's app", () => {
  it("has a manifest with icons that are there", async () => {
    const manifest = await appJson<{
      name: string;
      start_url: string;
      display: string;
      icons: { src: string; sizes: string; purpose?: string }[];
    }>("/manifest.webmanifest");
    expect(manifest.status).toBe(200);
    expect(manifest.body.start_url).toBe("/yard");
    expect(manifest.body.display).toBe("standalone");
    expect(manifest.body.icons.map((icon) => icon.sizes)).toEqual(expect.arrayContaining(["192x192", "512x512"]));
    expect(manifest.body.icons.some((icon) => icon.purpose === "maskable")).toBe(true);
    const context = await browser.newContext();
    for (const icon of manifest.body.icons) {
      const response = await context.request.get(new URL(icon.src, appUrl).href);
      expect(response.status(), icon.src).toBe(200);
      expect(response.headers()["content-type"]).toBe("image/png");
    }
    await context.close();
  });

  it("installs for a sawyer and opens without a connection, with the listing draft kept on the phone", async () => {
    const context = await browser.newContext({ viewport: phone, deviceScaleFactor: 2, isMobile: true, hasTouch: true, locale: "en-US" });
    const page = await context.newPage();
    const problems = watchForPageErrors(page);
    await signIn(page, SAWYER);

    // Installable: the page names the manifest and a service worker controls the app.
    expect(await page.locator('link[rel="manifest"]').getAttribute("href")).toBe("/manifest.webmanifest");
    await page.evaluate(() => navigator.serviceWorker.ready.then(() => undefined));
    await expect.poll(() => page.evaluate(() => navigator.serviceWorker.controller !== null), { timeout: 15_000 }).toBe(true);

    // A new listing, started and kept on this phone (a title alone: not enough to send yet).
    await page.goto(`${appUrl}/yard/listings/new`);
    await page.getByLabel("Title").fill(DRAFT_TITLE);
    await expect.poll(() => draftTitles(page), { timeout: 10_000 }).toContain(DRAFT_TITLE);

    // Nothing the API answered is in the service worker's caches.
    const cached = await page.evaluate(async () => {
      const urls: string[] = [];
      for (const name of await caches.keys()) for (const request of await (await caches.open(name)).keys()) urls.push(request.url);
      return urls;
    });
    expect(cached.length).toBeGreaterThan(10);
    expect(cached.filter((url) => new URL(url).pathname.startsWith("/api/"))).toEqual([]);
    expect(cached.some((url) => new URL(url).pathname === "/app-shell.html")).toBe(true);

    // Closed, and started again with no connection at all: the app's start page, then the draft.
    await page.close();
    await context.setOffline(true);
    const offline = await context.newPage();
    await offline.goto(`${appUrl}/yard`);
    await expect.poll(() => offline.locator('[data-test="offline-drafts"]').isVisible(), { timeout: 15_000 }).toBe(true);
    await screenshot(offline, "app-offline-start-390", { fullPage: false });
    await offline.locator('[data-test="offline-drafts"] a').click();
    await expect.poll(() => offline.getByLabel("Title").inputValue(), { timeout: 15_000 }).toBe(DRAFT_TITLE);
    await offline.getByLabel("Title").fill(`${DRAFT_TITLE}, 2 m`);
    await expect.poll(() => draftTitles(offline), { timeout: 10_000 }).toContain(`${DRAFT_TITLE}, 2 m`);
    expect(await offline.locator('[data-test="draft-sync-state"]').innerText()).toMatch(/saved on this phone/i);
    await screenshot(offline, "app-offline-draft-390", { fullPage: false });

    // Opened straight at the draft's address, offline too.
    await offline.goto(`${appUrl}/yard/listings/new`);
    await expect.poll(() => offline.getByLabel("Title").inputValue(), { timeout: 15_000 }).toBe(`${DRAFT_TITLE}, 2 m`);

    await context.setOffline(false);
    // Offline, the page reports failed requests on the console; nothing else may go wrong.
    expect(problems.filter((problem) => !/Failed to (fetch|load)|ERR_INTERNET_DISCONNECTED|offline/i.test(problem))).toEqual([]);
    await context.close();
  });
});
