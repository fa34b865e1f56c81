import type { Browser, Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import {
  DEMO_ADMIN,
  appJson,
  appUrl,
  desktop,
  launchChromium,
  phone,
  screenshot,
  settled,
  watchForPageErrors,
  signIn,
  mailArrives,
  openPage,
} from "./browser.ts";
import { apiSignIn, liveListing, newBuyer, newSawyer, slabPhoto } from "./fixtures.ts";

/*
 * Paying a sawyer, end to end in Chromium: a new sawyer (fixtures.ts) sets up payouts on the
 * payments fake's hosted page, a new buyer pays for its bookmatched walnut pair with the test card,
 * the sawyer ships and hands it over, the API's test clock moves past the hold, the admin approves
 * the payout on the desk and the sawyer sees it paid. Then the admin gives a partial dispute refund
 * on the order. The test makes everything it uses, so it can run again on the same stack.
 */
const DESK = DEMO_ADMIN;
const WALNUT_PAIR = `Bookmatched black walnut pair with crotch figure ${Date.now().toString(36)}`;

let browser: Browser;
beforeAll(async () => {
  browser = await launchChromium();
});
afterAll(async () => {
  // Later suites see the real time again.
  await appJson("/api/_test/clock", { method: "POST", body: { reset: true } }).catch(() => undefined);
  await browser?.close();
});

/**
 * The same screen at the phone and the desktop size (the page is left at `finish`). Whole pages
 * from the top (the sticky top bar stays where it belongs); an open dialog as the screen shows it.
 */
async function bothSizes(page: Page, name: string, finish: { width: number; height: number } = phone, dialog = false) {
  for (const [size, suffix] of [
    [phone, "390"],
    [desktop, "1280"],
  ] as const) {
    await page.setViewportSize(size);
    if (!dialog) await page.evaluate(() => window.scrollTo(0, 0));
    await settled(page);
    await screenshot(page, `${name}-${suffix}`, { fullPage: !dialog });
  }
  await page.setViewportSize(finish);
}

/** What a page's body is wider than its viewport by (0 when nothing sticks out sideways). */
const overflowX = (page: Page) => page.evaluate(() => document.documentElement.scrollWidth - window.innerWidth);

describe("payouts", () => {
  it("a sawyer sets up payouts, sells, hands over; after the hold the admin approves and the sawyer sees it paid; the admin refunds part of the order", async () => {
    const [kiln, designer, deskApi] = await Promise.all([newSawyer("kiln"), newBuyer("designer"), apiSignIn(DESK)]);
    const listingId = await liveListing(kiln, deskApi, await slabPhoto(browser, 20), {
      title: WALNUT_PAIR,
      speciesSlug: "black-walnut",
      slabs: 2,
      setKind: "bookmatched",
      widthStationsMm: [480, 460, 450],
      rateMinor: 360000,
    });
    const yardName = kiln.yardName;

    // The sawyer, on a phone: no payout account yet.
    const sawyerContext = await browser.newContext({ viewport: phone, deviceScaleFactor: 2, hasTouch: true, locale: "en-US" });
    const sawyer = await sawyerContext.newPage();
    const sawyerProblems = watchForPageErrors(sawyer);
    await signIn(sawyer, kiln);
    await sawyer.goto(`${appUrl}/yard`);
    await sawyer.locator('[data-test="payouts-link"]').click();
    await sawyer.waitForURL(`${appUrl}/yard/payouts`);
    await expect.poll(() => sawyer.locator('[data-test="account-state"]').innerText(), { timeout: 15_000 }).toBe("Not set up");
    expect(await sawyer.locator('[data-test="blocked-reason"]').innerText()).toMatch(/Set up a payout account/);
    expect(await sawyer.locator('[data-test="hold-explanation"]').innerText()).toMatch(/for 7 days more/);
    expect(await overflowX(sawyer)).toBeLessThanOrEqual(0);
    await bothSizes(sawyer, "payouts-not-set-up");

    // Through the fake's hosted set-up and back; the page checks with the provider on its return.
    await sawyer.locator('[data-test="start-setup"]').click();
    await sawyer.waitForURL(/\/onboard\/acct_/, { timeout: 15_000 });
    await sawyer.locator('[data-test="finish-onboarding"]').click();
    await sawyer.waitForURL((url) => url.pathname === "/yard/payouts", { timeout: 15_000 });
    await expect.poll(() => sawyer.locator('[data-test="setup-confirmed"]').isVisible(), { timeout: 15_000 }).toBe(true);
    expect(await sawyer.locator('[data-test="account-state"]').innerText()).toBe("Ready to receive money");
    expect(await sawyer.locator('[data-test="start-setup"]').count()).toBe(0);
    await expect.poll(() => new URL(sawyer.url()).search).toBe("");
    await bothSizes(sawyer, "payouts-ready");

    // A buyer pays for the walnut pair with the test card (freight).
    const buyerContext = await browser.newContext({ viewport: desktop, locale: "en-US" });
    const buyer = await buyerContext.newPage();
    const buyerProblems = watchForPageErrors(buyer);
    await signIn(buyer, designer);
    await openPage(buyer, `/slabs/${listingId}`);
    await expect.poll(() => buyer.locator('[data-test="buy"]').isVisible(), { timeout: 15_000 }).toBe(true);
    await buyer.locator('[data-test="handover-freight"]').check({ force: true });
    await buyer.locator('[data-test="delivery-address"]').fill("Calloway Interiors\n8 Lantern Quay, studio 3\nLakemont");
    await expect.poll(() => buyer.locator('[data-test="pay-now"]').innerText(), { timeout: 15_000 }).toMatch(/\$\d/);
    await buyer.locator('[data-test="buy"]').click();
    await buyer.waitForURL(/\/pay\/cs_/, { timeout: 15_000 });
    await buyer.locator("#card").fill("4242 4242 4242 4242");
    await buyer.locator("#expiry").fill("12 / 34");
    await buyer.locator("#cvc").fill("123");
    await buyer.locator('[data-test="pay"]').click();
    await buyer.waitForURL(/\/orders\/[0-9a-f-]{36}\?paid=1/, { timeout: 15_000 });
    const orderId = new URL(buyer.url()).pathname.split("/").at(-1)!;
    await expect.poll(() => buyer.locator('[data-test="order-status"]').innerText(), { timeout: 20_000 }).toBe("Paid");

    // The sawyer ships it and marks it handed over.
    await sawyer.goto(`${appUrl}/orders/${orderId}`);
    await expect.poll(() => sawyer.locator('[data-test="shipment-form"]').isVisible(), { timeout: 15_000 }).toBe(true);
    const net = await sawyer.locator('[data-test="sawyer-net"]').innerText();
    expect(net).toMatch(/^\$[\d,]+\.\d\d$/);
    await sawyer.locator('[data-test="carrier"]').fill("Lakeshore Freight Lines");
    await sawyer.locator('[data-test="tracking"]').fill("LFL-204917");
    await sawyer.locator('[data-test="mark-shipped"]').click();
    await expect.poll(() => sawyer.locator('[data-test="order-status"]').innerText(), { timeout: 15_000 }).toBe("Shipped");
    await sawyer.locator('[data-test="mark-handed-over"]').click();
    await sawyer.locator('[data-test="confirm"]').click();
    await expect.poll(() => sawyer.locator('[data-test="order-status"]').innerText(), { timeout: 15_000 }).toBe("Handed over");

    // Inside the hold it is pending, and nothing of this yard's is due on the desk.
    await sawyer.goto(`${appUrl}/yard/payouts`);
    await expect.poll(() => sawyer.locator('[data-test="balance-pending"]').innerText(), { timeout: 15_000 }).toBe(net);
    expect(await sawyer.locator('[data-test="balance-available"]').innerText()).toBe("$0.00");
    await bothSizes(sawyer, "payouts-pending");

    const deskContext = await browser.newContext({ viewport: desktop, locale: "en-US" });
    const desk = await deskContext.newPage();
    const deskProblems = watchForPageErrors(desk);
    await signIn(desk, DESK);
    await desk.goto(`${appUrl}/admin`);
    await desk.locator('[data-test="payouts-link"]').click();
    await desk.waitForURL(`${appUrl}/admin/payouts`);
    await expect.poll(() => desk.locator('[data-test="payouts-desk"]').innerText(), { timeout: 15_000 }).toMatch(/Sent and tried/);
    await expect.poll(() => desk.locator(".n-skeleton").count(), { timeout: 15_000 }).toBe(0);
    expect(await desk.locator('[data-test="payouts-desk"]').innerText()).not.toContain(yardName);

    // Past the 7-day hold: the API's test clock moves forward (NODE_ENV=test and GRAINYARD_TEST_CLOCK=1 only).
    const moved = await appJson("/api/_test/clock", { method: "POST", body: { advanceDays: 8 } });
    expect(moved.status).toBe(200);

    await desk.reload();
    const row = desk.locator('[data-test="due-list"] > li', { hasText: yardName });
    await expect.poll(() => row.count(), { timeout: 15_000 }).toBe(1);
    expect(await row.locator('[data-test="due-amount"]').innerText()).toBe(net);
    await row.locator("summary").click();
    expect(await row.locator('[data-test="payout-lines"]').innerText()).toContain(WALNUT_PAIR);
    await bothSizes(desk, "admin-payouts-due", desktop);
    expect(await overflowX(desk)).toBeLessThanOrEqual(0);

    await row.locator('[data-test="approve-one"]').click();
    await expect
      .poll(() => desk.locator('[data-test="confirm-recipient"]').innerText())
      .toMatch(new RegExp(`${net.replace(/[$.]/g, "\\$&")} goes to the payout account of ${yardName}`));
    await bothSizes(desk, "admin-payouts-confirm", desktop, true);
    await desk.locator('[data-test="confirm"]').click();
    await expect
      .poll(() => desk.locator('[data-test="desk-notice"]').innerText(), { timeout: 15_000 })
      .toContain(`Sent ${net} to ${yardName}`);
    await expect
      .poll(() =>
        desk.locator('[data-test="recent-list"] > li', { hasText: yardName }).locator('[data-test="recent-status"]').first().innerText(),
      )
      .toBe("Paid out");
    await expect.poll(() => desk.locator('[data-test="due-list"] > li', { hasText: yardName }).count()).toBe(0);
    await desk.locator("label.chip", { has: desk.locator('[data-test="filter-sent"]') }).click();
    await expect.poll(() => desk.locator('[data-test="filter-sent"]').isChecked()).toBe(true);
    await expect.poll(() => desk.locator('[data-test="recent-list"]').innerText(), { timeout: 15_000 }).toContain(yardName);
    await bothSizes(desk, "admin-payouts-sent", desktop);
    await mailArrives(kiln.email, new RegExp(`^Grainyard sent you ${net.replace(/[$.]/g, "\\$&")}`));

    // The sawyer, on the phone, sees it paid with the order it covers.
    await sawyer.setViewportSize(phone);
    await sawyer.goto(`${appUrl}/yard/payouts`);
    await expect.poll(() => sawyer.locator('[data-test="payout-status"]').first().innerText(), { timeout: 15_000 }).toBe("Paid out");
    expect(await sawyer.locator('[data-test="balance-paid"]').innerText()).toBe(net);
    expect(await sawyer.locator('[data-test="balance-pending"]').innerText()).toBe("$0.00");
    await sawyer.locator('[data-test="payout-list"] summary').first().click();
    expect(await sawyer.locator('[data-test="payout-lines"]').first().innerText()).toContain(WALNUT_PAIR);
    expect(await overflowX(sawyer)).toBeLessThanOrEqual(0);
    await bothSizes(sawyer, "payouts-paid");
    const statement = await sawyer.evaluate(async () => (await fetch("/api/v1/yard/payouts/statement.csv")).text());
    expect(statement).toMatch(/paid out to you/);

    // A dispute: the admin refunds part of the order from its page; both parties are e-mailed.
    await desk.goto(`${appUrl}/orders/${orderId}`);
    const refund = desk.locator('[data-test="dispute-refund"]');
    await expect.poll(() => refund.locator('[data-test="refund-amount"]').isVisible(), { timeout: 15_000 }).toBe(true);
    const total = (await desk.locator('[data-test="order-total"]').innerText()).trim();
    expect(await refund.locator('[data-test="refund-amount"]').inputValue()).toBe(total.replace(/[$,]/g, ""));
    await refund.locator('[data-test="refund-amount"]').fill("150");
    await refund.locator('[data-test="refund-reason"]').fill("A crack under the crotch figure was not shown in the photos.");
    await refund.locator('[data-test="refund-start"]').click();
    await expect
      .poll(() => desk.locator('[data-test="refund-confirm-text"]').innerText())
      .toMatch(/Part of what the buyer paid.*\$150\.00.*buyer and the sawyer both get an e-mail/s);
    await bothSizes(desk, "order-dispute-refund-confirm", desktop, true);
    await desk.locator('[data-test="confirm"]').click();
    await expect
      .poll(() => refund.locator('[data-test="refund-result"]').innerText(), { timeout: 15_000 })
      .toMatch(/\$150\.00 of .* is left/);
    await bothSizes(desk, "order-dispute-refund-done", desktop);
    await mailArrives(designer.email, /^Partial refund on/);
    await mailArrives(kiln.email, /^Partial refund on/);

    expect([...sawyerProblems, ...buyerProblems, ...deskProblems]).toEqual([]);
    await Promise.all([sawyerContext.close(), buyerContext.close(), deskContext.close()]);
  });
});
