/**
 * The payments port: what Grainyard asks of the card-payment provider, in its own words. Services
 * depend on this interface only; `payments-stripe.ts` implements it with the provider's official
 * SDK (pointed at the local payments fake in development and tests), and
 * `test-support/in-memory-payments.ts` implements it in memory for fast service tests.
 *
 * Amounts are integer minor units with an ISO currency code. A provider failure reaches a service
 * as one of two typed errors: `PaymentsUnavailable` (could not be reached or failed on its side:
 * try again later, nothing is known to have happened) or `PaymentsRefused` (it answered and said
 * no: the same request will not succeed).
 */

interface CheckoutLine {
  /** What the buyer sees on the payment page ("Walnut bench top", "Tax"). */
  name: string;
  amountMinor: number;
}

export interface StartCheckout {
  orderId: string;
  listingId: string;
  currency: string;
  lines: CheckoutLine[];
  /** Where the provider sends the buyer after paying, and after giving up. */
  successUrl: string;
  cancelUrl: string;
  /** The payment page closes at this time. */
  expiresAt: Date;
  idempotencyKey: string;
}

export interface HostedCheckout {
  checkoutId: string;
  /** The provider's hosted payment page for this checkout. */
  url: string;
}

/** Why money goes back (kept with the refund at the provider). */
type RefundCause = "cancellation" | "sold_elsewhere" | "dispute";

export interface RefundRequest {
  paymentId: string;
  orderId: string;
  cause: RefundCause;
  /** Omitted: everything of the payment not refunded yet. */
  amountMinor?: number;
  /** Our own references kept with the refund at the provider (who cancelled, which dispute refund). */
  references?: Record<string, string>;
  idempotencyKey: string;
}

export interface RefundMade {
  refundId: string;
  /** "pending" while the card network has not confirmed it yet. */
  status: "succeeded" | "pending" | "failed";
  amountMinor: number;
}

export interface TransferRequest {
  amountMinor: number;
  currency: string;
  /** The sawyer's payout account at the provider. */
  accountId: string;
  payoutId: string;
  sawyerId: string;
  idempotencyKey: string;
}

export interface NewPayoutAccount {
  sawyerId: string;
  email: string;
  /** The yard's name (or the sawyer's) as the provider shows it. */
  businessName: string;
  idempotencyKey: string;
}

/** Where a sawyer's payout account stands at the provider. */
export interface PayoutAccountStatus {
  accountId: string;
  payoutsEnabled: boolean;
  detailsSubmitted: boolean;
}

/** The provider's events Grainyard acts on, verified and in our names. */
export type PaymentEvent =
  /** The buyer paid on the hosted page. */
  | { kind: "checkout_completed"; eventId: string; orderId: string; checkoutId: string; paymentId: string | null }
  /** The hosted page closed without a payment. */
  | { kind: "checkout_expired"; eventId: string; orderId: string; checkoutId: string }
  /** The card was refused. */
  | { kind: "payment_failed"; eventId: string; orderId: string; paymentId: string; failure: string | null }
  /** Money went back to the card (ours, from any of the refund paths). */
  | { kind: "payment_refunded"; eventId: string; orderId: string; paymentId: string; refundedMinor: number; fully: boolean }
  /** A sawyer's payout account changed (set-up finished, say). */
  | { kind: "payout_account_updated"; eventId: string; account: PayoutAccountStatus };

export interface PaymentsPort {
  /** Opens the provider's hosted payment page for an order. */
  startCheckout(input: StartCheckout): Promise<HostedCheckout>;
  /** Closes a hosted payment page that is still open. */
  expireCheckout(checkoutId: string): Promise<void>;
  /** Whether a hosted checkout was paid, and the payment it made (for an event that never arrived). */
  checkoutPayment(checkoutId: string): Promise<{ paid: boolean; paymentId: string | null }>;
  /** Gives all (or part) of a payment back; the same idempotency key never refunds twice. */
  refund(input: RefundRequest): Promise<RefundMade>;
  /** Sends money to a sawyer's payout account; the same idempotency key never sends twice. */
  transfer(input: TransferRequest): Promise<{ transferId: string }>;
  createPayoutAccount(input: NewPayoutAccount): Promise<{ accountId: string }>;
  /** The provider's hosted set-up page of a payout account. */
  onboardingLink(input: { accountId: string; returnUrl: string; refreshUrl: string }): Promise<{ url: string }>;
  payoutAccount(accountId: string): Promise<PayoutAccountStatus>;
  /** The HTTP header a webhook's signature comes in. */
  readonly webhookSignatureHeader: string;
  /**
   * Checks a webhook's signature over its raw body and reads it into one of our events; null when
   * it is genuine but nothing Grainyard acts on. Throws `WebhookNotVerified` when it is not genuine.
   */
  verifyWebhook(rawBody: Buffer, signature: string | undefined): PaymentEvent | null;
  /** True when the provider answers. */
  isUp(): Promise<boolean>;
}

export class PaymentsError extends Error {}

/** The provider could not be reached, or failed on its side: nothing is known to have happened; try again later. */
export class PaymentsUnavailable extends PaymentsError {
  override readonly name = "PaymentsUnavailable";
}

/** The provider answered and refused (a card declined, an account not ready, an amount too large). */
export class PaymentsRefused extends PaymentsError {
  override readonly name = "PaymentsRefused";
  constructor(
    message: string,
    /** The provider's short code for the reason, when it gave one. */
    readonly code: string | null = null,
  ) {
    super(message);
  }
}

/** A webhook whose signature did not verify (or that had none). */
export class WebhookNotVerified extends Error {
  override readonly name = "WebhookNotVerified";
}
