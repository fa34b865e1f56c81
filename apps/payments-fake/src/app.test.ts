import { mkdtempSync, readFileSync, rmSync } from "node:fs";
import { createServer, type IncomingMessage, type Server } from "node:http";
import type { AddressInfo } from "node:net";
import { tmpdir } from "node:os";
import { join } from "node:path";
import Stripe from "stripe";
import { afterAll, beforeAll, beforeEach, describe, expect, it } from "vitest";
import { createPaymentsFakeApp, type PaymentsFakeApp } from "./app.ts";

const SECRET_KEY = "sk_test_unit";
const WEBHOOK_SECRET = "whsec_unit_secret";
const dir = mkdtempSync(join(tmpdir(), "payments-fake-"));
const stateFile = join(dir, "state.json");

/** A stand-in for the API's webhook route: keeps the raw bodies and signatures; can fail on request. */
interface Received {
  body: string;
  signature: string;
}
const received: Received[] = [];
let failNext = 0;
const receiver: Server = createServer((req: IncomingMessage, res) => {
  let body = "";
  req.on("data", (chunk) => (body += chunk));
  req.on("end", () => {
    if (failNext > 0) {
      failNext -= 1;
      res.writeHead(500).end("down for a moment");
      return;
    }
    received.push({ body, signature: String(req.headers["stripe-signature"] ?? "") });
    res.writeHead(200, { "content-type": "application/json" }).end('{"received":true}');
  });
});

let fake: PaymentsFakeApp;
let server: Server;
let base = "";
let sdk: Stripe;

async function listen(app: PaymentsFakeApp): Promise<Server> {
  const s = app.listen(0, "127.0.0.1");
  await new Promise((r) => s.once("listening", r));
  return s;
}

beforeAll(async () => {
  await new Promise<void>((r) => receiver.listen(0, "127.0.0.1", () => r()));
  const receiverUrl = `http://127.0.0.1:${(receiver.address() as AddressInfo).port}/webhook`;
  fake = createPaymentsFakeApp({
    stateFile,
    secretKey: SECRET_KEY,
    webhook: { url: receiverUrl, secret: WEBHOOK_SECRET, retryBaseMs: 20, maxAttempts: 4 },
  });
  server = await listen(fake);
  const port = (server.address() as AddressInfo).port;
  base = `http://127.0.0.1:${port}`;
  sdk = new Stripe(SECRET_KEY, { host: "127.0.0.1", port, protocol: "http", maxNetworkRetries: 0, telemetry: false });
});
afterAll(async () => {
  fake.webhooks.stop();
  await new Promise((r) => server.close(r));
  await new Promise((r) => receiver.close(r));
  rmSync(dir, { recursive: true, force: true });
});
beforeEach(() => {
  fake.webhooks.options.copies = 1;
  fake.webhooks.options.shuffle = false;
});

const events = (type: string) => received.map((r) => JSON.parse(r.body) as Stripe.Event).filter((e) => e.type === type);
const waitFor = async (check: () => boolean, ms = 3000) => {
  const deadline = Date.now() + ms;
  while (!check()) {
    if (Date.now() > deadline) throw new Error("timed out waiting for webhooks");
    await new Promise((r) => setTimeout(r, 20));
  }
};

function newSession(extra: Partial<Stripe.Checkout.SessionCreateParams> = {}) {
  return sdk.checkout.sessions.create({
    mode: "payment",
    success_url: "http://127.0.0.1:5080/orders/o1?session={CHECKOUT_SESSION_ID}",
    cancel_url: "http://127.0.0.1:5080/slabs/l1",
    line_items: [{ quantity: 1, price_data: { currency: "usd", unit_amount: 48_500, product_data: { name: "Black walnut slab" } } }],
    metadata: { order_id: "order-1" },
    ...extra,
  });
}

async function pay(sessionId: string, card: string) {
  return fetch(`${base}/pay/${sessionId}`, {
    method: "POST",
    headers: { "content-type": "application/x-www-form-urlencoded" },
    body: new URLSearchParams({ card, expiry: "12/34", cvc: "123", email: "ana.theo@lakemont.test" }),
    redirect: "manual",
  });
}

