import type { orderEndpoints } from "@grainyard/contracts";
import type Stripe from "stripe";
import { AppError } from "../errors.ts";
import type { Handlers } from "../http/endpoints.ts";
import type { Payments } from "../integrations/payments.ts";
import type { CheckoutService } from "../services/checkout-service.ts";
import type { OrderService } from "../services/order-service.ts";

/** Buying: the quote, checkout, the buyer's and sawyer's orders and every step after payment. */
export function orderHandlers(
  checkout: CheckoutService,
  orders: OrderService,
  payments: Payments,
  webhookSecret: string,
): Handlers<typeof orderEndpoints> {
  return {
    getCheckoutQuote: async ({ params }) => ({ quote: await checkout.quote(params.listingId) }),
    checkout: ({ actor, params, body }) => checkout.checkout(actor, params.listingId, body),
    listOrders: async ({ actor }) => ({ orders: await orders.listOwn(actor) }),
    getOrder: async ({ actor, params }) => ({ order: await orders.get(actor, params.orderId) }),
    proposePickupWindows: async ({ actor, params, body }) => ({ order: await orders.proposePickupWindows(actor, params.orderId, body) }),
    choosePickupWindow: async ({ actor, params, body }) => ({ order: await orders.choosePickupWindow(actor, params.orderId, body) }),
    markShipped: async ({ actor, params, body }) => ({ order: await orders.markShipped(actor, params.orderId, body) }),
    markHandedOver: async ({ actor, params }) => ({ order: await orders.markHandedOver(actor, params.orderId) }),
    confirmReceipt: async ({ actor, params }) => ({ order: await orders.confirmReceipt(actor, params.orderId) }),
    cancelOrder: async ({ actor, params, body }) => ({ order: await orders.cancel(actor, params.orderId, body) }),
    /**
     * The provider's webhook: the raw body, the signature checked with the official SDK, then
     * handled once per event id. Its row needs no anti-forgery token: the signature is its proof.
     */
    paymentWebhook: async ({ req, body }) => {
      const signature = req.get("stripe-signature");
      let event: Stripe.Event;
      try {
        if (!signature || !Buffer.isBuffer(body)) throw new Error("missing signature");
        event = payments.sdk.webhooks.constructEvent(body, signature, webhookSecret);
      } catch {
        throw new AppError("bad_signature", "The webhook signature did not verify.");
      }
      return { received: true, outcome: await checkout.handleEvent(event) };
    },
  };
}
