import Stripe from "stripe";
import type { AppConfig } from "../config.ts";
import {
  PaymentsRefused,
  PaymentsUnavailable,
  WebhookNotVerified,
  type PaymentEvent,
  type PaymentsPort,
  type RefundMade,
} from "./payments.ts";

/**
 * The payments port through the provider's official SDK, pointed at the endpoint from config (the
 * local payments fake in development and tests). The only file that speaks the provider's
 * language: its parameters, objects, event names and error classes stop here.
 */
export function createPayments(config: AppConfig["payments"]): PaymentsPort {
  const sdk = new Stripe(config.secretKey, {
    host: config.host,
    port: config.port,
    protocol: config.protocol,
    maxNetworkRetries: 0,
    telemetry: false,
    timeout: 10_000,
  });
  const base = `${config.protocol}://${config.host}:${config.port}`;

  return {
    webhookSignatureHeader: "stripe-signature",

    async startCheckout(input) {
      const currency = input.currency.toLowerCase();
      const session = await call(() =>
        sdk.checkout.sessions.create(
          {
            mode: "payment",
            line_items: input.lines.map((line) => ({
              quantity: 1,
              price_data: { currency, unit_amount: line.amountMinor, product_data: { name: line.name } },
            })),
            success_url: input.successUrl,
            cancel_url: input.cancelUrl,
            client_reference_id: input.orderId,
            metadata: { order_id: input.orderId, listing_id: input.listingId },
            payment_intent_data: { metadata: { order_id: input.orderId } },
            expires_at: Math.floor(input.expiresAt.getTime() / 1000),
          },
          { idempotencyKey: input.idempotencyKey },
        ),
      );
      if (!session.url) throw new PaymentsRefused("The provider opened no payment page for this checkout.");
      return { checkoutId: session.id, url: session.url };
    },

    async expireCheckout(checkoutId) {
      await call(() => sdk.checkout.sessions.expire(checkoutId));
    },

    async checkoutPayment(checkoutId) {
      const session = await call(() => sdk.checkout.sessions.retrieve(checkoutId));
      const intent = session.payment_intent;
      return { paid: session.payment_status === "paid", paymentId: typeof intent === "string" ? intent : (intent?.id ?? null) };
    },

    async refund(input) {
      const references = Object.fromEntries(Object.entries(input.references ?? {}).map(([key, value]) => [snakeCase(key), value]));
      const metadata: Record<string, string> = { order_id: input.orderId, ...references };
      if (input.cause === "sold_elsewhere") metadata.reason = "sold_elsewhere";
      const refund = await call(() =>
        sdk.refunds.create(
          {
            payment_intent: input.paymentId,
            ...(input.amountMinor === undefined ? {} : { amount: input.amountMinor }),
            ...(input.cause === "cancellation" ? { reason: "requested_by_customer" as const } : {}),
            metadata,
          },
          { idempotencyKey: input.idempotencyKey },
        ),
      );
      return { refundId: refund.id, status: refundStatus(refund.status), amountMinor: refund.amount };
    },

    async transfer(input) {
      const transfer = await call(() =>
        sdk.transfers.create(
          {
            amount: input.amountMinor,
            currency: input.currency.toLowerCase(),
            destination: input.accountId,
            metadata: { payout_id: input.payoutId, sawyer_id: input.sawyerId },
          },
          { idempotencyKey: input.idempotencyKey },
        ),
      );
      return { transferId: transfer.id };
    },

    async createPayoutAccount(input) {
      const account = await call(() =>
        sdk.accounts.create(
          { type: "express", email: input.email, business_profile: { name: input.businessName }, metadata: { sawyer_id: input.sawyerId } },
          { idempotencyKey: input.idempotencyKey },
        ),
      );
      return { accountId: account.id };
    },

    async onboardingLink(input) {
      const link = await call(() =>
        sdk.accountLinks.create({
          account: input.accountId,
          type: "account_onboarding",
          return_url: input.returnUrl,
          refresh_url: input.refreshUrl,
        }),
      );
      return { url: link.url };
    },

    async payoutAccount(accountId) {
      return accountStatus(await call(() => sdk.accounts.retrieve(accountId)));
    },

    verifyWebhook(rawBody, signature) {
      let event: Stripe.Event;
      try {
        if (!signature) throw new Error("no signature");
        event = sdk.webhooks.constructEvent(rawBody, signature, config.webhookSecret);
      } catch {
        throw new WebhookNotVerified("The webhook signature did not verify.");
      }
      return toPaymentEvent(event);
    },

    async isUp() {
      try {
        const response = await fetch(`${base}/health`, { signal: AbortSignal.timeout(3_000) });
        return response.ok;
      } catch {
        return false;
      }
    },
  };
}

/** One provider call; its failure becomes ours: unavailable (connection, its own failure, rate limit) or refused. */
async function call<T>(request: () => Promise<T>): Promise<T> {
  try {
    return await request();
  } catch (error) {
    if (error instanceof Stripe.errors.StripeError) {
      if (
        error instanceof Stripe.errors.StripeConnectionError ||
        error instanceof Stripe.errors.StripeAPIError ||
        error instanceof Stripe.errors.StripeRateLimitError
      )
        throw new PaymentsUnavailable(error.message, { cause: error });
      throw new PaymentsRefused(error.message, error.code ?? null);
    }
    throw new PaymentsUnavailable(error instanceof Error ? error.message : String(error), { cause: error });
  }
}

function refundStatus(status: string | null): RefundMade["status"] {
  if (status === "succeeded") return "succeeded";
  if (status === "failed" || status === "canceled") return "failed";
  return "pending";
}

function accountStatus(account: Pick<Stripe.Account, "id" | "payouts_enabled" | "details_submitted">) {
  return { accountId: account.id, payoutsEnabled: !!account.payouts_enabled, detailsSubmitted: !!account.details_submitted };
}

const idOf = (value: string | { id: string } | null | undefined): string | null =>
  typeof value === "string" ? value : (value?.id ?? null);

const snakeCase = (key: string) => key.replace(/[A-Z]/g, (letter) => `_${letter.toLowerCase()}`);

/** The provider's event in our words; null for events Grainyard does not act on (or about no order of ours). */
function toPaymentEvent(event: Stripe.Event): PaymentEvent | null {
  const eventId = event.id;
  switch (event.type) {
    case "checkout.session.completed": {
      const session = event.data.object;
      const orderId = session.metadata?.order_id;
      return orderId
        ? { kind: "checkout_completed", eventId, orderId, checkoutId: session.id, paymentId: idOf(session.payment_intent) }
        : null;
    }
    case "checkout.session.expired": {
      const session = event.data.object;
      const orderId = session.metadata?.order_id;
      return orderId ? { kind: "checkout_expired", eventId, orderId, checkoutId: session.id } : null;
    }
    case "payment_intent.payment_failed": {
      const intent = event.data.object;
      const orderId = intent.metadata?.order_id;
      return orderId
        ? { kind: "payment_failed", eventId, orderId, paymentId: intent.id, failure: intent.last_payment_error?.message ?? null }
        : null;
    }
    case "charge.refunded": {
      const charge = event.data.object;
      const orderId = charge.metadata?.order_id;
      const paymentId = idOf(charge.payment_intent);
      return orderId && paymentId
        ? { kind: "payment_refunded", eventId, orderId, paymentId, refundedMinor: charge.amount_refunded, fully: charge.refunded }
        : null;
    }
    case "account.updated":
      return { kind: "payout_account_updated", eventId, account: accountStatus(event.data.object) };
    default:
      return null;
  }
}
