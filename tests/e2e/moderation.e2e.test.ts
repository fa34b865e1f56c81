import type { APIRequestContext, Browser, BrowserContext, Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { DEMO_ADMIN, signIn as signInThroughForm, type SignInAs } from "./browser.ts";
import { apiSignIn, liveListing, newSawyer, slabPhoto } from "./fixtures.ts";
import { appUrl, desktop, launchChromium, newestMailTo, openPage, phone, screenshot, settled, watchForPageErrors } from "./browser.ts";

/*
 * The operator desk in Chromium: an admin sends a listing back with a reason, the sawyer fixes it
 * and resubmits from a phone, the admin sees what changed and approves. Then every admin screen
 * at phone and desktop width.
 */
let browser: Browser;
beforeAll(async () => {
  browser = await launchChromium();
});
afterAll(async () => browser?.close());

/** Demo accounts from the Lakemont seed. */
const ADMIN = DEMO_ADMIN;
const SAWYER = { email: "hello@cobblelane-slabs.test", password: "cobblelane-chainsaw-2026" };
const FIRST_TITLE = `Honey locust bench top ${Date.now().toString(36)}`;
const FIXED_TITLE = `${FIRST_TITLE}, crack at the north end`;
const REASON = "Say which end has the crack and show it in a photo.";

/** Signs in (the admin through its code step) and waits for the role's landing page. */
async function signIn(page: Page, who: SignInAs, landing: string) {
  await signInThroughForm(page, who);
  await page.waitForURL(`${appUrl}${landing}`, { timeout: 15_000 });
}

/** JSON calls from inside the signed-in browser context, with the anti-forgery header. */
async function call(request: APIRequestContext, method: "GET" | "POST" | "PATCH", path: string, body?: unknown) {
  const { csrfToken } = await (await request.get(`${appUrl}/api/v1/session`)).json();
  const response = await request.fetch(`${appUrl}${path}`, { method, headers: { "x-csrf-token": csrfToken }, data: body });
  expect(response.status(), `${method} ${path}`).toBeLessThan(300);
  return response.json();
}

/** A listing of one honey locust slab with one photo, submitted for review through the API. */
async function submitListing(page: Page, title: string, moisturePct: number): Promise<string> {
  const slab = (
    await call(page.request, "POST", "/api/v1/yard/slabs", {
      speciesSlug: "honey-locust",
      lengthMm: 1800,
      thicknessMm: 60,
      widthStationsMm: [420, 440, 430],
      liveEdge: "both",
      surfacing: "flattened",
      dryingMethod: "kiln",
    })
  ).slab;
  await call(page.request, "POST", `/api/v1/yard/slabs/${slab.id}/readings`, {
    readOn: "2026-11-20",
    moistureContentPct: moisturePct,
    method: "pin_meter",
  });
  const id = (
    await call(page.request, "POST", "/api/v1/yard/listings", { title, slabIds: [slab.id], priceMode: "fixed", rateMinor: 64_000 })
  ).listing.id as string;
  const photo = await page.evaluate(() => {
    const canvas = document.createElement("canvas");
    canvas.width = 1200;
    canvas.height = 800;
    const c = canvas.getContext("2d")!;
    c.fillStyle = "#8d8a83";
    c.fillRect(0, 0, 1200, 800);
    c.fillStyle = "hsl(34, 50%, 48%)";
    c.fillRect(80, 260, 1040, 300);
    return canvas.toDataURL("image/jpeg", 0.85);
  });
  const { csrfToken } = await (await page.request.get(`${appUrl}/api/v1/session`)).json();
  const upload = await page.request.post(`${appUrl}/api/v1/yard/listings/${id}/photos`, {
    headers: { "x-csrf-token": csrfToken, "content-type": "image/jpeg" },
    data: Buffer.from(photo.split(",")[1]!, "base64"),
  });
  expect(upload.status()).toBe(201);
  await call(page.request, "POST", `/api/v1/yard/listings/${id}/submit`);
  return id;
}

/** Nothing on the page is wider than the window (no sideways scrolling on a phone). */
async function fitsTheScreen(page: Page, width: number) {
  expect(await page.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(width);
}

const visible = (page: Page, selector: string) =>
  expect.poll(() => page.locator(selector).first().isVisible(), { timeout: 15_000 }).toBe(true);
let listingId = "";

describe("moderation desk", () => {
  it("send back with a reason → the sawyer fixes it on a phone → the admin sees what changed and approves", async () => {
    // The sawyer's listing, made through the API (the yard flows have their own e2e test).
    const sawyerContext: BrowserContext = await browser.newContext({
      viewport: phone,
      deviceScaleFactor: 2,
      isMobile: true,
      hasTouch: true,
      locale: "en-GB",
    });
    const sawyerPage = await sawyerContext.newPage();
    const sawyerProblems = watchForPageErrors(sawyerPage);
    await signIn(sawyerPage, SAWYER, "/yard");
    listingId = await submitListing(sawyerPage, FIRST_TITLE, 3);

    // The admin at a desk: the listing waits with a plausibility warning; sent back with a reason.
    // Reduced motion: the dashboard's charts draw at once, so the screenshot needs no waiting on them.
    const adminContext = await browser.newContext({ viewport: desktop, locale: "en-GB", reducedMotion: "reduce" });
    const adminPage = await adminContext.newPage();
    const adminProblems = watchForPageErrors(adminPage);
    await signIn(adminPage, ADMIN, "/admin");
    await adminPage.goto(`${appUrl}/admin/review`);
    const item = adminPage.locator('[data-test="review-item"]', { hasText: FIRST_TITLE });
    await expect.poll(() => item.count(), { timeout: 15_000 }).toBe(1);
    await expect.poll(() => item.locator('[data-test="warnings"]').innerText()).toMatch(/below 4 %/);
    await screenshot(adminPage, "admin-review-first-1280");
    await item.locator('[data-test="send-back"]').click();
    await adminPage.locator('[data-test="reason-confirm"]').click();
    await expect.poll(() => adminPage.locator('[data-test="reason-dialog"]').innerText()).toMatch(/at least 5 characters/);
    await adminPage.locator('[data-test="reason-text"]').fill(REASON);
    await adminPage.locator('[data-test="reason-confirm"]').click();
    await expect.poll(() => item.locator('[data-test="decision"]').innerText(), { timeout: 15_000 }).toMatch(/sent back/i);
    const mail = await newestMailTo(SAWYER.email, /^Changes needed before/);
    expect(mail.text).toContain(REASON);

    // The sawyer on a phone: sees the reason, changes the title, submits again.
    await sawyerPage.goto(`${appUrl}/yard/listings/${listingId}`);
    await expect.poll(() => sawyerPage.locator('[data-test="review-note"]').innerText(), { timeout: 15_000 }).toContain(REASON);
    await screenshot(sawyerPage, "listing-sent-back-390");
    await sawyerPage.getByLabel("Title").fill(FIXED_TITLE);
    await sawyerPage.locator('[data-test="save"]').click();
    await expect
      .poll(async () => (await call(sawyerPage.request, "GET", `/api/v1/yard/listings/${listingId}`)).listing.title, { timeout: 15_000 })
      .toBe(FIXED_TITLE);
    await sawyerPage.locator('[data-test="submit-for-review"]').click();
    await expect
      .poll(() => sawyerPage.locator('[data-test="listing-status"]').innerText(), { timeout: 15_000 })
      .toMatch(/waiting for review/i);
    await screenshot(sawyerPage, "listing-resubmitted-390");

    // The admin sees exactly what changed since the last review, and approves.
    await adminPage.goto(`${appUrl}/admin/review`);
    const again = adminPage.locator('[data-test="review-item"]', { hasText: FIXED_TITLE });
    await expect.poll(() => again.count(), { timeout: 15_000 }).toBe(1);
    const change = again.locator('[data-test="change"]');
    await expect.poll(() => change.count()).toBe(1);
    expect(await change.innerText()).toContain(FIRST_TITLE);
    expect(await change.innerText()).toContain(FIXED_TITLE);
    expect(await again.locator('[data-test="changes"]').innerText()).toContain(REASON);
    await screenshot(adminPage, "admin-review-resubmitted-1280");
    await again.locator('[data-test="approve"]').click();
    await expect.poll(() => again.locator('[data-test="decision"]').innerText(), { timeout: 15_000 }).toMatch(/approved/i);
    expect((await newestMailTo(SAWYER.email, /live/i)).subject).toMatch(/live/i);
    const live = await (await adminPage.request.get(`${appUrl}/api/v1/catalogue/${listingId}`)).json();
    expect(live.listing.title).toBe(FIXED_TITLE);

    expect(sawyerProblems).toEqual([]);
    expect(adminProblems).toEqual([]);
    await sawyerContext.close();
    await adminContext.close();
  });

  it("every admin screen renders at phone and desktop width, with a report and a settings change on the way", async () => {
    // A buyer reports a live listing (made for this test) so the reports queue has something in it.
    const listingId = await liveListing(await newSawyer("chainsaw"), await apiSignIn(ADMIN), await slabPhoto(browser, 40), {
      title: `Honey locust bench top with a wide crack ${Date.now().toString(36)}`,
      speciesSlug: "honey-locust",
      lengthMm: 1830,
      widthStationsMm: [420, 400, 390],
      rateMinor: 52000,
    });
    const buyerContext = await browser.newContext({ viewport: phone, deviceScaleFactor: 2, isMobile: true, hasTouch: true });
    const buyerPage = await buyerContext.newPage();
    await signIn(buyerPage, { email: "shop@fernhill-furniture.test", password: "fernhill-benches-2026" }, "/account");
    await openPage(buyerPage, `/slabs/${listingId}`);
    await buyerPage.locator('[data-test="report-listing"]').click();
    await buyerPage.locator('[data-test="reason-text"]').fill("The crack looks wider than described.");
    await buyerPage.locator('[data-test="reason-confirm"]').click();
    await expect.poll(() => buyerPage.getByText("An admin will look at your report").isVisible(), { timeout: 15_000 }).toBe(true);
    await screenshot(buyerPage, "slab-page-reported-390");
    await buyerContext.close();

    // One more listing waits, so the review desk is shown with work at both widths.
    const sawyerContext = await browser.newContext({ viewport: phone, deviceScaleFactor: 2, isMobile: true, hasTouch: true });
    const sawyerPage = await sawyerContext.newPage();
    await signIn(sawyerPage, SAWYER, "/yard");
    await submitListing(sawyerPage, `Honey locust offcut ${Date.now().toString(36)}`, 17);
    await sawyerContext.close();

    for (const [size, viewport] of [
      ["390", phone],
      ["1280", desktop],
    ] as const) {
      const context = await browser.newContext(
        size === "390" ? { viewport, deviceScaleFactor: 2, isMobile: true, hasTouch: true } : { viewport },
      );
      const page = await context.newPage();
      const problems = watchForPageErrors(page);
      await signIn(page, ADMIN, "/admin");
      await visible(page, '[data-test="awaiting-review"]');
      // Live by species and this week's review times have data; the orders and money panels show a
      // chart or say there is nothing yet (other suites of this run may have bought slabs first).
      await expect.poll(() => page.locator("canvas").count(), { timeout: 15_000 }).toBeGreaterThanOrEqual(2);
      for (const panel of ["chart-orders", "chart-money"]) {
        await expect
          .poll(() => page.locator(`section[aria-labelledby="${panel}"]`).locator("canvas, .charts__empty").count(), { timeout: 15_000 })
          .toBe(1);
      }
      await settled(page);
      await fitsTheScreen(page, viewport.width);
      await screenshot(page, `admin-dashboard-${size}`);

      await page.goto(`${appUrl}/admin/review`);
      await visible(page, '[data-test="review-item"]');
      await expect.poll(() => page.locator('[data-test="warnings"]').first().innerText()).toMatch(/above 15 %/);
      await fitsTheScreen(page, viewport.width);
      await screenshot(page, `admin-review-${size}`);

      await page.goto(`${appUrl}/admin/reports`);
      await visible(page, '[data-test="report-item"]');
      await fitsTheScreen(page, viewport.width);
      await screenshot(page, `admin-reports-${size}`);

      await page.goto(`${appUrl}/admin/users`);
      await visible(page, '[data-test="user-row"]');
      await fitsTheScreen(page, viewport.width);
      await screenshot(page, `admin-users-${size}`);

      await page.goto(`${appUrl}/admin/settings`);
      await visible(page, '[data-test="setting-platformFeeBps"]');
      if (size === "1280") {
        const hold = page.locator('[data-test="setting-holdDays"]');
        await hold.fill((await hold.inputValue()) === "10" ? "11" : "10");
        await page.locator('[data-test="save-settings"]').click();
        await page.locator('[data-test="reason-text"]').fill("Longer hold for the holidays.");
        await screenshot(page, "admin-settings-confirm-1280");
        await page.locator('[data-test="reason-confirm"]').click();
        await expect.poll(() => page.getByText("Saved.").isVisible(), { timeout: 15_000 }).toBe(true);
      }
      await fitsTheScreen(page, viewport.width);
      await screenshot(page, `admin-settings-${size}`);

      await page.goto(`${appUrl}/admin/audit`);
      await visible(page, '[data-test="audit-entry"]');
      if (size === "1280") {
        await expect.poll(() => page.locator('[data-test="audit-entry"]').first().innerText()).toMatch(/changed the marketplace settings/);
        const csv = await page.request.get(`${appUrl}${await page.locator('[data-test="audit-csv"]').getAttribute("href")}`);
        expect(csv.status()).toBe(200);
        expect(await csv.text()).toMatch(/listing\.approve/);
        // Other suites of this run count on the default 7-day hold: put it back.
        await call(page.request, "PATCH", "/api/v1/admin/settings", {
          holdDays: 7,
          reason: "Back to the usual hold after the holiday test.",
        });
      }
      await fitsTheScreen(page, viewport.width);
      await screenshot(page, `admin-audit-${size}`);

      // Every order, searched: the demo's orders, then a search that finds none.
      await page.goto(`${appUrl}/admin/orders`);
      await visible(page, '[data-test="desk-orders"]');
      await fitsTheScreen(page, viewport.width);
      await screenshot(page, `admin-orders-${size}`);
      await page.locator("#order-search").fill("no slab is called this");
      await visible(page, '[data-test="orders-none-match"]');
      await screenshot(page, `admin-orders-none-${size}`);
      expect(problems).toEqual([]);
      await context.close();
    }
  });
});
