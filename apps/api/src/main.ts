import { loadConfig, ConfigError } from "./config.ts";
import { createApp } from "./app.ts";
import { createDataSource } from "./db/data-source.ts";
import { createMailer } from "./integrations/mail.ts";
import { createPayments } from "./integrations/payments.ts";
import { createPhotoStorage } from "./integrations/storage.ts";
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

// Reservations whose time ran out go back on sale; safe with several instances (conditional updates).
const sweep = setInterval(() => {
  app.checkout.sweepExpiredReservations().catch((error: unknown) => logger.error({ err: error }, "reservation sweep failed"));
}, 30_000);
sweep.unref();

// Orders handed over AUTO_COMPLETE_DAYS ago complete by themselves, and refunds the provider could
// not take at cancellation are tried again; both conditional updates, safe with several instances.
const orderSweep = setInterval(() => {
  app.orders.completeDueOrders().catch((error: unknown) => logger.error({ err: error }, "order completion sweep failed"));
  app.orders.retryPendingRefunds().catch((error: unknown) => logger.error({ err: error }, "refund retry sweep failed"));
}, 5 * 60_000);
orderSweep.unref();

// Saved-search alerts held back by the once-a-day rule go out when their day is up.
const alerts = setInterval(() => {
  app.savedSearches.processPendingAlerts().catch((error: unknown) => logger.error({ err: error }, "saved-search alerts failed"));
}, 10 * 60_000);
alerts.unref();

let stopping = false;
async function shutdown(signal: string) {
  if (stopping) return;
  stopping = true;
  logger.info({ signal }, "shutting down");
  server.close();
  server.closeAllConnections();
  // E-mails handed to background work (reset links, confirmations) still go out.
  await app.background.settled();
  mailer.close();
  storage.close();
  await dataSource.destroy().catch(() => undefined);
  process.exit(0);
}
process.on("SIGTERM", () => void shutdown("SIGTERM"));
process.on("SIGINT", () => void shutdown("SIGINT"));
