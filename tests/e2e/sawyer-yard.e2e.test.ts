import type { Browser, BrowserContext, Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { appUrl, desktop, launchChromium, phone, screenshot, watchForPageErrors } from "./browser.ts";
import { paintedSlabPhoto } from "./fixtures.ts";

let browser: Browser;
beforeAll(async () => {
  browser = await launchChromium();
});
afterAll(async () => browser?.close());

/** A demo sawyer from the Lakemont seed (verified, so listings can be submitted). */
const SAWYER = { email: "kiln@northshore-coop.test", password: "northshore-kiln-2026" };

async function signIn(page: Page) {
  await page.goto(`${appUrl}/sign-in`);
  await page.getByLabel("E-mail").fill(SAWYER.email);
  await page.getByLabel("Password").fill(SAWYER.password);
  await page.locator('[data-test="submit"]').click();
  await page.waitForURL(`${appUrl}/yard`, { timeout: 15_000 });
}

const visible = (page: Page, selector: string) =>
  expect.poll(() => page.locator(selector).first().isVisible(), { timeout: 15_000 }).toBe(true);

async function addSlab(page: Page, logId: string, sequence: number, widths: number[]) {
  await page.goto(`${appUrl}/yard/slabs/new?logId=${logId}`);
  await page.getByLabel("Slab number in the log").fill(String(sequence));
  await page.getByLabel("Length", { exact: true }).fill("2440");
  await page.getByLabel("Thickness").fill("51");
  const stations = page.locator('[data-test="width-station"]');
  await expect.poll(() => stations.count()).toBe(3);
  for (const [index, width] of widths.entries()) await stations.nth(index).fill(String(width));
  await page.getByText("Both edges live").click();
  await page.getByText("Flattened", { exact: true }).click();
  await page.getByLabel("Drying method").selectOption("air_then_kiln");
  // Live figures from slab-math while typing: 2440 × ~545 × 51 mm ≈ 68 bf… shown before saving.
  await expect.poll(() => page.locator('[data-test="live-board-feet"]').innerText()).toMatch(/\d/);
  await expect.poll(() => page.locator('[data-test="live-weight"]').innerText()).toMatch(/kg|lb/);
  await screenshot(page, `slab-form-${sequence}-390`);
  await page.locator('[data-test="save"]').click();
  await page.waitForURL(/\/yard\/slabs\/[0-9a-f-]{36}$/, { timeout: 15_000 });
  return page.url().split("/").at(-1)!;
}

describe("a sawyer's yard from a phone", () => {
  it("records a log, two sequential slabs and three readings, lists them with three photos through a lost connection, and submits", async () => {
    // A sawyer who measures in millimetres (the units follow the locale until chosen).
    const context: BrowserContext = await browser.newContext({
      viewport: phone,
      deviceScaleFactor: 2,
      isMobile: true,
      hasTouch: true,
      locale: "en-GB",
    });
    const page = await context.newPage();
    const problems = watchForPageErrors(page);
    await signIn(page);

    // A log with its provenance.
    await page.locator('[data-test="add-log"]').click();
    await page.waitForURL(`${appUrl}/yard/logs/new`);
    await page.getByLabel("Species").fill("Black walnut");
    await page.getByLabel("Species").press("Tab");
    await page.getByLabel("Town").fill("Northshore");
    await page.getByLabel("Kind of site").selectOption("construction");
    await page.getByLabel("Why it came down").selectOption("disease");
    await page.getByLabel("Length").fill("2600");
    await page.getByLabel("Diameter").fill("640");
    await screenshot(page, "log-form-390");
    await page.locator('[data-test="save"]').click();
    await page.waitForURL(/\/yard\/logs\/[0-9a-f-]{36}$/, { timeout: 15_000 });
    const logId = page.url().split("/").at(-1)!;

    // Two sequential slabs from it.
    const first = await addSlab(page, logId, 1, [560, 540, 552]);
    await screenshot(page, "slab-page-390");
    const second = await addSlab(page, logId, 2, [555, 538, 549]);
    expect(second).not.toBe(first);

    // Three moisture readings on the first slab, drying into the band.
    await page.goto(`${appUrl}/yard/slabs/${first}`);
    for (const [date, mc] of [
      ["2025-01-15", "24"],
      ["2025-04-15", "14"],
      ["2025-07-15", "9"],
    ] as const) {
      await page.locator('[data-test="reading-date"]').fill(date);
      await page.getByLabel("Moisture content (%)").fill(mc);
      await page.locator('[data-test="add-reading"]').click();
      await expect
        .poll(() => page.locator('[data-test="reading-list"] li').count(), { timeout: 10_000 })
        .toBeGreaterThanOrEqual([24, 14, 9].indexOf(Number(mc)) + 1);
    }
    await visible(page, '[data-test="moisture-chart"]');
    await expect.poll(() => page.locator('[data-test="drying-state"]').innerText()).toMatch(/ready/i);
    await screenshot(page, "slab-readings-390");
    await page.goto(`${appUrl}/yard/slabs/${second}`);
    for (const [date, mc] of [
      ["2025-01-15", "23"],
      ["2025-04-15", "13"],
      ["2025-07-15", "9"],
    ] as const) {
      await page.locator('[data-test="reading-date"]').fill(date);
      await page.getByLabel("Moisture content (%)").fill(mc);
      await page.locator('[data-test="add-reading"]').click();
      await expect
        .poll(() => page.locator('[data-test="reading-list"] li').count(), { timeout: 10_000 })
        .toBeGreaterThanOrEqual([23, 13, 9].indexOf(Number(mc)) + 1);
    }

    // The listing: a sequential pair. Typed data survives a reload.
    await page.goto(`${appUrl}/yard/listings/new?slabId=${first}`);
    await page.getByText("Sequential set").click();
    // Only neighbours from the same log can join the set; the others are disabled.
    const secondChoice = page.locator(".slab-choice__item", { hasText: "slab 2" }).locator("input:not([disabled])");
    if (!(await secondChoice.isChecked())) await secondChoice.check();
    await page.getByLabel("Title").fill("Black walnut sequential pair, Northshore");
    await page.getByText("Per board foot", { exact: true }).click();
    await page.getByLabel("Rate").fill("14.50");
    await expect.poll(() => page.locator('[data-test="live-price"]').innerText()).toMatch(/\d/);
    // The take-home preview uses the fees in force, and says which.
    await expect.poll(() => page.locator('[data-test="fee-note"]').innerText()).toMatch(/today's fees: \d+(\.\d+)? % to Grainyard/);
    // The draft is written to IndexedDB a moment after typing: wait until it holds the title.
    await expect
      .poll(() =>
        page.evaluate(
          () =>
            new Promise<string>((resolve) => {
              const open = indexedDB.open("grainyard-drafts");
              open.onsuccess = () => {
                const db = open.result;
                if (!db.objectStoreNames.contains("drafts")) return resolve("");
                const all = db.transaction("drafts").objectStore("drafts").getAll();
                all.onsuccess = () => resolve(JSON.stringify(all.result));
                all.onerror = () => resolve("");
              };
              open.onerror = () => resolve("");
            }),
        ),
      )
      .toContain("Black walnut sequential pair, Northshore");
    await page.reload();
    await expect.poll(() => page.getByLabel("Title").inputValue(), { timeout: 10_000 }).toBe("Black walnut sequential pair, Northshore");

    // The yard's signal drops: photos and the save wait on the phone.
    await context.setOffline(true);
    await page.locator('[data-test="photo-input"]').setInputFiles([
      { name: "top-face.jpg", mimeType: "image/jpeg", buffer: await paintedSlabPhoto(page, 25) },
      { name: "end-grain.jpg", mimeType: "image/jpeg", buffer: await paintedSlabPhoto(page, 30) },
      { name: "live-edge.jpg", mimeType: "image/jpeg", buffer: await paintedSlabPhoto(page, 20) },
    ]);
    await page.locator('[data-test="save"]').click();
    await expect
      .poll(() => page.locator('[data-test="draft-sync-state"]').innerText(), { timeout: 10_000 })
      .toMatch(/saved on this phone/i);
    await screenshot(page, "listing-offline-390");

    // Back online: the draft syncs by itself, photos upload with progress, and it can be submitted.
    await context.setOffline(false);
    await expect.poll(() => page.locator('[data-test="draft-sync-state"]').innerText(), { timeout: 30_000 }).toMatch(/synced/i);
    await page.waitForURL(/\/yard\/listings\/[0-9a-f-]{36}$/, { timeout: 15_000 });
    const listingId = page.url().split("/").at(-1)!;
    const listing = await (await page.request.get(`${appUrl}/api/v1/yard/listings/${listingId}`)).json();
    expect(listing.listing.slabs.map((s: { sequenceInLog: number }) => s.sequenceInLog)).toEqual([1, 2]);
    expect(listing.listing.photos).toHaveLength(3);
    expect(listing.listing.setKind).toBe("sequential");
    await page.locator('[data-test="submit-for-review"]').click();
    await expect.poll(() => page.locator('[data-test="listing-status"]').innerText(), { timeout: 15_000 }).toMatch(/waiting for review/i);
    await screenshot(page, "listing-submitted-390");
    expect(problems.filter((p) => !/ERR_INTERNET_DISCONNECTED|Failed to fetch|NetworkError|net::/.test(p))).toEqual([]);
    await context.close();
  });

  it("shows the yard, a slab and a listing at desktop width", async () => {
    const context = await browser.newContext({ viewport: desktop, locale: "en-GB" });
    const page = await context.newPage();
    await signIn(page);
    await visible(page, '[data-test="slab-list"], [data-test="log-list"], [data-test="listing-list"]');
    await screenshot(page, "yard-1280");
    const slabs = (await (await page.request.get(`${appUrl}/api/v1/yard/slabs`)).json()).slabs as { id: string }[];
    await page.goto(`${appUrl}/yard/slabs/${slabs[0]!.id}`);
    await visible(page, '[data-test="drying-state"]');
    await screenshot(page, "slab-page-1280");
    const listings = (await (await page.request.get(`${appUrl}/api/v1/yard/listings`)).json()).listings as { id: string }[];
    await page.goto(`${appUrl}/yard/listings/${listings[0]!.id}`);
    await visible(page, '[data-test="listing-status"]');
    await screenshot(page, "listing-1280");
    await page.goto(`${appUrl}/yard/slabs/new`);
    await visible(page, '[data-test="width-station"]');
    await screenshot(page, "slab-form-1280");
    await context.close();
  });
});
