import compression from "compression";
import cookieSession from "cookie-session";
import express, { type NextFunction, type Request, type Response } from "express";
import helmet from "helmet";
import type { DataSource } from "typeorm";
import { endpointTable } from "@grainyard/contracts";
import type { AppConfig } from "./config.ts";
import { accessLog } from "./http/access-log.ts";
import { apiNotFound, errorHandler } from "./http/errors.ts";
import { sessionOf } from "./http/context.ts";
import { createRateLimits } from "./http/rate-limits.ts";
import type { Mailer } from "./integrations/mail.ts";
import type { PaymentsPort } from "./integrations/payments.ts";
import type { PhotoStorage } from "./integrations/storage.ts";
import type { Logger } from "./logger.ts";
import { accountHandlers } from "./routes/account-routes.ts";
import { secondFactorHandlers } from "./routes/second-factor-routes.ts";
import { createSecondFactorService } from "./services/second-factor-service.ts";
import { healthHandlers } from "./routes/health-routes.ts";
import { listingHandlers, reviewHandlers } from "./routes/listing-routes.ts";
import { createLogPhotoService, createPhotoService } from "./services/photo-service.ts";
import { yardHandlers } from "./routes/yard-routes.ts";
import { catalogueHandlers } from "./routes/catalogue-routes.ts";
import { orderHandlers } from "./routes/order-routes.ts";
import { createCheckoutService } from "./services/checkout-service.ts";
import { createOrderService } from "./services/order-service.ts";
import { createRefundService } from "./services/refund-service.ts";
import { createAccountService, SESSION_DAYS } from "./services/account-service.ts";
import { createCatalogueService } from "./services/catalogue-service.ts";
import { createInventoryCsv } from "./services/inventory-csv.ts";
import { createListingService } from "./services/listing-service.ts";
import { createYardService } from "./services/yard-service.ts";
import { buyerHandlers } from "./routes/buyer-routes.ts";
import { messageHandlers } from "./routes/message-routes.ts";
import { createDomainEvents } from "./events.ts";
import { createSharedInvalidation } from "./jobs/shared-invalidation.ts";
import { createReplicaReads } from "./db/read-replica.ts";
import { createHealthService } from "./services/health-service.ts";
import { createBackgroundWork } from "./services/background-work.ts";
import { createMailOutbox } from "./services/mail-outbox.ts";
import { createFavouriteService } from "./services/favourite-service.ts";
import { createMessageService } from "./services/message-service.ts";
import { createSavedSearchService } from "./services/saved-search-service.ts";
import { adminHandlers, reportHandlers } from "./routes/admin-routes.ts";
import { payoutHandlers } from "./routes/payout-routes.ts";
import { createPayoutService } from "./services/payout-service.ts";
import { createAccountModeration } from "./services/account-moderation.ts";
import { createAuditService } from "./services/audit-log.ts";
import { createDashboardService } from "./services/dashboard-service.ts";
import { createReportService } from "./services/report-service.ts";
import { createOrderProblemService } from "./services/order-problem-service.ts";
import { createOrderReviewService } from "./services/order-review-service.ts";
import { createYardPageService } from "./services/yard-page-service.ts";
import { yardPageHandlers } from "./routes/yard-page-routes.ts";
import { orderReviewHandlers } from "./routes/order-review-routes.ts";
import { offerHandlers } from "./routes/offer-routes.ts";
import { createOfferService } from "./services/offer-service.ts";
import { createSettingsService } from "./services/settings-service.ts";
import { movableClock, testClockHandlers } from "./routes/test-clock-routes.ts";
import { mountEndpoints, rowsOf, type Handlers, type MountOptions } from "./http/endpoints.ts";
import { MAX_PHOTO_BYTES } from "./photos/index.ts";
import { webApp } from "./web/web-app.ts";

export interface AppDependencies {
  config: AppConfig;
  dataSource: DataSource;
  mailer: Mailer;
  storage: PhotoStorage;
  payments: PaymentsPort;
  logger: Logger;
  now?: () => Date;
}

