import { resolve } from "node:path";
import { createPaymentsFakeApp } from "./app.ts";

// Standalone start: `pnpm --filter @grainyard/payments-fake start` (the devstack runs it in-process).
const port = Number(process.env.PAYMENTS_FAKE_PORT ?? 5082);
const app = createPaymentsFakeApp({
  stateFile: resolve(process.env.PAYMENTS_FAKE_STATE ?? ".data/payments-fake/state.json"),
  secretKey: process.env.PAYMENTS_SECRET_KEY ?? "sk_test_grainyard_local",
  webhook: process.env.PAYMENTS_WEBHOOK_URL
    ? { url: process.env.PAYMENTS_WEBHOOK_URL, secret: process.env.PAYMENTS_WEBHOOK_SECRET ?? "whsec_grainyard_local" }
    : undefined,
});
app.listen(port, "127.0.0.1", () => console.log(`payments fake on http://127.0.0.1:${port}`));
