import type { orderEndpoints } from "@grainyard/contracts";
import { AppError } from "../errors.ts";
import type { Handlers } from "../http/endpoints.ts";
import { WebhookNotVerified, type PaymentEvent, type PaymentsPort } from "../integrations/payments.ts";
import type { CheckoutService } from "../services/checkout-service.ts";
import type { OrderService } from "../services/order-service.ts";

/** Buying: the quote, checkout, the buyer's and sawyer's orders and every step after payment. */
export function orderHandlers(checkout: CheckoutService, orders: OrderService, payments: PaymentsPort): Handlers<typeof orderEndpoints> {
  return {
    getCheckoutQuote: async ({ params }) => ({ quote: await checkout.quote(params.listingId) }),
    checkout: ({ actor, params, body }) => checkout.checkout(actor, params.listingId, body),
    listOrders: async ({ actor }) => ({ orders: await orders.listOwn(actor) }),
    searchOrders: ({ actor, query }) => orders.searchForDesk(actor, query),
    getOrder: async ({ actor, params }) => ({ order: await orders.get(actor, params.orderId) }),
    proposePickupWindows: async ({ actor, params, body }) => ({ order: await orders.proposePickupWindows(actor, params.orderId, body) }),
    choosePickupWindow: async ({ actor, params, body }) => ({ order: await orders.choosePickupWindow(actor, params.orderId, body) }),
    markShipped: async ({ actor, params, body }) => ({ order: await orders.markShipped(actor, params.orderId, body) }),
    markHandedOver: async ({ actor, params, body }) => ({ order: await orders.markHandedOver(actor, params.orderId, body) }),
    confirmReceipt: async ({ actor, params }) => ({ order: await orders.confirmReceipt(actor, params.orderId) }),
    reportProblem: async ({ actor, params, body }) => ({ order: await orders.reportProblem(actor, params.orderId, body) }),
    cancelOrder: async ({ actor, params, body }) => ({ order: await orders.cancel(actor, params.orderId, body) }),
    /**
     * The provider's webhook: the raw body, verified by the payments port into one of our payment
     * events, then handled once per event id. Its row needs no anti-forgery token: the signature is its proof.
     */
    paymentWebhook: async ({ req, body }) => {
      let event: PaymentEvent | null;
      try {
        event = payments.verifyWebhook(Buffer.isBuffer(body) ? body : Buffer.alloc(0), req.get(payments.webhookSignatureHeader));
      } catch (error) {
        if (!(error instanceof WebhookNotVerified)) throw error;
        throw new AppError("bad_signature", "The webhook signature did not verify.");
      }
      // Genuine, but nothing Grainyard acts on.
      if (!event) return { received: true, outcome: "ignored" };
      return { received: true, outcome: await checkout.handleEvent(event) };
    },
  };
}
