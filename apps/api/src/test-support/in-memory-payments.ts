import { createHmac, timingSafeEqual } from "node:crypto";
import {
  PaymentsRefused,
  PaymentsUnavailable,
  WebhookNotVerified,
  type HostedCheckout,
  type NewPayoutAccount,
  type PaymentEvent,
  type PaymentsPort,
  type PayoutAccountStatus,
  type RefundRequest,
  type StartCheckout,
  type TransferRequest,
} from "../integrations/payments.ts";

/*
 * The payments port in memory, for fast service tests (beside the real-stack suites, which drive
 * the official SDK against the payments fake). It keeps the provider's rules that Grainyard
 * relies on — idempotency keys replay the first answer, a refund never exceeds what is left of a
 * payment, a transfer needs a finished payout account — and lets a test pay, decline, finish an
 * account set-up, take the provider down or make it refuse, each answered as the domain event
 * the webhook would bring.
 */

interface Checkout extends StartCheckout {
  checkoutId: string;
  amountMinor: number;
  status: "open" | "complete" | "expired";
  paymentId: string | null;
}

interface Payment {
  paymentId: string;
  orderId: string;
  currency: string;
  amountMinor: number;
  refundedMinor: number;
  status: "succeeded" | "failed";
}

type Verb =
  | "startCheckout"
  | "expireCheckout"
  | "checkoutPayment"
  | "refund"
  | "transfer"
  | "createPayoutAccount"
  | "onboardingLink"
  | "payoutAccount";

export class InMemoryPayments implements PaymentsPort {
  readonly webhookSignatureHeader = "x-in-memory-signature";
  readonly checkouts = new Map<string, Checkout>();
  readonly payments = new Map<string, Payment>();
  readonly refunds: (RefundRequest & { refundId: string; amountMinor: number })[] = [];
  readonly transfers: (TransferRequest & { transferId: string })[] = [];
  readonly accounts = new Map<string, PayoutAccountStatus & { sawyerId: string }>();
  /** Every call that reached the "provider", in order (replays included). */
  readonly calls: { verb: Verb; idempotencyKey?: string }[] = [];
  /** True: every call fails as if the provider could not be reached. */
  down = false;
  private readonly idempotent = new Map<string, unknown>();
  private readonly failures: { verb: Verb; error: Error }[] = [];
  private sequence = 0;

  constructor(private readonly webhookSecret = "in-memory-webhook-secret") {}

  /** The next call of this kind fails with this error (once). */
  failNext(verb: Verb, error: "unavailable" | "refused", message = `The provider ${error === "refused" ? "refused" : "did not answer"}.`) {
    this.failures.push({
      verb,
      error: error === "refused" ? new PaymentsRefused(message, "refused_in_test") : new PaymentsUnavailable(message),
    });
  }

  private id(prefix: string) {
    this.sequence += 1;
    return `${prefix}_mem_${String(this.sequence).padStart(4, "0")}`;
  }

  private async answer<T>(verb: Verb, idempotencyKey: string | undefined, work: () => T): Promise<T> {
    this.calls.push({ verb, idempotencyKey });
    if (this.down) throw new PaymentsUnavailable("connect ECONNREFUSED (in-memory provider is down)");
    const failure = this.failures.findIndex((f) => f.verb === verb);
    if (failure >= 0) throw this.failures.splice(failure, 1)[0]!.error;
    if (idempotencyKey && this.idempotent.has(`${verb}:${idempotencyKey}`)) return this.idempotent.get(`${verb}:${idempotencyKey}`) as T;
    const result = work();
    if (idempotencyKey) this.idempotent.set(`${verb}:${idempotencyKey}`, result);
    return result;
  }

  startCheckout(input: StartCheckout): Promise<HostedCheckout> {
    return this.answer("startCheckout", input.idempotencyKey, () => {
      const checkoutId = this.id("cs");
      const amountMinor = input.lines.reduce((sum, line) => sum + line.amountMinor, 0);
      this.checkouts.set(checkoutId, { ...input, checkoutId, amountMinor, status: "open", paymentId: null });
      return { checkoutId, url: `https://pay.example.test/${checkoutId}` };
    });
  }

  expireCheckout(checkoutId: string): Promise<void> {
    return this.answer("expireCheckout", undefined, () => {
      const checkout = this.checkouts.get(checkoutId);
      if (!checkout) throw new PaymentsRefused(`No such checkout: ${checkoutId}`, "resource_missing");
      if (checkout.status !== "open") throw new PaymentsRefused("Only open checkouts can be expired.", "checkout_not_open");
      checkout.status = "expired";
    });
  }

  checkoutPayment(checkoutId: string): Promise<{ paid: boolean; paymentId: string | null }> {
    return this.answer("checkoutPayment", undefined, () => {
      const checkout = this.checkouts.get(checkoutId);
      if (!checkout) throw new PaymentsRefused(`No such checkout: ${checkoutId}`, "resource_missing");
      return { paid: checkout.status === "complete", paymentId: checkout.paymentId };
    });
  }

  refund(input: RefundRequest) {
    return this.answer("refund", input.idempotencyKey, () => {
      const payment = this.payments.get(input.paymentId);
      if (!payment) throw new PaymentsRefused(`No such payment: ${input.paymentId}`, "resource_missing");
      if (payment.status !== "succeeded") throw new PaymentsRefused("This payment has not succeeded.", "charge_not_refundable");
      const left = payment.amountMinor - payment.refundedMinor;
      const amountMinor = input.amountMinor ?? left;
      if (amountMinor <= 0 || amountMinor > left)
        throw new PaymentsRefused(`Refund amount (${amountMinor}) is greater than the unrefunded amount (${left}).`, "amount_too_large");
      payment.refundedMinor += amountMinor;
      const refundId = this.id("re");
      this.refunds.push({ ...input, refundId, amountMinor });
      return { refundId, status: "succeeded" as const, amountMinor };
    });
  }