describe("the provider's protocol, through the official SDK", () => {
  it("answers health and keeps its state in a file", async () => {
    const res = await fetch(`${base}/health`);
    expect(((await res.json()) as { status: string }).status).toBe("ok");
    expect(JSON.parse(readFileSync(stateFile, "utf8")).createdAt).toBeTruthy();
  });

  it("maps errors to the SDK's typed errors", async () => {
    const wrongKey = new Stripe("sk_test_wrong", {
      host: "127.0.0.1",
      port: Number(new URL(base).port),
      protocol: "http",
      maxNetworkRetries: 0,
      telemetry: false,
    });
    await expect(wrongKey.balance.retrieve()).rejects.toMatchObject({ type: "StripeAuthenticationError", statusCode: 401 });
    await expect(sdk.checkout.sessions.retrieve("cs_test_nothing")).rejects.toMatchObject({
      type: "StripeInvalidRequestError",
      statusCode: 404,
      code: "resource_missing",
    });
    await expect(
      sdk.checkout.sessions.create({ mode: "payment", success_url: "http://x.test/ok" } as Stripe.Checkout.SessionCreateParams),
    ).rejects.toMatchObject({ statusCode: 400, param: "line_items" });
  });

  it("honours idempotency keys: the same key returns the same object", async () => {
    const first = await newSession();
    const again1 = await sdk.checkout.sessions.create(
      {
        mode: "payment",
        success_url: "http://127.0.0.1/ok",
        line_items: [{ quantity: 1, price_data: { currency: "usd", unit_amount: 100, product_data: { name: "x" } } }],
      },
      { idempotencyKey: "order-77" },
    );
    const again2 = await sdk.checkout.sessions.create(
      {
        mode: "payment",
        success_url: "http://127.0.0.1/ok",
        line_items: [{ quantity: 1, price_data: { currency: "usd", unit_amount: 100, product_data: { name: "x" } } }],
      },
      { idempotencyKey: "order-77" },
    );
    expect(again2.id).toBe(again1.id);
    expect(again1.id).not.toBe(first.id);
    await expect(sdk.refunds.create({ payment_intent: "pi_x" }, { idempotencyKey: "order-77" })).rejects.toMatchObject({
      type: "StripeIdempotencyError",
    });
  });
});

describe("hosted checkout and test cards", () => {
  it("pays with 4242 4242 4242 4242: redirects to the success URL and sends a signed checkout.session.completed", async () => {
    const session = await newSession();
    expect(session.url).toBe(`${base}/pay/${session.id}`);
    expect(session).toMatchObject({
      status: "open",
      payment_status: "unpaid",
      amount_total: 48_500,
      currency: "usd",
      metadata: { order_id: "order-1" },
    });
    const pageHtml = await (await fetch(session.url!)).text();
    expect(pageHtml).toContain("TEST MODE");
    expect(pageHtml).toContain("$485.00");
    const res = await pay(session.id, "4242 4242 4242 4242");
    expect(res.status).toBe(303);
    expect(res.headers.get("location")).toBe(`http://127.0.0.1:5080/orders/o1?session=${session.id}`);
    const paid = await sdk.checkout.sessions.retrieve(session.id);
    expect(paid).toMatchObject({ status: "complete", payment_status: "paid" });
    const intent = await sdk.paymentIntents.retrieve(String(paid.payment_intent));
    expect(intent).toMatchObject({ status: "succeeded", amount_received: 48_500, metadata: { order_id: "order-1" } });

    await waitFor(() => events("checkout.session.completed").some((e) => (e.data.object as Stripe.Checkout.Session).id === session.id));
    const delivery = received.find((r) => r.body.includes(session.id) && r.body.includes("checkout.session.completed"))!;
    // The SDK's own verification accepts the fake's signature …
    const event = sdk.webhooks.constructEvent(delivery.body, delivery.signature, WEBHOOK_SECRET);
    expect(event.type).toBe("checkout.session.completed");
    // … and rejects a tampered body or a wrong secret.
    expect(() => sdk.webhooks.constructEvent(delivery.body.replace("48500", "1"), delivery.signature, WEBHOOK_SECRET)).toThrow(
      /signature/i,
    );
    expect(() => sdk.webhooks.constructEvent(delivery.body, delivery.signature, "whsec_other")).toThrow(/signature/i);
    expect(() => sdk.webhooks.constructEvent(delivery.body, "", WEBHOOK_SECRET)).toThrow();
  });

  it("declines 4000 0000 0000 0002 and 4000 0000 0000 9995 with the right messages; the session stays open", async () => {
    const session = await newSession();
    const declined = await pay(session.id, "4000000000000002");
    expect(declined.status).toBe(402);
    expect(await declined.text()).toContain("Your card was declined.");
    const poor = await pay(session.id, "4000 0000 0000 9995");
    expect(await poor.text()).toContain("insufficient funds");
    const unknown = await pay(session.id, "1234 5678 9012 3456");
    expect(await unknown.text()).toContain("Use one of the test cards");
    expect((await sdk.checkout.sessions.retrieve(session.id)).status).toBe("open");
    await waitFor(() => events("payment_intent.payment_failed").length >= 2);
    const failure = events("payment_intent.payment_failed").at(-1)!.data.object as Stripe.PaymentIntent;
    expect(failure.last_payment_error?.code).toBe("insufficient_funds");
  });

  it("expires an open session once, with an event; its page then says so", async () => {
    const session = await newSession();
    const expired = await sdk.checkout.sessions.expire(session.id);
    expect(expired.status).toBe("expired");
    await expect(sdk.checkout.sessions.expire(session.id)).rejects.toMatchObject({ statusCode: 400 });
    expect((await fetch(session.url!)).status).toBe(410);
    await waitFor(() => events("checkout.session.expired").some((e) => (e.data.object as Stripe.Checkout.Session).id === session.id));
  });

  it("cancelling on the hosted page goes back to the cancel URL", async () => {
    const session = await newSession();
    const res = await fetch(`${base}/pay/${session.id}/cancel`, { method: "POST", redirect: "manual" });
    expect(res.headers.get("location")).toBe("http://127.0.0.1:5080/slabs/l1");
  });
});

