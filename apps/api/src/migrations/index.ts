import type { MigrationInterface } from "typeorm";
import { Accounts1764662400000 } from "./1764662400000-accounts.ts";
import { YardAndListings1764673200000 } from "./1764673200000-yard-and-listings.ts";
import { Catalogue1764684000000 } from "./1764684000000-catalogue.ts";
import { LogPhotos1764694800000 } from "./1764694800000-log-photos.ts";

/** Every migration, oldest first. Add new ones at the end (see DEVELOPERS.md). */
export const migrations: (new () => MigrationInterface)[] = [
  Accounts1764662400000,
  YardAndListings1764673200000,
  Catalogue1764684000000,
  LogPhotos1764694800000,
];

// Orders and the ledger.
import { Orders1764716400000 } from "./1764716400000-orders.ts";
migrations.push(Orders1764716400000);

// Buyer tools: saved searches with alerts, favourites, messages.
import { BuyerTools1764705600000 } from "./1764705600000-buyer-tools.ts";
migrations.push(BuyerTools1764705600000);

// A covering index for the catalogue's capped result count.
import { CatalogueFilterIndex1764720000000 } from "./1764720000000-catalogue-filter-index.ts";
migrations.push(CatalogueFilterIndex1764720000000);

// The steps after payment: pickup windows, shipment, hand-over, completion, cancellation and refund.
import { OrderSteps1764727200000 } from "./1764727200000-order-steps.ts";
migrations.push(OrderSteps1764727200000);

// Operator desk: review snapshots, audit log, reports, settings, suspension.
import { OperatorDesk1764738000000 } from "./1764738000000-operator-desk.ts";
migrations.push(OperatorDesk1764738000000);

// Paying sawyers: payout accounts, payouts and their lines, dispute refunds.
import { Payouts1764748800000 } from "./1764748800000-payouts.ts";
migrations.push(Payouts1764748800000);

// Covering sort indexes for the catalogue search (ids from one index, then only the rows shown), and yard by yard for the nearest-first walk.
import { CatalogueSortIndexes1764759600000 } from "./1764759600000-catalogue-sort-indexes.ts";
migrations.push(CatalogueSortIndexes1764759600000);

// One record for every refund (cancellations and payments for slabs sold elsewhere too), keyed by the provider's idempotency key.
import { OneRefundRecord1764770400000 } from "./1764770400000-one-refund-record.ts";
migrations.push(OneRefundRecord1764770400000);

// A lease per scheduled job, so several API instances run each job once.
import { JobLeases1764781200000 } from "./1764781200000-job-leases.ts";
migrations.push(JobLeases1764781200000);

// The shared store of the sign-in and reset limits (rate-limiter-flexible), counted alike by every API instance.
import { RateLimits1764792000000 } from "./1764792000000-rate-limits.ts";
migrations.push(RateLimits1764792000000);

// The catalogue's set weights named apart: the whole set's high end beside the heaviest slab's.
import { CatalogueSetWeights1764802800000 } from "./1764802800000-catalogue-set-weights.ts";
migrations.push(CatalogueSetWeights1764802800000);

// Reviews of completed orders, and the yard's rating on each catalogue row.
import { OrderReviews1764813600000 } from "./1764813600000-order-reviews.ts";
migrations.push(OrderReviews1764813600000);

// Public yard pages: each yard's page address (slug) and its story; catalogue rows keep the slug for the cards' link.
import { YardPages1764824400000 } from "./1764824400000-yard-pages.ts";
migrations.push(YardPages1764824400000);

// A slab's length and thickness as entered (millimetres to six decimals), so 2¼″ stays 57.15 mm.
import { SlabMeasurementsAsEntered1764986400000 } from "./1764986400000-slab-measurements-as-entered.ts";
migrations.push(SlabMeasurementsAsEntered1764986400000);

// Why an order was marked handed over before the booked pickup time.
import { HandOverNote1764990000000 } from "./1764990000000-hand-over-note.ts";
migrations.push(HandOverNote1764990000000);

// A version row per shared cache, so every API instance drops its catalogue answers and yard positions together.
import { CacheVersion1764993600000 } from "./1764993600000-cache-version.ts";
migrations.push(CacheVersion1764993600000);

// The e-mail outbox: every e-mail is written in the transaction of the change that causes it and delivered by a job.
import { EmailOutbox1764997200000 } from "./1764997200000-email-outbox.ts";
migrations.push(EmailOutbox1764997200000);

// The second factor: TOTP secret and last accepted time step on the account, hashed single-use recovery codes.
import { SecondFactor1765008000000 } from "./1765008000000-second-factor.ts";
migrations.push(SecondFactor1765008000000);

// Problems buyers report after hand-over, settled on the desk.
import { OrderProblems1765018800000 } from "./1765018800000-order-problems.ts";
migrations.push(OrderProblems1765018800000);
// Offers on listings, and each listing's offer settings (welcome or not, and a floor never shown to buyers).
import { Offers1765029600000 } from "./1765029600000-offers.ts";
migrations.push(Offers1765029600000);
// The yard's time zone stored with an order's pickup windows (shown to everyone in yard time).
import { PickupTimeZone1765040000000 } from "./1765040000000-pickup-time-zone.ts";
migrations.push(PickupTimeZone1765040000000);