  transfer(input: TransferRequest) {
    return this.answer("transfer", input.idempotencyKey, () => {
      const account = this.accounts.get(input.accountId);
      if (!account) throw new PaymentsRefused(`No such account: ${input.accountId}`, "resource_missing");
      if (!account.payoutsEnabled)
        throw new PaymentsRefused("The destination account has not finished onboarding and cannot receive transfers.", "account_not_ready");
      const transferId = this.id("tr");
      this.transfers.push({ ...input, transferId });
      return { transferId };
    });
  }

  createPayoutAccount(input: NewPayoutAccount) {
    return this.answer("createPayoutAccount", input.idempotencyKey, () => {
      const accountId = this.id("acct");
      this.accounts.set(accountId, { accountId, sawyerId: input.sawyerId, payoutsEnabled: false, detailsSubmitted: false });
      return { accountId };
    });
  }

  onboardingLink(input: { accountId: string; returnUrl: string }) {
    return this.answer("onboardingLink", undefined, () => {
      if (!this.accounts.has(input.accountId)) throw new PaymentsRefused(`No such account: ${input.accountId}`, "resource_missing");
      return { url: `https://pay.example.test/onboard/${input.accountId}?return_url=${encodeURIComponent(input.returnUrl)}` };
    });
  }

  payoutAccount(accountId: string) {
    return this.answer("payoutAccount", undefined, () => {
      const account = this.accounts.get(accountId);
      if (!account) throw new PaymentsRefused(`No such account: ${accountId}`, "resource_missing");
      return { accountId, payoutsEnabled: account.payoutsEnabled, detailsSubmitted: account.detailsSubmitted };
    });
  }

  verifyWebhook(rawBody: Buffer, signature: string | undefined): PaymentEvent | null {
    const expected = Buffer.from(this.signature(rawBody.toString("utf8")));
    if (!signature || Buffer.byteLength(signature) !== expected.length || !timingSafeEqual(Buffer.from(signature), expected))
      throw new WebhookNotVerified("The webhook signature did not verify.");
    return JSON.parse(rawBody.toString("utf8")) as PaymentEvent | null;
  }

  async isUp() {
    return !this.down;
  }

  // ---- What the buyer, the sawyer or the provider does (each answers the event its webhook brings) ----

  /** A webhook body and its signature, as the provider would post it. */
  signed(event: PaymentEvent): { body: Buffer; signature: string } {
    const body = JSON.stringify(event);
    return { body: Buffer.from(body), signature: this.signature(body) };
  }

  private signature(body: string) {
    return createHmac("sha256", this.webhookSecret).update(body).digest("hex");
  }

  /** The buyer pays on the hosted page. */
  pay(checkoutId: string): Extract<PaymentEvent, { kind: "checkout_completed" }> {
    const checkout = this.checkouts.get(checkoutId);
    if (!checkout || checkout.status !== "open") throw new Error(`checkout ${checkoutId} is not open`);
    const paymentId = this.id("pi");
    this.payments.set(paymentId, {
      paymentId,
      orderId: checkout.orderId,
      currency: checkout.currency,
      amountMinor: checkout.amountMinor,
      refundedMinor: 0,
      status: "succeeded",
    });
    checkout.status = "complete";
    checkout.paymentId = paymentId;
    return { kind: "checkout_completed", eventId: this.id("evt"), orderId: checkout.orderId, checkoutId, paymentId };
  }

  /** The card is declined on the hosted page. */
  decline(checkoutId: string): Extract<PaymentEvent, { kind: "payment_failed" }> {
    const checkout = this.checkouts.get(checkoutId);
    if (!checkout) throw new Error(`no checkout ${checkoutId}`);
    const paymentId = checkout.paymentId ?? this.id("pi");
    checkout.paymentId = paymentId;
    this.payments.set(paymentId, {
      paymentId,
      orderId: checkout.orderId,
      currency: checkout.currency,
      amountMinor: checkout.amountMinor,
      refundedMinor: 0,
      status: "failed",
    });
    return { kind: "payment_failed", eventId: this.id("evt"), orderId: checkout.orderId, paymentId, failure: "Your card was declined." };
  }

  /** The provider's word that a payment was refunded (after any refund through the port). */
  refundedEvent(paymentId: string): Extract<PaymentEvent, { kind: "payment_refunded" }> {
    const payment = this.payments.get(paymentId);
    if (!payment) throw new Error(`no payment ${paymentId}`);
    return {
      kind: "payment_refunded",
      eventId: this.id("evt"),
      orderId: payment.orderId,
      paymentId,
      refundedMinor: payment.refundedMinor,
      fully: payment.refundedMinor === payment.amountMinor,
    };
  }

  /** The sawyer finishes the hosted set-up of their payout account. */
  finishOnboarding(accountId: string): Extract<PaymentEvent, { kind: "payout_account_updated" }> {
    const account = this.accounts.get(accountId);
    if (!account) throw new Error(`no account ${accountId}`);
    account.payoutsEnabled = true;
    account.detailsSubmitted = true;
    return {
      kind: "payout_account_updated",
      eventId: this.id("evt"),
      account: { accountId, payoutsEnabled: true, detailsSubmitted: true },
    };
  }

  /** The provider restricts an account (a bank detail to check, say), without telling us yet. */
  restrict(accountId: string) {
    const account = this.accounts.get(accountId);
    if (!account) throw new Error(`no account ${accountId}`);
    account.payoutsEnabled = false;
  }
}