describe("refunds", () => {
  it("refunds part, then the rest; never more than was paid", async () => {
    const session = await newSession();
    await pay(session.id, "4242424242424242");
    const intentId = String((await sdk.checkout.sessions.retrieve(session.id)).payment_intent);
    const part = await sdk.refunds.create({ payment_intent: intentId, amount: 10_000, reason: "requested_by_customer" });
    expect(part).toMatchObject({ amount: 10_000, status: "succeeded", payment_intent: intentId });
    await expect(sdk.refunds.create({ payment_intent: intentId, amount: 40_000 })).rejects.toMatchObject({
      statusCode: 400,
      code: "amount_too_large",
    });
    const rest = await sdk.refunds.create({ payment_intent: intentId });
    expect(rest.amount).toBe(38_500);
    expect((await sdk.refunds.retrieve(rest.id)).amount).toBe(38_500);
    await waitFor(() => events("charge.refunded").filter((e) => (e.data.object as Stripe.Charge).payment_intent === intentId).length === 2);
    const last = events("charge.refunded")
      .filter((e) => (e.data.object as Stripe.Charge).payment_intent === intentId)
      .at(-1)!.data.object as Stripe.Charge;
    expect(last).toMatchObject({ amount_refunded: 48_500, refunded: true });
  });
});

