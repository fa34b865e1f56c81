export { createPaymentsFakeApp, TEST_CARDS, type PaymentsFakeApp, type PaymentsFakeOptions } from "./app.ts";
export { signatureHeader } from "./webhooks.ts";