export function createApp(appDeps: AppDependencies) {
  // The end-to-end suite's movable clock (NODE_ENV=test with GRAINYARD_TEST_CLOCK=1 only): every service reads it.
  const testClock = appDeps.config.testClock && appDeps.config.environment === "test" ? movableClock(appDeps.now) : null;
  const deps: AppDependencies = testClock ? { ...appDeps, now: testClock.now } : appDeps;
  const { config, logger } = deps;
  const production = config.environment === "production";
  const app = express();
  app.disable("x-powered-by");
  app.set("trust proxy", config.trustProxy ?? (production ? 1 : false));

  // Which API instance answered (behind the load balancer several do): on every answer, errors included.
  app.use((_req: Request, res: Response, next: NextFunction) => {
    res.setHeader("x-grainyard-instance", config.instanceName);
    next();
  });
  app.use(accessLog(logger));

  // Only our own origin, everywhere. Naive UI writes its styles into <style> tags at run time,
  // hence 'unsafe-inline' for styles only; scripts must come from our own files.
  app.use(
    helmet({
      contentSecurityPolicy: {
        useDefaults: false,
        directives: {
          defaultSrc: ["'self'"],
          scriptSrc: ["'self'"],
          styleSrc: ["'self'", "'unsafe-inline'"],
          imgSrc: ["'self'", "data:", "blob:"],
          fontSrc: ["'self'", "data:"],
          connectSrc: ["'self'"],
          formAction: ["'self'"],
          frameAncestors: ["'none'"],
          objectSrc: ["'none'"],
          baseUri: ["'self'"],
          ...(production ? { upgradeInsecureRequests: [] } : {}),
        },
      },
      strictTransportSecurity: production,
    }),
  );

  // The catalogue search, visitors' slab pages, yard pages and sitemaps read from a MariaDB read replica
  // when one is configured (DATABASE_REPLICA_HOST); every write and every other read goes to the primary.
  const reads = createReplicaReads(deps.dataSource, logger);
  const catalogue = createCatalogueService({
    dataSource: deps.dataSource,
    cursorSecret: config.sessionSecret,
    cache: config.catalogueCache,
    reads,
  });
  // Admin-editable settings (fees, reservation minutes, tax, hold days) from the database, with the env values as defaults.
  const settings = createSettingsService({ dataSource: deps.dataSource, config, now: deps.now });
  void settings.ensureFresh().catch((error) => logger.error({ err: error }, "could not read marketplace settings"));
  const events = createDomainEvents();
  // Work that runs after the answer: first delivery attempts of new e-mails, and the steps whose timing must not tell whether an address has an account.
  const background = createBackgroundWork(logger);
  // Every e-mail is written into the outbox in the transaction that causes it; delivered after the commit, retried by the outbox job.
  const outbox = createMailOutbox({
    dataSource: deps.dataSource,
    mailer: deps.mailer,
    background,
    settings: config.outbox,
    log: logger,
    now: deps.now,
  });
  // Every refund (late payments, cancellations, disputes) goes through one service.
  const refunds = createRefundService({ dataSource: deps.dataSource, payments: deps.payments, log: logger, now: deps.now });
  const checkout = createCheckoutService({
    dataSource: deps.dataSource,
    payments: deps.payments,
    refunds,
    mail: outbox,
    // Reservation minutes and tax come from the settings table, read fresh per request.
    config: {
      publicUrl: config.publicUrl,
      get checkout() {
        return settings.checkoutConfig();
      },
    },
    log: logger,
    now: deps.now,
    events,
    onAccountUpdated: (account, manager) => payouts.recordAccount(account, manager),
  });
  const payouts = createPayoutService({
    dataSource: deps.dataSource,
    payments: deps.payments,
    refunds,
    mail: outbox,
    config,
    holdDays: () => settings.current().holdDays,
    log: logger,
    now: deps.now,
  });
  const orders = createOrderService({
    dataSource: deps.dataSource,
    refunds,
    mail: outbox,
    config,
    log: logger,
    now: deps.now,
    events,
  });
  // Problems buyers report after hand-over, settled on the desk through the refund service.
  const problems = createOrderProblemService({ dataSource: deps.dataSource, refunds, mail: outbox, config, now: deps.now });
  const listings = createListingService({
    dataSource: deps.dataSource,
    mail: outbox,
    config,
    log: logger,
    now: deps.now,
    events,
    settings,
  });
  // Sign-in and reset limits in MariaDB, shared by every API instance (rate-limiter-flexible).
  const rateLimits = createRateLimits({ limits: config.limits, dataSource: deps.dataSource, log: logger });
  // Codes follow the real clock of the phone that shows them (or a test's injected clock), never the end-to-end stack's movable one.
  const secondFactor = createSecondFactorService({ dataSource: deps.dataSource, mail: outbox, config, now: appDeps.now });
  const accounts = createAccountService({
    dataSource: deps.dataSource,
    mail: outbox,
    config,
    log: logger,
    background,
    notices: rateLimits.notices,
    now: deps.now,
    events,
    secondFactor,
  });
  const yard = createYardService({
    dataSource: deps.dataSource,
    events,
  });
  const inventoryCsv = createInventoryCsv({ dataSource: deps.dataSource, yard });
  const photos = createPhotoService({ dataSource: deps.dataSource, storage: deps.storage });
  const logPhotos = createLogPhotoService({ dataSource: deps.dataSource, storage: deps.storage });
  const savedSearches = createSavedSearchService({
    dataSource: deps.dataSource,
    mail: outbox,
    catalogue,
    config,
    log: logger,
    now: deps.now,
  });
  const favourites = createFavouriteService({ dataSource: deps.dataSource, now: deps.now });
  const messages = createMessageService({ dataSource: deps.dataSource, mail: outbox, config, now: deps.now });
  const audit = createAuditService({ dataSource: deps.dataSource });
  const moderation = createAccountModeration({
    dataSource: deps.dataSource,
    mail: outbox,
    config,
    now: deps.now,
    events,
  });
  const orderReviews = createOrderReviewService({
    dataSource: deps.dataSource,
    mail: outbox,
    config,
    now: deps.now,
    events,
  });
  const offers = createOfferService({
    dataSource: deps.dataSource,
    checkout,
    mail: outbox,
    config,
    fees: () => settings.fees(),
    log: logger,
    now: deps.now,
  });
  const reports = createReportService({
    dataSource: deps.dataSource,
    mail: outbox,
    config,
    moderation,
    reviews: orderReviews,
    now: deps.now,
    events,
  });
  const dashboard = createDashboardService({
    dataSource: deps.dataSource,
    now: deps.now,
    openReports: () => reports.openCount(),
    suspendedUsers: () => moderation.suspendedCount(),
  });

  // Who acts on what: the catalogue follows listings, listings follow yards and slabs, alerts follow new live listings.
  events.on("listingChanged", ({ manager, listingId }) => catalogue.refreshEntry(manager, listingId));
  events.on("yardChanged", ({ manager, sawyerId }) => listings.refreshAllOfSawyer(manager, sawyerId));
  events.on("slabFiguresChanged", ({ manager, slabIds }) => listings.refreshListingsOfSlabs(manager, slabIds));
  events.on("listingLive", ({ listingId }) => savedSearches.onListingLive(listingId));
  // A slab sold through "Buy" closes the offers still waiting on it (in the payment's transaction).
  events.on("listingChanged", ({ manager, listingId }) => offers.onListingChanged(manager, listingId));
  events.on("yardRatingChanged", ({ manager, sawyerId }) => catalogue.refreshYardRating(manager, sawyerId));
  // Every instance drops its catalogue answers and yard positions after a listing or yard change made
  // through any of them (a version row in MariaDB, polled by each; main.ts starts and stops the timer).
  const catalogueVersion = createSharedInvalidation({
    dataSource: deps.dataSource,
    reads,
    logger,
    name: "catalogue",
    onChange: catalogue.forgetCached,
  });
  events.on("listingChanged", ({ manager }) => catalogueVersion.changed(manager));
  events.on("yardChanged", ({ manager }) => catalogueVersion.changed(manager));
  events.on("yardRatingChanged", ({ manager }) => catalogueVersion.changed(manager));

  // Every API route comes from the endpoint table in packages/contracts, with one handler per row.
  const handlers: { [D in keyof typeof endpointTable]?: Handlers<(typeof endpointTable)[D]> } = {
    health: healthHandlers(createHealthService(deps), deps.config.instanceName),
    accounts: accountHandlers(accounts, deps.now ?? (() => new Date())),
    secondFactor: secondFactorHandlers(accounts, secondFactor),
    yard: yardHandlers(yard, inventoryCsv, logPhotos),
    listings: listingHandlers(listings, photos),
    review: reviewHandlers(listings),
    catalogue: catalogueHandlers(catalogue, settings),
    orders: orderHandlers(checkout, orders, deps.payments),
    orderReviews: orderReviewHandlers(orderReviews),
    offers: offerHandlers(offers),
    yardPages: yardPageHandlers(createYardPageService({ dataSource: deps.dataSource, reads })),
    buyer: buyerHandlers(savedSearches, favourites),
    messages: messageHandlers(messages),
    reports: reportHandlers(reports),
    admin: adminHandlers({ audit, reports, problems, moderation, settings, dashboard, outbox }),
    payouts: payoutHandlers(payouts),
    // The end-to-end suite's clock exists only on that stack; elsewhere its rows are not mounted (404).
    testClock: testClock ? testClockHandlers(testClock) : undefined,
  };
  const rows = rowsOf(endpointTable, handlers);
  const mountOptions: MountOptions = {
    bodyReaders: {
      json: express.json({ limit: "100kb" }),
      photo_bytes: express.raw({ type: () => true, limit: MAX_PHOTO_BYTES }),
      csv_text: express.text({ type: ["text/csv", "text/plain", "application/csv", "application/vnd.ms-excel"], limit: "2mb" }),
      provider_event: express.raw({ type: () => true, limit: "1mb" }),
    },
    limits: rateLimits.steps,
    // Tests check every answer and error code against the table, so a drift fails loudly.
    strict: config.environment === "test",
  };

  // The catalogue search is the busiest route and the same for everyone: its row (like the health
  // check's) answers before the session, the anti-forgery check and the acting-user lookup.
  mountEndpoints(
    app,
    rows.filter((row) => row.spec.sessionFree),
    mountOptions,
  );
  // Everything else that is text (JSON, the web app's HTML, scripts and styles, CSV) goes out
  // compressed to clients that take it; photos are already compressed and pass through.
  app.use(compression());
  app.use(
    cookieSession({
      name: "grainyard_session",
      keys: [config.sessionSecret],
      signed: true,
      httpOnly: true,
      sameSite: "lax",
      secure: production,
      maxAge: SESSION_DAYS * 86400_000,
    }),
  );
  // Who is acting: read once per request from the session key in the cookie.
  app.use(async (req: Request, _res: Response, next: NextFunction) => {
    try {
      await settings.ensureFresh();
      const { actor } = await accounts.actorForSession(sessionOf(req).key);
      req.actor = actor;
      next();
    } catch (error) {
      next(error);
    }
  });
  mountEndpoints(
    app,
    rows.filter((row) => !row.spec.sessionFree),
    mountOptions,
  );
  app.use("/api", apiNotFound);

  // robots.txt, the sitemaps, the built web app's files and its pages (public ones rendered on the server).
  app.use(webApp({ config, logger, dataSource: deps.dataSource, reads }));

  app.use(errorHandler(logger));
  // For periodic timers (main.ts) and tests: reservation sweep, saved-search alerts held back by the once-a-day rule,
  // the e-mail outbox, the background work a graceful stop (and a test) waits for, and the shared catalogue version's poll.
  return Object.assign(app, {
    checkout,
    orders,
    offers,
    savedSearches,
    marketplaceSettings: settings,
    outbox,
    background,
    catalogueVersion,
  });
}
