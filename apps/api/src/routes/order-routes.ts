import express, { Router, type Request, type Response } from "express";
import {
  cancellationInputSchema,
  checkoutInputSchema,
  chooseWindowInputSchema,
  pickupWindowsInputSchema,
  shipmentInputSchema,
} from "@grainyard/contracts";
import { parse } from "../http/context.ts";
import { WebhookNotVerified, type PaymentEvent, type PaymentsPort } from "../integrations/payments.ts";
import type { CheckoutService } from "../services/checkout-service.ts";
import type { OrderService } from "../services/order-service.ts";

/** Buying: the quote, checkout, the buyer's and sawyer's orders and every step after payment. */
export function orderRoutes(checkout: CheckoutService, orders: OrderService) {
  const router = Router();
  const id = (req: Request) => String(req.params.orderId);
  router.get("/listings/:listingId/checkout-quote", async (req, res) => {
    res.json({ quote: await checkout.quote(String(req.params.listingId)) });
  });
  router.post("/listings/:listingId/checkout", async (req, res) => {
    res.status(201).json(await checkout.checkout(req.actor, String(req.params.listingId), parse(checkoutInputSchema, req.body)));
  });
  router.get("/orders", async (req, res) => {
    res.json({ orders: await orders.listOwn(req.actor) });
  });
  router.get("/orders/:orderId", async (req, res) => {
    res.json({ order: await orders.get(req.actor, id(req)) });
  });
  router.post("/orders/:orderId/pickup-windows", async (req, res) => {
    res.json({ order: await orders.proposePickupWindows(req.actor, id(req), parse(pickupWindowsInputSchema, req.body)) });
  });
  router.post("/orders/:orderId/pickup-choice", async (req, res) => {
    res.json({ order: await orders.choosePickupWindow(req.actor, id(req), parse(chooseWindowInputSchema, req.body)) });
  });
  router.post("/orders/:orderId/shipment", async (req, res) => {
    res.json({ order: await orders.markShipped(req.actor, id(req), parse(shipmentInputSchema, req.body)) });
  });
  router.post("/orders/:orderId/handed-over", async (req, res) => {
    res.json({ order: await orders.markHandedOver(req.actor, id(req)) });
  });
  router.post("/orders/:orderId/completion", async (req, res) => {
    res.json({ order: await orders.confirmReceipt(req.actor, id(req)) });
  });
  router.post("/orders/:orderId/cancellation", async (req, res) => {
    res.json({ order: await orders.cancel(req.actor, id(req), parse(cancellationInputSchema, req.body)) });
  });
  return router;
}

/**
 * The provider's webhook: the raw body (mounted before the JSON parser), verified by the payments
 * port into one of our payment events, then handled once per event id. Outside the anti-forgery
 * check: it is not a browser, and the signature is its proof.
 */
export function paymentWebhookRoute(checkout: CheckoutService, payments: PaymentsPort) {
  const router = Router();
  router.post("/payments/webhook", express.raw({ type: () => true, limit: "1mb" }), async (req: Request, res: Response) => {
    let event: PaymentEvent | null;
    try {
      event = payments.verifyWebhook(Buffer.isBuffer(req.body) ? req.body : Buffer.alloc(0), req.get(payments.webhookSignatureHeader));
    } catch (error) {
      if (!(error instanceof WebhookNotVerified)) throw error;
      res.status(400).json({ error: { code: "bad_signature", message: "The webhook signature did not verify." } });
      return;
    }
    // Genuine, but nothing Grainyard acts on.
    if (!event) {
      res.json({ received: true, outcome: "ignored" });
      return;
    }
    const outcome = await checkout.handleEvent(event);
    res.json({ received: true, outcome });
  });
  return router;
}
