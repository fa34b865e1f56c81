import type { DataSource, EntityManager } from "typeorm";
import type { AppConfig } from "../config.ts";
import { createDomainEvents } from "../events.ts";
import type { MailQueue } from "../services/mail-outbox.ts";
import { createPayments } from "../integrations/payments-stripe.ts";
import { createPhotoStorage } from "../integrations/storage.ts";
import { createLogger } from "../logger.ts";
import { seedLakemont } from "../seed/lakemont.ts";
import { seedLakemontOffers } from "../seed/lakemont-offers.ts";
import { seedLakemontSales } from "../seed/lakemont-sales.ts";
import { seedLakemontYards } from "../seed/lakemont-yard.ts";
import { createAccountModeration } from "../services/account-moderation.ts";
import { createCatalogueService } from "../services/catalogue-service.ts";
import { createCheckoutService } from "../services/checkout-service.ts";
import { createOfferService } from "../services/offer-service.ts";
import { createOrderReviewService } from "../services/order-review-service.ts";
import { createOrderService } from "../services/order-service.ts";
import { createPayoutService } from "../services/payout-service.ts";
import { storeSeedPhoto } from "../services/photo-service.ts";
import { createRefundService } from "../services/refund-service.ts";
import { createReportService } from "../services/report-service.ts";
import { createSettingsService } from "../services/settings-service.ts";

/** The seed sends no e-mail: its orders and reviews are history, not news (nothing goes into the outbox). */
const quietMail: MailQueue = { queue: async () => undefined };

export interface DemoSeedSummary {
  accounts: number;
  logs: number;
  listings: number;
  photos: number;
  orders: number;
  reviews: number;
  payouts: number;
  /** Offers waiting in the yards (made through the offer service). */
  offers: number;
  seconds: number;
  /** Of which painting and storing the stock's photos and adding the stock, and making the sales. */
  stockSeconds: number;
  salesSeconds: number;
  /** Sales that could not be made (the payments provider down, say), with why. */
  skipped: string[];
}

/**
 * The Lakemont demo, whatever of it is missing: accounts, the yards' stock with painted photos
 * through the photo pipeline (live listings enter the catalogue), then the sales of what was just
 * added, through the real checkout, order, review and payout services against the configured
 * payments provider (the payments fake locally).
 */
export async function seedDemo(dataSource: DataSource, config: AppConfig): Promise<DemoSeedSummary> {
  const started = Date.now();
  const now = new Date();
  const { created } = await seedLakemont(dataSource, config.bcryptCost);
  const storage = createPhotoStorage(config.storage);
  const catalogue = createCatalogueService({ dataSource, cursorSecret: config.sessionSecret, cache: false });
  const onListingChanged = (manager: EntityManager, listingId: string) => catalogue.refreshEntry(manager, listingId);
  // The catalogue follows the sales' listings and the reviews' ratings as in the API (no saved-search alerts: no e-mail).
  const events = createDomainEvents();
  events.on("listingChanged", ({ manager, listingId }) => onListingChanged(manager, listingId));
  events.on("yardRatingChanged", ({ manager, sawyerId }) => catalogue.refreshYardRating(manager, sawyerId));
  try {
    const stock = await seedLakemontYards(dataSource, {
      photos: (listingId, position, bytes, altText) => storeSeedPhoto(storage, listingId, position, bytes, altText),
      onLive: onListingChanged,
      now,
    });
    const stockDone = Date.now();
    const sales = { orders: 0, reviews: 0, payouts: 0, offers: 0, skipped: [] as string[] };
    if (stock.sales.length) {
      let clock = now;
      const at = () => clock;
      const log = createLogger("warn");
      // Fees, hold days and the reservation time as the marketplace has them now.
      const settings = createSettingsService({ dataSource, config });
      await settings.ensureFresh();
      // The services run on a clock moved into the past, but the provider's hosted page keeps real time and
      // refuses a page whose closing time has passed: the seed's pages close an hour from now instead.
      const provider = createPayments(config.payments);
      const payments: typeof provider = {
        ...provider,
        startCheckout: (input) => provider.startCheckout({ ...input, expiresAt: new Date(Date.now() + 60 * 60_000) }),
      };
      const refunds = createRefundService({ dataSource, payments, log, now: at });
      const payouts = createPayoutService({
        dataSource,
        payments,
        refunds,
        mail: quietMail,
        config,
        holdDays: () => settings.current().holdDays,
        log,
        now: at,
      });
      const checkout = createCheckoutService({
        dataSource,
        payments,
        refunds,
        mail: quietMail,
        config: { publicUrl: config.publicUrl, checkout: settings.checkoutConfig() },
        log,
        now: at,
        events,
        onAccountUpdated: (account, manager) => payouts.recordAccount(account, manager),
      });
      const orders = createOrderService({ dataSource, refunds, mail: quietMail, config, log, now: at, events });
      const reviews = createOrderReviewService({
        dataSource,
        mail: quietMail,
        config,
        now: at,
        events,
      });
      const moderation = createAccountModeration({ dataSource, mail: quietMail, config, now: at, events });
      const reports = createReportService({ dataSource, mail: quietMail, config, moderation, reviews, now: at, events });
      try {
        Object.assign(
          sales,
          await seedLakemontSales(
            dataSource,
            {
              checkout,
              orders,
              reviews,
              reports,
              payouts,
              setClock: (date) => (clock = date),
              autoCompleteDays: config.checkout.autoCompleteDays,
            },
            stock.sales,
            now,
          ),
        );
      } catch (error) {
        sales.skipped.push(`the demo's sales stopped: ${(error as Error).message}`);
      }
      // Offers waiting now (on today's clock, so they have their 48 hours ahead of them).
      const offers = createOfferService({ dataSource, checkout, mail: quietMail, config, fees: () => settings.fees(), log });
      try {
        sales.offers = await seedLakemontOffers(dataSource, offers, stock.listingIds);
      } catch (error) {
        sales.skipped.push(`the demo's offers stopped: ${(error as Error).message}`);
      }
    }
    return {
      accounts: created,
      logs: stock.logs,
      listings: stock.listings,
      photos: stock.photos,
      ...sales,
      seconds: (Date.now() - started) / 1000,
      stockSeconds: (stockDone - started) / 1000,
      salesSeconds: (Date.now() - stockDone) / 1000,
    };
  } finally {
    storage.close();
  }
}

/** One line for the console: what the seed added and how long it took. */
export function describeSeed(summary: DemoSeedSummary): string {
  const added = [
    `${summary.accounts} demo account(s)`,
    `${summary.logs} log(s)`,
    `${summary.listings} listing(s) with ${summary.photos} painted photo(s)`,
    `${summary.orders} order(s)`,
    `${summary.reviews} review(s)`,
    `${summary.payouts} payout(s)`,
    `${summary.offers} offer(s)`,
  ];
  return `demo data: added ${added.join(", ")} in ${summary.seconds.toFixed(1)} s (stock ${summary.stockSeconds.toFixed(1)} s, sales ${summary.salesSeconds.toFixed(1)} s)${summary.skipped.length ? `; not done: ${summary.skipped.join("; ")}` : ""}`;
}
