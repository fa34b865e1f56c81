import { loadConfig, ConfigError } from "./config.ts";
import { createApp } from "./app.ts";
import { createDataSource } from "./db/data-source.ts";
import { createMailer } from "./integrations/mail.ts";
import { createPayments } from "./integrations/payments-stripe.ts";
import { createPhotoStorage } from "./integrations/storage.ts";
import { createJobRunner, type Job } from "./jobs/job-runner.ts";
import { createLogger } from "./logger.ts";

let config;
try {
  config = loadConfig();
} catch (error) {
  if (error instanceof ConfigError) {
    console.error(`grainyard-api: ${error.message}`);
    process.exit(1);
  }
  throw error;
}
const logger = createLogger(config.logLevel);
const dataSource = createDataSource(config.database);
try {
  await dataSource.initialize();
} catch (error) {
  console.error(`grainyard-api: cannot reach MariaDB at ${config.database.host}:${config.database.port}: ${(error as Error).message}`);
  process.exit(1);
}
const mailer = createMailer(config.mail);
const storage = createPhotoStorage(config.storage);
const payments = createPayments(config.payments);
const app = createApp({ config, dataSource, mailer, storage, payments, logger });

const server = app.listen(config.port, config.host, () => {
  logger.info({ url: `http://${config.host}:${config.port}` }, "grainyard api listening");
});
server.on("error", (error: NodeJS.ErrnoException) => {
  console.error(`grainyard-api: cannot listen on ${config.host}:${config.port}: ${error.code ?? error.message}`);
  process.exit(1);
});

// Scheduled work, once per period across however many API instances run (a lease per job in MariaDB).
const jobs = createJobRunner({ dataSource, logger });
const scheduled: Job[] = [
  // Reservations whose time ran out go back on sale.
  { name: "reservation-sweep", everyMs: 30_000, run: () => app.checkout.sweepExpiredReservations().then(() => undefined) },
  // Offers and counters left unanswered for 48 hours expire, and both sides are told.
  { name: "offer-expiry", everyMs: 60_000, run: () => app.offers.expireDue().then(() => undefined) },
  // Orders handed over AUTO_COMPLETE_DAYS ago complete by themselves.
  { name: "order-completion", everyMs: 5 * 60_000, run: () => app.orders.completeDueOrders().then(() => undefined) },
  // Refunds the provider could not take at cancellation are tried again.
  { name: "refund-retries", everyMs: 5 * 60_000, run: () => app.orders.retryPendingRefunds().then(() => undefined) },
  // E-mails still waiting in the outbox (the mail server was down, say) go out, with growing waits between tries.
  { name: "mail-outbox", everyMs: 10_000, run: () => app.outbox.deliverDue().then(() => undefined) },
  // Saved-search alerts held back by the once-a-day rule go out when their day is up.
  { name: "saved-search-alerts", everyMs: 10 * 60_000, run: () => app.savedSearches.processPendingAlerts().then(() => undefined) },
];
jobs.start(config.jobEveryMs === null ? scheduled : scheduled.map((job) => ({ ...job, everyMs: config.jobEveryMs! })));

// Catalogue changes made through other instances reach this one's caches within about half a second.
app.catalogueVersion.start();

let stopping = false;
async function shutdown(signal: string) {
  if (stopping) return;
  stopping = true;
  logger.info({ signal }, "shutting down");
  // No new connections; requests in flight finish (idle keep-alive connections close now).
  const closed = new Promise<void>((resolve) => server.close(() => resolve()));
  server.closeIdleConnections();
  await jobs.stop();
  await app.catalogueVersion.stop();
  await Promise.race([closed, new Promise((resolve) => setTimeout(resolve, 10_000).unref())]);
  server.closeAllConnections();
  // First attempts at e-mails just written (and other work after an answer) finish; what they could not send waits in the outbox.
  await app.background.settled();
  mailer.close();
  storage.close();
  await dataSource.destroy().catch(() => undefined);
  process.exit(0);
}
process.on("SIGTERM", () => void shutdown("SIGTERM"));
process.on("SIGINT", () => void shutdown("SIGINT"));
