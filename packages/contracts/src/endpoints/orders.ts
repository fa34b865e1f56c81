import { z } from "zod";
import { endpoint } from "../endpoint.ts";
import {
  cancellationInputSchema,
  checkoutInputSchema,
  checkoutQuoteSchema,
  checkoutResultSchema,
  chooseWindowInputSchema,
  handOverInputSchema,
  orderEnvelopeSchema,
  orderListSchema,
  pickupWindowsInputSchema,
  shipmentInputSchema,
} from "../orders.ts";
import { API_PREFIX } from "./prefix.ts";

const buyerOnly = ["buyer"] as const;
const sawyerOnly = ["sawyer"] as const;

/** Buying: the quote, checkout, each side's orders and every step after payment. */
export const orderEndpoints = {
  getCheckoutQuote: endpoint({
    method: "GET",
    path: `${API_PREFIX}/listings/:listingId/checkout-quote`,
    summary: "What a listing costs in all (price, tax, shipping estimate) before checkout.",
    access: "anyone",
    answer: checkoutQuoteSchema,
  }),
  checkout: endpoint({
    method: "POST",
    path: `${API_PREFIX}/listings/:listingId/checkout`,
    summary: "Reserve the slab and open the provider's hosted checkout.",
    access: buyerOnly,
    body: checkoutInputSchema,
    answer: checkoutResultSchema,
    status: 201,
    errors: ["listing_not_available", "payments_unavailable"],
  }),
  listOrders: endpoint({
    method: "GET",
    path: `${API_PREFIX}/orders`,
    summary: "The buyer's or sawyer's orders; every order (latest 100) for an admin.",
    access: "signed_in",
    answer: orderListSchema,
  }),
  getOrder: endpoint({
    method: "GET",
    path: `${API_PREFIX}/orders/:orderId`,
    summary: "One order, for its buyer, its sawyer or an admin.",
    access: "signed_in",
    answer: orderEnvelopeSchema,
  }),
  proposePickupWindows: endpoint({
    method: "POST",
    path: `${API_PREFIX}/orders/:orderId/pickup-windows`,
    summary: "The sawyer offers pickup times.",
    access: sawyerOnly,
    body: pickupWindowsInputSchema,
    answer: orderEnvelopeSchema,
    errors: ["order_state"],
  }),
  choosePickupWindow: endpoint({
    method: "POST",
    path: `${API_PREFIX}/orders/:orderId/pickup-choice`,
    summary: "The buyer picks one of the offered times.",
    access: buyerOnly,
    body: chooseWindowInputSchema,
    answer: orderEnvelopeSchema,
    errors: ["order_state"],
  }),
  markShipped: endpoint({
    method: "POST",
    path: `${API_PREFIX}/orders/:orderId/shipment`,
    summary: "The sawyer hands a freight order to a carrier.",
    access: sawyerOnly,
    body: shipmentInputSchema,
    answer: orderEnvelopeSchema,
    errors: ["order_state"],
  }),
  markHandedOver: endpoint({
    method: "POST",
    path: `${API_PREFIX}/orders/:orderId/handed-over`,
    summary: "The sawyer says the slab changed hands (with a reason when before the booked pickup time).",
    access: sawyerOnly,
    body: handOverInputSchema,
    answer: orderEnvelopeSchema,
    errors: ["order_state"],
  }),
  confirmReceipt: endpoint({
    method: "POST",
    path: `${API_PREFIX}/orders/:orderId/completion`,
    summary: "The buyer confirms all is well; the order completes.",
    access: buyerOnly,
    answer: orderEnvelopeSchema,
    errors: ["order_state"],
  }),
  cancelOrder: endpoint({
    method: "POST",
    path: `${API_PREFIX}/orders/:orderId/cancellation`,
    summary: "The buyer or sawyer cancels before hand-over, with a full refund.",
    access: ["buyer", "sawyer"],
    body: cancellationInputSchema,
    answer: orderEnvelopeSchema,
    errors: ["order_state", "payments_unavailable"],
  }),
  paymentWebhook: endpoint({
    method: "POST",
    path: `${API_PREFIX}/payments/webhook`,
    summary: "The payment provider's signed events, each handled once.",
    access: "anyone",
    body: "provider_event",
    answer: z.object({ received: z.literal(true), outcome: z.enum(["handled", "duplicate", "ignored"]) }),
    csrfFree: true,
    errors: ["bad_signature"],
  }),
} as const;
