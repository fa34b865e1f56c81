export { createPaymentsFakeApp, type PaymentsFakeOptions } from "./app.ts";
