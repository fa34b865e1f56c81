import { AccountEntity } from "./account.ts";
import { CatalogueEntryEntity } from "./catalogue-entry.ts";
import { EmailTokenEntity } from "./email-token.ts";
import { ListingPhotoEntity } from "./listing-photo.ts";
import { LogPhotoEntity } from "./log-photo.ts";
import { ListingSlabEntity } from "./listing-slab.ts";
import { ListingEntity } from "./listing.ts";
import { MoistureReadingEntity } from "./moisture-reading.ts";
import { SessionRecordEntity } from "./session-record.ts";
import { SlabEntity } from "./slab.ts";
import { YardLogEntity } from "./yard-log.ts";

export {
  AccountEntity,
  CatalogueEntryEntity,
  LogPhotoEntity,
  EmailTokenEntity,
  ListingEntity,
  ListingPhotoEntity,
  ListingSlabEntity,
  MoistureReadingEntity,
  SessionRecordEntity,
  SlabEntity,
  YardLogEntity,
};
/** Every entity class, for the data source. */
export const entities: (new () => object)[] = [
  AccountEntity,
  SessionRecordEntity,
  EmailTokenEntity,
  YardLogEntity,
  SlabEntity,
  MoistureReadingEntity,
  ListingEntity,
  ListingSlabEntity,
  ListingPhotoEntity,
  CatalogueEntryEntity,
  LogPhotoEntity,
];

// Orders, the ledger and handled provider events.
import { LedgerEntryEntity } from "./ledger-entry.ts";
import { OrderEntity } from "./order.ts";
import { PaymentEventEntity } from "./payment-event.ts";
export { LedgerEntryEntity, OrderEntity, PaymentEventEntity };
entities.push(OrderEntity, LedgerEntryEntity, PaymentEventEntity);

// Buyer tools: saved searches with alerts, favourites, messages about a listing.
import { FavouriteEntity } from "./favourite.ts";
import { MessageThreadEntity } from "./message-thread.ts";
import { MessageEntity } from "./message.ts";
import { SavedSearchMatchEntity } from "./saved-search-match.ts";
import { SavedSearchEntity } from "./saved-search.ts";
export { FavouriteEntity, MessageEntity, MessageThreadEntity, SavedSearchEntity, SavedSearchMatchEntity };
entities.push(SavedSearchEntity, SavedSearchMatchEntity, FavouriteEntity, MessageThreadEntity, MessageEntity);

// Operator desk: review decisions, the audit log, reports, settings.
import { AuditEntryEntity } from "./audit-entry.ts";
import { ContentReportEntity } from "./content-report.ts";
import { ListingReviewEntity } from "./listing-review.ts";
import { MarketplaceSettingEntity } from "./marketplace-setting.ts";
export { AuditEntryEntity, ContentReportEntity, ListingReviewEntity, MarketplaceSettingEntity };
entities.push(ListingReviewEntity, AuditEntryEntity, ContentReportEntity, MarketplaceSettingEntity);

// Paying sawyers: payout accounts, payouts with their lines, and admins' dispute refunds.
import { OrderRefundEntity } from "./order-refund.ts";
import { PayoutAccountEntity } from "./payout-account.ts";
import { PayoutLineEntity } from "./payout-line.ts";
import { PayoutEntity } from "./payout.ts";
export { OrderRefundEntity, PayoutAccountEntity, PayoutEntity, PayoutLineEntity };
entities.push(PayoutAccountEntity, PayoutEntity, PayoutLineEntity, OrderRefundEntity);

// Scheduled jobs: one lease per job, so several API instances run each job once.
import { JobLeaseEntity } from "./job-lease.ts";
export { JobLeaseEntity };
entities.push(JobLeaseEntity);

// Reviews of completed orders.
import { OrderReviewEntity } from "./order-review.ts";
export { OrderReviewEntity };
entities.push(OrderReviewEntity);

// E-mails written with the change that causes them, delivered by the outbox job.
import { OutboxEmailEntity } from "./outbox-email.ts";
export { OutboxEmailEntity };
entities.push(OutboxEmailEntity);

// The second factor's single-use recovery codes (hashed).
import { RecoveryCodeEntity } from "./recovery-code.ts";
export { RecoveryCodeEntity };
entities.push(RecoveryCodeEntity);

// Problems buyers reported after hand-over, settled on the desk.
import { OrderProblemEntity } from "./order-problem.ts";
export { OrderProblemEntity };
entities.push(OrderProblemEntity);

// Offers on listings and their back and forth.
import { OfferEntity } from "./offer.ts";
export { OfferEntity };
entities.push(OfferEntity);