describe("connected accounts, transfers and balance", () => {
  it("onboards a sawyer through the hosted page, then transfers within the platform balance", async () => {
    const account = await sdk.accounts.create({ type: "express", email: "yard@ridgeback-timber.test", metadata: { sawyer_id: "s1" } });
    expect(account.payouts_enabled).toBe(false);
    await expect(sdk.transfers.create({ amount: 1000, currency: "usd", destination: account.id })).rejects.toMatchObject({
      code: "account_not_ready",
    });
    const link = await sdk.accountLinks.create({
      account: account.id,
      type: "account_onboarding",
      return_url: "http://127.0.0.1:5080/yard/payouts?done=1",
      refresh_url: "http://127.0.0.1:5080/yard/payouts",
    });
    expect(await (await fetch(link.url)).text()).toContain("Set up payouts");
    const finished = await fetch(`${base}/onboard/${account.id}`, {
      method: "POST",
      headers: { "content-type": "application/x-www-form-urlencoded" },
      body: new URLSearchParams({ name: "Ridgeback Urban Timber", return_url: "http://127.0.0.1:5080/yard/payouts?done=1" }),
      redirect: "manual",
    });
    expect(finished.headers.get("location")).toBe("http://127.0.0.1:5080/yard/payouts?done=1");
    expect((await sdk.accounts.retrieve(account.id)).payouts_enabled).toBe(true);
    await waitFor(() => events("account.updated").some((e) => (e.data.object as Stripe.Account).id === account.id));

    const before = (await sdk.balance.retrieve()).available.find((b) => b.currency === "usd")!.amount;
    expect(before).toBeGreaterThan(0);
    const transfer = await sdk.transfers.create(
      { amount: 2_000, currency: "usd", destination: account.id, metadata: { payout_id: "p1" } },
      { idempotencyKey: "payout-p1" },
    );
    const twice = await sdk.transfers.create(
      { amount: 2_000, currency: "usd", destination: account.id, metadata: { payout_id: "p1" } },
      { idempotencyKey: "payout-p1" },
    );
    expect(twice.id).toBe(transfer.id); // approving the same payout twice sends money once
    const after = (await sdk.balance.retrieve()).available.find((b) => b.currency === "usd")!.amount;
    expect(after).toBe(before - 2_000);
    await expect(sdk.transfers.create({ amount: after + 1, currency: "usd", destination: account.id })).rejects.toMatchObject({
      code: "balance_insufficient",
    });
  });
});

describe("webhook delivery", () => {
  it("retries with back-off while the receiver fails, until it answers 2xx", async () => {
    const before = fake.webhooks.attempts.length;
    failNext = 2;
    const session = await newSession();
    await sdk.checkout.sessions.expire(session.id);
    await waitFor(() => events("checkout.session.expired").some((e) => (e.data.object as Stripe.Checkout.Session).id === session.id));
    // The receiver stores the event before it answers: wait for the fake to record that answer too.
    await waitFor(() => fake.webhooks.attempts.slice(before).some((a) => a.status === 200));
    const attempts = fake.webhooks.attempts.slice(before);
    expect(attempts.map((a) => a.status)).toEqual([500, 500, 200]);
  });

  it("delivers each event several times on request (for idempotency tests)", async () => {
    await fetch(`${base}/_test/webhooks`, {
      method: "POST",
      headers: { "content-type": "application/json" },
      body: JSON.stringify({ copies: 3, shuffle: true }),
    });
    const session = await newSession();
    await pay(session.id, "4242424242424242");
    await waitFor(
      () => received.filter((r) => r.body.includes(session.id) && r.body.includes('"checkout.session.completed"')).length === 3,
    );
    const ids = new Set(
      received
        .filter((r) => r.body.includes(session.id) && r.body.includes('"checkout.session.completed"'))
        .map((r) => (JSON.parse(r.body) as Stripe.Event).id),
    );
    expect(ids.size).toBe(1); // the same event id each time
  });

  it("says when every copy has had its answer, and how many were answered 2xx", async () => {
    fake.webhooks.options.copies = 3;
    try {
      const session = await newSession();
      failNext = 1; // one copy fails once and is retried
      await sdk.checkout.sessions.expire(session.id);
      await fake.webhooks.settled();
      const event = events("checkout.session.expired").find((e) => (e.data.object as Stripe.Checkout.Session).id === session.id)!;
      expect(fake.webhooks.deliveredCopies(event.id)).toBe(3);
      expect(fake.webhooks.attempts.filter((a) => a.eventId === event.id).map((a) => a.status)).toContain(500);
      // Nothing in flight: settled answers at once.
      await fake.webhooks.settled();
    } finally {
      fake.webhooks.options.copies = 1;
    }
  });
});

describe("restarts", () => {
  it("keeps sessions and payments across a restart", async () => {
    const session = await newSession();
    const restarted = createPaymentsFakeApp({ stateFile, secretKey: SECRET_KEY });
    const other = await listen(restarted);
    try {
      const port = (other.address() as AddressInfo).port;
      const second = new Stripe(SECRET_KEY, { host: "127.0.0.1", port, protocol: "http", maxNetworkRetries: 0, telemetry: false });
      expect((await second.checkout.sessions.retrieve(session.id)).amount_total).toBe(48_500);
    } finally {
      restarted.webhooks.stop();
      await new Promise((r) => other.close(r));
    }
  });
});
