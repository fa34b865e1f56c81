import type { Browser, BrowserContext, Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { DEMO_ADMIN, signIn as signInThroughForm, type SignInAs } from "./browser.ts";
import { appUrl, desktop, launchChromium, newestMailTo, openPage, phone, screenshot, settled, watchForPageErrors } from "./browser.ts";
import { buyerEndpoints } from "@grainyard/contracts";
import { apiSignIn, liveListing, newBuyer, newSawyer, paintedSlabPhoto, slabPhoto as photoOfSlab } from "./fixtures.ts";

/*
 * A couple building their first dining table look for a slab that seats eight, save the search
 * with e-mail alerts, and hear about a new slab the day a sawyer lists it and the desk approves
 * it; the alert's unsubscribe link works without signing in (everyone from the Lakemont demo seed).
 * Apart from that, a buyer asks a sawyer about a slab and the sawyer answers from a phone: that test
 * makes its own sawyer, buyer and slab (fixtures.ts), so it stands alone.
 */

const HOMEOWNER = { email: "ana.theo@lakemont-home.test", password: "first-dining-table-26" };
const SAWYER = { email: "yard@ridgeback-timber.test", password: "ridgeback-bandmill-2026" };
const ADMIN = DEMO_ADMIN;
/** A buyer who has saved nothing (for the empty states). */
const SHOP = { email: "shop@fernhill-furniture.test", password: "fernhill-benches-2026" };

const SEARCH_NAME = "Our dining table for eight";
/** Unique per run: the alert's subject names it, and the mail sink keeps earlier runs' e-mails. */
const NEW_LISTING_TITLE = `White oak dining slab from the Harbour Road storm, seats eight ${Date.now().toString(36)}`;

let browser: Browser;
beforeAll(async () => {
  browser = await launchChromium();
});
afterAll(async () => browser?.close());

const phoneContext = (locale = "en-US") =>
  browser.newContext({ viewport: phone, deviceScaleFactor: 2, isMobile: true, hasTouch: true, locale });
const desktopContext = (locale = "en-US") => browser.newContext({ viewport: desktop, locale });
const visible = (page: Page, selector: string, timeout = 15_000) =>
  expect.poll(() => page.locator(selector).first().isVisible(), { timeout }).toBe(true);

/**
 * A full-page screenshot taken from the top (a sticky top bar is drawn where the page was
 * scrolled to otherwise), after checking the page does not scroll sideways.
 */
async function shot(page: Page, name: string) {
  const sideways = await page.evaluate(() => document.documentElement.scrollWidth - window.innerWidth);
  expect(sideways, `${name} scrolls sideways by ${sideways}px`).toBeLessThanOrEqual(0);
  await page.evaluate(() => window.scrollTo(0, 0));
  await settled(page);
  await screenshot(page, name);
}

/** Signs in (the admin through its code step) and waits for the role's landing page. */
async function signIn(page: Page, who: SignInAs, landing: string) {
  await signInThroughForm(page, who);
  await page.waitForURL(`${appUrl}${landing}`, { timeout: 15_000 });
}

/** The API through the page's own session (cookies and the anti-forgery token), as the app calls it. */
async function apiCall(
  page: Page,
  method: "GET" | "POST" | "PATCH",
  path: string,
  body?: unknown,
  raw?: { contentType: string; data: Buffer },
) {
  const session = await (await page.request.get(`${appUrl}/api/v1/session`)).json();
  const response = await page.request.fetch(`${appUrl}${path}`, {
    method,
    headers: { "x-csrf-token": session.csrfToken, ...(raw ? { "content-type": raw.contentType } : {}) },
    ...(raw ? { data: raw.data } : body !== undefined ? { data: body } : {}),
  });
  const text = await response.text();
  if (response.status() >= 300) throw new Error(`${method} ${path} answered ${response.status()}: ${text}`);
  return text ? JSON.parse(text) : undefined;
}

describe("a homeowner's dining table", () => {
  it("searches 'seats 8', reads a slab in both units, saves the search with alerts, and gets the alert for a new slab that works to unsubscribe", async () => {
    const context: BrowserContext = await desktopContext();
    const page = await context.newPage();
    const problems = watchForPageErrors(page);

    // Not signed in yet: saving the search asks to sign in and comes back to the same search.
    await openPage(page, `/browse?seats=8`);
    await visible(page, '[data-test="catalogue-card"]');
    await page.locator('[data-test="save-search-open"]').click();
    await visible(page, '[data-test="save-search-sign-in"]');
    await shot(page, "browse-save-sign-in-1280");
    await page.locator('[data-test="save-search-sign-in-link"]').click();
    await page.waitForURL(/\/sign-in\?next=/);
    await page.getByLabel("E-mail").fill(HOMEOWNER.email);
    await page.getByLabel("Password").fill(HOMEOWNER.password);
    await page.locator('[data-test="submit"]').click();
    await page.waitForURL(/\/browse\?seats=8$/, { timeout: 15_000 });
    // Back on the same search, with the form open; closed again to search from scratch first.
    await visible(page, '[data-test="save-search-form"]');
    await page.getByRole("button", { name: "Cancel" }).click();

    // The search from the fit panel: a table for eight.
    await openPage(page, `/browse`);
    await page.locator("#fit-seats").fill("8");
    await page.locator('[data-test="fit-search"]').click();
    await page.waitForURL(/\/browse\?seats=8$/);
    await expect.poll(() => page.locator('[data-test="fit-top"]').innerText(), { timeout: 15_000 }).toMatch(/8 diners/);
    const card = page.locator('[data-test="catalogue-card"]', { hasText: "seats eight" }).first();
    await expect.poll(() => card.isVisible(), { timeout: 15_000 }).toBe(true);

    // The slab page, in US units first, then metric; the movement forecast is there to read.
    await card.click();
    await page.waitForURL(/\/slabs\/[0-9a-f-]{36}$/);
    const seededOak = page.url().split("/").at(-1)!;
    await visible(page, '[data-test="slab-weight"]');
    await expect.poll(() => page.locator('[data-test="slab-weight"]').innerText()).toMatch(/lb/);
    await page.locator('[data-test="units-toggle"]').getByText("Metric").click();
    await expect.poll(() => page.locator('[data-test="slab-weight"]').innerText()).toMatch(/kg/);
    const forecast = page.locator('[data-test="movement-forecast"]');
    await forecast.scrollIntoViewIfNeeded();
    await expect.poll(() => forecast.locator('[data-test="movement-width-change"]').innerText()).toMatch(/\d.*mm/);
    expect(await forecast.locator('[data-test="movement-summer-emc"]').innerText()).toMatch(/%/);

    // A heart for this one: it is on the favourites page afterwards.
    const heart = page.locator('[data-test="slab-page"] [data-test="favourite-toggle"]').first();
    await heart.click();
    await expect.poll(() => heart.getAttribute("aria-pressed")).toBe("true");
    await shot(page, "slab-page-buyer-1280");

    // Back to the search, and save it with e-mail alerts.
    await openPage(page, `/browse?seats=8`);
    await page.locator('[data-test="save-search-open"]').click();
    await expect.poll(() => page.locator('[data-test="save-search-name"]').inputValue()).toBe("Table for 8");
    await page.locator('[data-test="save-search-name"]').fill(SEARCH_NAME);
    expect(await page.locator('[data-test="save-search-alerts"]').isChecked()).toBe(true);
    await shot(page, "browse-save-form-1280");
    await page.locator('[data-test="save-search-submit"]').click();
    await expect
      .poll(() => page.locator('[data-test="save-search-done"]').innerText(), { timeout: 10_000 })
      .toContain(`Saved as “${SEARCH_NAME}”`);
    await shot(page, "browse-saved-1280");

    await page.goto(`${appUrl}/saved-searches`);
    const saved = page.locator('[data-test="saved-search"]', { hasText: SEARCH_NAME });
    await expect.poll(() => saved.isVisible(), { timeout: 10_000 }).toBe(true);
    expect(await saved.locator(".saved__word").allInnerTexts()).toEqual(["Table for 8"]);
    expect(await saved.locator('[data-test="saved-search-last-alert"]').innerText()).toBe("None yet");
    await shot(page, "saved-searches-1280");

    await page.goto(`${appUrl}/favourites`);
    await visible(page, `[data-test="favourites"] [data-listing-id="${seededOak}"]`);
    await shot(page, "favourites-1280");

    // A sawyer lists a new slab wide and long enough for eight…
    const sawyerContext = await desktopContext();
    const sawyerPage = await sawyerContext.newPage();
    await signIn(sawyerPage, SAWYER, "/yard");
    const slab = await apiCall(sawyerPage, "POST", "/api/v1/yard/slabs", {
      speciesSlug: "white-oak",
      lengthMm: 3050,
      thicknessMm: 64,
      widthStationsMm: [1020, 990, 1000, 1015],
      liveEdge: "both",
      surfacing: "flattened",
      dryingMethod: "air_then_kiln",
    });
    const made = await apiCall(sawyerPage, "POST", "/api/v1/yard/listings", {
      title: NEW_LISTING_TITLE,
      slabIds: [slab.slab.id],
      priceMode: "fixed",
      rateMinor: 145_000,
    });
    const newListingId: string = made.listing.id;
    await apiCall(
      sawyerPage,
      "POST",
      `/api/v1/yard/listings/${newListingId}/photos?altText=${encodeURIComponent("Top face of the white oak slab")}`,
      undefined,
      {
        contentType: "image/jpeg",
        data: await paintedSlabPhoto(sawyerPage, 34),
      },
    );
    await apiCall(sawyerPage, "POST", `/api/v1/yard/listings/${newListingId}/submit`, {});
    await sawyerContext.close();

    // …the desk approves it from the review queue…
    const adminContext = await desktopContext();
    const adminPage = await adminContext.newPage();
    await signIn(adminPage, ADMIN, "/admin");
    await adminPage.goto(`${appUrl}/admin/review`);
    const item = adminPage.locator('[data-test="review-item"]', { hasText: NEW_LISTING_TITLE });
    await expect.poll(() => item.isVisible(), { timeout: 15_000 }).toBe(true);
    await item.locator('[data-test="approve"]').click();
    await expect.poll(() => item.innerText(), { timeout: 15_000 }).toMatch(/Approved/);
    await adminContext.close();

    // …and the homeowner's alert arrives, naming the new slab and linking it.
    const alert = await newestMailTo(HOMEOWNER.email, `New slab for "${SEARCH_NAME}": ${NEW_LISTING_TITLE}`);
    expect(alert.text).toContain(`/slabs/${newListingId}`);
    const unsubscribe = alert.text.match(/https?:\/\/\S+\/saved-searches\/unsubscribe\?token=\S+/)?.[0];
    expect(unsubscribe, alert.text).toBeDefined();

    await page.goto(`${appUrl}/saved-searches`);
    await expect.poll(() => saved.locator('[data-test="saved-search-last-alert"]').innerText(), { timeout: 10_000 }).not.toBe("None yet");
    expect(await saved.locator('[data-test="saved-search-alerts"]').isChecked()).toBe(true);

    // The unsubscribe link works on a phone that has never signed in.
    const stranger = await phoneContext();
    const strangerPage = await stranger.newPage();
    const answer = await strangerPage.goto(unsubscribe!);
    expect(answer?.status()).toBe(200);
    expect(await strangerPage.locator("h1").innerText()).toBe(`Alerts for “${SEARCH_NAME}” are off`);
    await shot(strangerPage, "unsubscribe-390");
    await stranger.close();

    // The saved search stays, with its alerts off.
    await page.reload();
    await expect.poll(() => saved.locator('[data-test="saved-search-alerts"]').isChecked(), { timeout: 10_000 }).toBe(false);
    expect(await saved.locator('[data-test="saved-search-pending"]').innerText()).toBe("Alerts are off");
    expect(problems).toEqual([]);
    await context.close();
  });

  it("shows the buyer tools at phone width: save on the catalogue, saved searches, favourites, the slab page", async () => {
    // Its own buyer with one saved search and one favourite, and its own slab (fixtures.ts).
    const [yard, buyer, desk] = await Promise.all([newSawyer("tools"), newBuyer("maker"), apiSignIn(ADMIN)]);
    const listingId = await liveListing(yard, desk, await photoOfSlab(browser, 30), {
      title: `Red oak dining slab for eight ${Date.now().toString(36)}`,
      speciesSlug: "northern-red-oak",
      lengthMm: 2740,
      widthStationsMm: [1000, 980, 970],
      rateMinor: 190000,
    });
    await buyer.api.call(buyerEndpoints.saveSearch, { body: { name: SEARCH_NAME, query: "seats=8", alerts: true } });
    await buyer.api.call(buyerEndpoints.addFavourite, { params: { listingId } });
    const context = await phoneContext("en-GB");
    const page = await context.newPage();
    const problems = watchForPageErrors(page);
    // Before signing in: the prompts to sign in.
    await openPage(page, `/browse?seats=8`);
    await visible(page, '[data-test="catalogue-card"]');
    await page.locator('[data-test="save-search-open"]').click();
    await visible(page, '[data-test="save-search-sign-in"]');
    await shot(page, "browse-save-sign-in-390");
    await openPage(page, `/slabs/${listingId}`);
    await visible(page, '[data-test="ask-sign-in"]');
    await shot(page, "slab-page-anonymous-390");

    await signIn(page, buyer, "/account");
    await shot(page, "account-buyer-390");
    await page.locator('[data-test="menu-toggle"]').click();
    await visible(page, 'a[href="/saved-searches"]');
    await shot(page, "menu-buyer-390");
    await page.locator('[data-test="menu-toggle"]').click();

    await openPage(page, `/browse?seats=8&species=white-oak,northern-red-oak`);
    await visible(page, '[data-test="catalogue-card"]');
    await page.locator('[data-test="save-search-open"]').click();
    await visible(page, '[data-test="save-search-form"]');
    await shot(page, "browse-save-form-390");

    await page.goto(`${appUrl}/saved-searches`);
    await visible(page, '[data-test="saved-search"]');
    await shot(page, "saved-searches-390");
    // Deleting asks first; "Keep it" keeps it.
    await page.locator('[data-test="saved-search"] [data-test="delete"]').first().click();
    await visible(page, '[data-test="confirm-dialog"]');
    await settled(page); // the dialog has faded in
    await shot(page, "saved-search-delete-390");
    await page.getByRole("button", { name: "Keep it" }).click();
    await expect.poll(() => page.locator('[data-test="saved-search"]').count()).toBe(1);

    await page.goto(`${appUrl}/favourites`);
    await visible(page, '[data-test="favourites"] [data-test="catalogue-card"]');
    await shot(page, "favourites-390");

    await openPage(page, `/slabs/${listingId}`);
    await visible(page, '[data-test="ask-sawyer"]');
    await shot(page, "slab-page-buyer-390");
    expect(problems).toEqual([]);
    await context.close();
  });

  it("shows the empty states to a buyer who has saved nothing", async () => {
    for (const name of ["390", "1280"] as const) {
      const context = name === "390" ? await phoneContext("en-GB") : await desktopContext("en-GB");
      const page = await context.newPage();
      await signIn(page, SHOP, "/account");
      for (const [path, selector, screen] of [
        ["/saved-searches", '[data-test="saved-searches-empty"]', "saved-searches-empty"],
        ["/favourites", '[data-test="favourites-empty"]', "favourites-empty"],
        ["/messages", '[data-test="messages-empty"]', "messages-empty"],
      ] as const) {
        await page.goto(`${appUrl}${path}`);
        await visible(page, selector);
        await shot(page, `${screen}-${name}`);
      }
      await context.close();
    }
  });
});

describe("asking the sawyer", () => {
  it("a buyer asks about the new slab, the sawyer answers from a phone, and both get an e-mail notice", async () => {
    const [yard, homeowner, desk] = await Promise.all([newSawyer("ridge"), newBuyer("homeowner"), apiSignIn(ADMIN)]);
    const title = `White oak dining slab, seats eight ${Date.now().toString(36)}`;
    const listingId = await liveListing(yard, desk, await photoOfSlab(browser, 35), {
      title,
      speciesSlug: "white-oak",
      lengthMm: 2740,
      widthStationsMm: [990, 960, 940],
      rateMinor: 210000,
    });
    const buyerContext = await desktopContext();
    const buyer = await buyerContext.newPage();
    const buyerProblems = watchForPageErrors(buyer);
    await signIn(buyer, homeowner, "/account");
    await openPage(buyer, `/slabs/${listingId}`);
    await visible(buyer, '[data-test="ask-sawyer"]');
    await buyer
      .locator('[data-test="ask-body"]')
      .fill("Hello! Is it flat enough to use as a dining top as it is, and could we pick it up on a Saturday?");
    await buyer.locator('[data-test="ask-send"]').click();
    await expect.poll(() => buyer.locator('[data-test="ask-sent"]').innerText(), { timeout: 10_000 }).toContain(`Sent to ${yard.yardName}`);
    await shot(buyer, "slab-page-asked-1280");

    // The sawyer's notice links the conversation.
    const notice = await newestMailTo(yard.email, `New message about "${title}" from ${homeowner.displayName}`);
    expect(notice.text).toContain("Is it flat enough");
    const threadLink = notice.text.match(/https?:\/\/\S+\/messages\/[0-9a-f-]{36}/)?.[0];
    expect(threadLink, notice.text).toBeDefined();

    // The sawyer, in the yard, on a phone: the badge on the menu, the inbox, the thread.
    const sawyerContext = await phoneContext("en-GB");
    const sawyer = await sawyerContext.newPage();
    const sawyerProblems = watchForPageErrors(sawyer);
    await signIn(sawyer, yard, "/yard");
    await expect.poll(() => sawyer.locator('[data-test="menu-unread"]').innerText(), { timeout: 10_000 }).toMatch(/^1/);
    await sawyer.locator('[data-test="menu-toggle"]').click();
    await shot(sawyer, "menu-sawyer-390");
    await sawyer.locator('[data-test="nav-messages"]').click();
    await sawyer.waitForURL(`${appUrl}/messages`);
    const thread = sawyer.locator('[data-test="thread"]', { hasText: title });
    await expect.poll(() => thread.isVisible(), { timeout: 10_000 }).toBe(true);
    expect(await thread.locator('[data-test="thread-unread"]').innerText()).toMatch(/^1/);
    await shot(sawyer, "messages-sawyer-390");
    await sawyer.goto(threadLink!);
    await visible(sawyer, '[data-test="message"]');
    expect(await sawyer.locator('[data-test="thread-with"]').innerText()).toBe(homeowner.displayName);
    // Opened: nothing unread any more.
    await expect.poll(() => sawyer.locator('[data-test="menu-unread"]').count(), { timeout: 10_000 }).toBe(0);
    await sawyer
      .locator('[data-test="reply-box"]')
      .fill(
        "Yes, it's flattened on both faces and has been through the kiln. Saturday from 9 works; it's heavy, so bring two helpers or a trolley.",
      );
    await shot(sawyer, "thread-sawyer-typing-390");
    await sawyer.locator('[data-test="send"]').click();
    await expect.poll(() => sawyer.locator('[data-test="message"]').count(), { timeout: 10_000 }).toBe(2);
    expect(await sawyer.locator('[data-test="reply-box"]').inputValue()).toBe("");
    // The send box stays on screen at phone size.
    const box = await sawyer.locator('[data-test="send-form"]').boundingBox();
    expect(box && box.y + box.height).toBeLessThanOrEqual(phone.height + 1);
    await shot(sawyer, "thread-sawyer-390");

    // The buyer's notice, and the answer arrives on the buyer's open thread by polling.
    const reply = await newestMailTo(homeowner.email, `New message about "${title}" from ${yard.displayName} (${yard.yardName})`);
    expect(reply.text).toContain("Saturday from 9 works");
    await buyer.goto(`${appUrl}/messages`);
    await expect.poll(() => buyer.locator('[data-test="unread-badge"]').innerText(), { timeout: 40_000 }).toMatch(/^1/);
    await shot(buyer, "messages-buyer-1280");
    await buyer.locator('[data-test="thread"]', { hasText: title }).click();
    await expect.poll(() => buyer.locator('[data-test="message"]').count(), { timeout: 10_000 }).toBe(2);
    await shot(buyer, "thread-buyer-1280");
    // Polling: a second answer shows up without a reload.
    await sawyer.locator('[data-test="reply-box"]').fill("I'll put it on the trestles by the gate for you.");
    await sawyer.locator('[data-test="send"]').click();
    await expect.poll(() => buyer.locator('[data-test="message"]').count(), { timeout: 15_000 }).toBe(3);

    // The sawyer's own listing has no "Ask the sawyer" once the page knows who is signed in (the
    // server renders every page as for anyone; the signed-in parts follow in the browser).
    await openPage(sawyer, `/slabs/${listingId}`);
    await visible(sawyer, '[data-test="slab-weight"]');
    await expect.poll(() => sawyer.locator('[data-test="ask-sawyer"]').count(), { timeout: 10_000 }).toBe(0);

    // The inbox and thread at desktop size for the sawyer, and at phone size for the buyer.
    const sawyerDesk = await desktopContext("en-GB");
    const sawyerAtDesk = await sawyerDesk.newPage();
    await signIn(sawyerAtDesk, yard, "/yard");
    await sawyerAtDesk.goto(`${appUrl}/messages`);
    await visible(sawyerAtDesk, '[data-test="thread"]');
    await shot(sawyerAtDesk, "messages-sawyer-1280");
    await sawyerAtDesk.locator('[data-test="thread"]', { hasText: title }).click();
    await expect.poll(() => sawyerAtDesk.locator('[data-test="message"]').count(), { timeout: 10_000 }).toBe(3);
    await shot(sawyerAtDesk, "thread-sawyer-1280");
    await sawyerDesk.close();

    const buyerPhone = await phoneContext();
    const buyerOnPhone = await buyerPhone.newPage();
    await signIn(buyerOnPhone, homeowner, "/account");
    await buyerOnPhone.goto(buyer.url());
    await expect.poll(() => buyerOnPhone.locator('[data-test="message"]').count(), { timeout: 10_000 }).toBe(3);
    await shot(buyerOnPhone, "thread-buyer-390");
    await buyerOnPhone.goto(`${appUrl}/messages`);
    await visible(buyerOnPhone, '[data-test="thread"]');
    await shot(buyerOnPhone, "messages-buyer-390");
    await buyerPhone.close();

    expect(buyerProblems).toEqual([]);
    expect(sawyerProblems).toEqual([]);
    await sawyerContext.close();
    await buyerContext.close();
  });
});
