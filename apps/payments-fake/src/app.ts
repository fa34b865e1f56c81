import express, { type NextFunction, type Request, type Response } from "express";
import { checkoutPage, expiredPage, messagePage, onboardingPage } from "./pages.ts";
import { newId, nowSeconds, Store, type ProviderObject } from "./store.ts";
import { WebhookSender, type DeliveryOptions } from "./webhooks.ts";

/**
 * Grainyard's local stand-in for the card-payment provider. The API talks to it through the
 * official SDK (host/port/protocol options), so it speaks the provider's REST shape: form-encoded
 * requests with bracket keys, JSON objects back, errors as `{ error: { type, message, param?, code? } }`
 * with the matching HTTP status, idempotency keys honoured. The subset Grainyard uses:
 * Checkout Sessions (with a hosted payment page of its own), Payment Intents, Refunds,
 * connected accounts (with a hosted onboarding page), Account Links, Transfers and Balance, and
 * signed webhooks with retries.
 */
export interface PaymentsFakeOptions {
  /** JSON file that keeps the fake's own state across restarts. */
  stateFile: string;
  /** Secret key the API must present (test mode keys start with sk_test_). */
  secretKey: string;
  /** Address of the fake itself, for hosted page links (default http://127.0.0.1:<port>). */
  publicUrl?: string;
  webhook?: Partial<DeliveryOptions>;
}

/** The provider's published test card numbers and what they do. */
export const TEST_CARDS: Record<string, { outcome: "succeeded" } | { outcome: "declined"; code: string; message: string }> = {
  "4242424242424242": { outcome: "succeeded" },
  "4000000000000002": { outcome: "declined", code: "card_declined", message: "Your card was declined." },
  "4000000000009995": { outcome: "declined", code: "insufficient_funds", message: "Your card has insufficient funds." },
};

class ProviderError extends Error {
  constructor(
    readonly status: number,
    readonly type: string,
    message: string,
    readonly extra: { code?: string; param?: string; decline_code?: string } = {},
  ) {
    super(message);
  }
}
const missing = (param: string) =>
  new ProviderError(400, "invalid_request_error", `Missing required param: ${param}.`, { code: "parameter_missing", param });
const noSuch = (kind: string, id: string, param = "id") =>
  new ProviderError(404, "invalid_request_error", `No such ${kind}: '${id}'`, { code: "resource_missing", param });

const integer = (value: unknown, param: string): number => {
  const number = Number(value);
  if (value === undefined || value === "" || !Number.isInteger(number) || number < 0)
    throw new ProviderError(400, "invalid_request_error", `Invalid integer: ${String(value)}`, {
      code: "parameter_invalid_integer",
      param,
    });
  return number;
};
const metadataOf = (value: unknown): Record<string, string> =>
  value && typeof value === "object"
    ? Object.fromEntries(Object.entries(value as Record<string, unknown>).map(([k, v]) => [k, String(v)]))
    : {};

export function createPaymentsFakeApp(options: PaymentsFakeOptions) {
  const store = new Store(options.stateFile);
  const webhooks = new WebhookSender(store, {
    url: options.webhook?.url,
    secret: options.webhook?.secret ?? "whsec_grainyard_local",
    retryBaseMs: options.webhook?.retryBaseMs ?? 1000,
    maxAttempts: options.webhook?.maxAttempts ?? 8,
    copies: options.webhook?.copies ?? 1,
    shuffle: options.webhook?.shuffle ?? false,
  });
  const app = express();
  app.disable("x-powered-by");
  app.use(express.urlencoded({ extended: true, limit: "1mb" }));
  const base = (req: Request) => options.publicUrl ?? `${req.protocol}://${req.get("host")}`;

  // Browsers ask every page's origin for an icon; the hosted pages have none.
  app.get("/favicon.ico", (_req, res) => {
    res.status(204).end();
  });
  app.get("/health", (_req, res) => {
    res.json({ status: "ok", mode: "test", since: store.state.createdAt });
  });

  // ---- The REST API (/v1): the platform's secret key, idempotency keys -------------------------
  const api = express.Router();
  api.use((req: Request, _res: Response, next: NextFunction) => {
    const header = req.get("authorization") ?? "";
    const key = header.startsWith("Bearer ") ? header.slice(7) : "";
    if (key !== options.secretKey)
      return next(new ProviderError(401, "invalid_request_error", "Invalid API key provided.", { code: "api_key_invalid" }));
    next();
  });
  // The same Idempotency-Key on a POST returns the first answer again, without doing the work twice.
  api.use((req: Request, res: Response, next: NextFunction) => {
    const key = req.get("idempotency-key");
    if (req.method !== "POST" || !key) return next();
    const remembered = store.state.idempotency[key];
    if (remembered) {
      if (remembered.requestPath !== req.path)
        return next(
          new ProviderError(
            400,
            "idempotency_error",
            "Keys for idempotent requests can only be used for the same endpoint they were first used for.",
          ),
        );
      res.setHeader("idempotent-replayed", "true");
      return res.status(remembered.status).json(remembered.body);
    }
    const json = res.json.bind(res);
    res.json = (body: unknown) => {
      store.state.idempotency[key] = { status: res.statusCode, body, requestPath: req.path };
      store.save();
      return json(body);
    };
    next();
  });

  // Checkout Sessions
  api.post("/checkout/sessions", (req, res) => {
    const body = req.body as Record<string, any>;
    if (body.mode !== "payment")
      throw new ProviderError(400, "invalid_request_error", "Only mode=payment is supported by this stand-in.", { param: "mode" });
    if (!body.success_url) throw missing("success_url");
    if (!Array.isArray(body.line_items) || body.line_items.length === 0) throw missing("line_items");
    const items = (body.line_items as Record<string, any>[]).map((item, index) => {
      const data = item.price_data ?? {};
      if (!data.currency) throw missing(`line_items[${index}][price_data][currency]`);
      return {
        name: String(data.product_data?.name ?? "Item"),
        amount: integer(data.unit_amount, `line_items[${index}][price_data][unit_amount]`),
        quantity: integer(item.quantity ?? 1, `line_items[${index}][quantity]`),
        currency: String(data.currency).toLowerCase(),
      };
    });
    const currency = items[0]!.currency;
    if (items.some((i) => i.currency !== currency))
      throw new ProviderError(400, "invalid_request_error", "All line items must share one currency.", { param: "line_items" });
    const created = nowSeconds();
    const session = store.put({
      id: newId("cs_test"),
      object: "checkout.session",
      mode: "payment",
      status: "open",
      payment_status: "unpaid",
      amount_total: items.reduce((sum, i) => sum + i.amount * i.quantity, 0),
      amount_subtotal: items.reduce((sum, i) => sum + i.amount * i.quantity, 0),
      currency,
      display_items: items,
      success_url: String(body.success_url),
      cancel_url: body.cancel_url ? String(body.cancel_url) : null,
      client_reference_id: body.client_reference_id ?? null,
      customer_email: body.customer_email ?? null,
      metadata: metadataOf(body.metadata),
      payment_intent: null,
      created,
      expires_at: body.expires_at ? integer(body.expires_at, "expires_at") : created + 24 * 3600,
      url: "",
      livemode: false,
      payment_intent_data: { metadata: metadataOf(body.payment_intent_data?.metadata) },
    });
    session.url = `${base(req)}/pay/${session.id}`;
    store.put(session);
    res.json(publicSession(session));
  });
  api.get("/checkout/sessions/:id", (req, res) => {
    const session = store.get(String(req.params.id), "checkout.session");
    if (!session) throw noSuch("checkout.session", String(req.params.id));
    res.json(publicSession(session));
  });
  api.post("/checkout/sessions/:id/expire", (req, res) => {
    const session = store.get(String(req.params.id), "checkout.session");
    if (!session) throw noSuch("checkout.session", String(req.params.id));
    if (session.status !== "open")
      throw new ProviderError(400, "invalid_request_error", `Only open sessions can be expired; this one is ${String(session.status)}.`, {
        code: "checkout_session_not_open",
      });
    session.status = "expired";
    store.put(session);
    webhooks.emit("checkout.session.expired", publicSession(session));
    res.json(publicSession(session));
  });

  // Payment Intents (made by a paid session)
  api.get("/payment_intents/:id", (req, res) => {
    const intent = store.get(String(req.params.id), "payment_intent");
    if (!intent) throw noSuch("payment_intent", String(req.params.id));
    res.json(intent);
  });

  // Refunds, full or partial
  api.post("/refunds", (req, res) => {
    const body = req.body as Record<string, any>;
    if (!body.payment_intent) throw missing("payment_intent");
    const intent = store.get(String(body.payment_intent), "payment_intent");
    if (!intent) throw noSuch("payment_intent", String(body.payment_intent), "payment_intent");
    if (intent.status !== "succeeded")
      throw new ProviderError(400, "invalid_request_error", "This payment has not succeeded, so there is nothing to refund.", {
        code: "charge_not_refundable",
      });
    const remaining = (intent.amount_received as number) - (intent.amount_refunded as number);
    const amount = body.amount === undefined ? remaining : integer(body.amount, "amount");
    if (amount <= 0 || amount > remaining) {
      throw new ProviderError(
        400,
        "invalid_request_error",
        `Refund amount (${amount}) is greater than the unrefunded amount (${remaining}).`,
        { code: "amount_too_large", param: "amount" },
      );
    }
    intent.amount_refunded = (intent.amount_refunded as number) + amount;
    store.put(intent);
    const refund = store.put({
      id: newId("re"),
      object: "refund",
      amount,
      currency: intent.currency,
      payment_intent: intent.id,
      charge: intent.latest_charge,
      status: "succeeded",
      reason: body.reason ?? null,
      metadata: metadataOf(body.metadata),
      created: nowSeconds(),
    });
    webhooks.emit("refund.created", refund);
    webhooks.emit("charge.refunded", chargeOf(intent));
    res.json(refund);
  });
  api.get("/refunds/:id", (req, res) => {
    const refund = store.get(String(req.params.id), "refund");
    if (!refund) throw noSuch("refund", String(req.params.id));
    res.json(refund);
  });

  // Connected accounts, onboarding links, transfers
  api.post("/accounts", (req, res) => {
    const body = req.body as Record<string, any>;
    const account = store.put({
      id: newId("acct"),
      object: "account",
      type: body.type ?? "express",
      email: body.email ?? null,
      country: body.country ?? "US",
      metadata: metadataOf(body.metadata),
      business_profile: { name: body.business_profile?.name ?? null },
      details_submitted: false,
      charges_enabled: false,
      payouts_enabled: false,
      created: nowSeconds(),
    });
    res.json(account);
  });
  api.get("/accounts/:id", (req, res) => {
    const account = store.get(String(req.params.id), "account");
    if (!account) throw noSuch("account", String(req.params.id));
    res.json(account);
  });
  api.post("/account_links", (req, res) => {
    const body = req.body as Record<string, any>;
    if (!body.account) throw missing("account");
    if (!body.return_url) throw missing("return_url");
    if (!body.refresh_url) throw missing("refresh_url");
    const account = store.get(String(body.account), "account");
    if (!account) throw noSuch("account", String(body.account), "account");
    const query = new URLSearchParams({ return_url: String(body.return_url), refresh_url: String(body.refresh_url) });
    res.json({
      object: "account_link",
      created: nowSeconds(),
      expires_at: nowSeconds() + 300,
      url: `${base(req)}/onboard/${account.id}?${query}`,
    });
  });
  api.post("/transfers", (req, res) => {
    const body = req.body as Record<string, any>;
    const amount = integer(body.amount, "amount");
    if (!body.currency) throw missing("currency");
    if (!body.destination) throw missing("destination");
    const account = store.get(String(body.destination), "account");
    if (!account) throw noSuch("account", String(body.destination), "destination");
    if (!account.payouts_enabled) {
      throw new ProviderError(
        400,
        "invalid_request_error",
        "The destination account has not finished onboarding and cannot receive transfers.",
        { code: "account_not_ready", param: "destination" },
      );
    }
    const currency = String(body.currency).toLowerCase();
    if (amount > availableBalance(currency)) {
      throw new ProviderError(400, "invalid_request_error", "You have insufficient available funds in your platform balance.", {
        code: "balance_insufficient",
        param: "amount",
      });
    }
    const transfer = store.put({
      id: newId("tr"),
      object: "transfer",
      amount,
      currency,
      destination: account.id,
      metadata: metadataOf(body.metadata),
      transfer_group: body.transfer_group ?? null,
      reversed: false,
      created: nowSeconds(),
    });
    webhooks.emit("transfer.created", transfer);
    res.json(transfer);
  });
  api.get("/transfers/:id", (req, res) => {
    const transfer = store.get(String(req.params.id), "transfer");
    if (!transfer) throw noSuch("transfer", String(req.params.id));
    res.json(transfer);
  });

  /** Payments received, less refunds and transfers out (no payout delay in this stand-in). */
  function availableBalance(currency: string): number {
    const received = store
      .all("payment_intent")
      .filter((p) => p.status === "succeeded" && p.currency === currency)
      .reduce((sum, p) => sum + (p.amount_received as number) - (p.amount_refunded as number), 0);
    const sent = store
      .all("transfer")
      .filter((t) => t.currency === currency && !t.reversed)
      .reduce((sum, t) => sum + (t.amount as number), 0);
    return received - sent;
  }
  api.get("/balance", (_req, res) => {
    const currencies = [...new Set([...store.all("payment_intent").map((p) => String(p.currency)), "usd"])];
    res.json({
      object: "balance",
      livemode: false,
      available: currencies.map((currency) => ({ amount: availableBalance(currency), currency })),
      pending: currencies.map((currency) => ({ amount: 0, currency })),
    });
  });

  api.use((req: Request, _res: Response, next: NextFunction) =>
    next(new ProviderError(404, "invalid_request_error", `Unrecognized request URL (${req.method}: /v1${req.path}).`)),
  );
  app.use("/v1", api);

  // ---- The hosted pages ------------------------------------------------------------------------
  app.get("/pay/:id", (req, res) => {
    const session = store.get(String(req.params.id), "checkout.session");
    if (!session) return res.status(404).type("html").send(messagePage("Not found", "There is no payment with this address."));
    if (session.status === "complete") return res.redirect(303, successUrl(session));
    if (!isPayable(session)) return res.status(410).type("html").send(expiredPage(session));
    res.type("html").send(checkoutPage(session));
  });
  app.post("/pay/:id", (req, res) => {
    const session = store.get(String(req.params.id), "checkout.session");
    if (!session) return res.status(404).type("html").send(messagePage("Not found", "There is no payment with this address."));
    if (session.status === "complete") return res.redirect(303, successUrl(session));
    if (!isPayable(session)) return res.status(410).type("html").send(expiredPage(session));
    const card = String((req.body as Record<string, unknown>).card ?? "").replace(/\D/g, "");
    const rule = TEST_CARDS[card];
    if (!rule)
      return res
        .status(402)
        .type("html")
        .send(checkoutPage(session, "Use one of the test cards listed below: this is a local test page, and no real card works here."));
    const intent = paymentIntentFor(session);
    if (rule.outcome === "declined") {
      intent.status = "requires_payment_method";
      intent.last_payment_error = { type: "card_error", code: rule.code, decline_code: rule.code, message: rule.message };
      store.put(intent);
      webhooks.emit("payment_intent.payment_failed", intent);
      return res
        .status(402)
        .type("html")
        .send(checkoutPage(session, `${rule.message} Nothing was charged. Try another card below, or leave without paying.`));
    }
    intent.status = "succeeded";
    intent.amount_received = intent.amount;
    intent.last_payment_error = null;
    intent.latest_charge = newId("ch");
    store.put(intent);
    session.status = "complete";
    session.payment_status = "paid";
    session.customer_email = String((req.body as Record<string, unknown>).email ?? session.customer_email ?? "") || null;
    store.put(session);
    webhooks.emit("payment_intent.succeeded", intent);
    webhooks.emit("checkout.session.completed", publicSession(session));
    res.redirect(303, successUrl(session));
  });
  app.post("/pay/:id/cancel", (req, res) => {
    const session = store.get(String(req.params.id), "checkout.session");
    if (!session) return res.status(404).type("html").send(messagePage("Not found", "There is no payment with this address."));
    res.redirect(303, String(session.cancel_url ?? session.success_url));
  });
  app.get("/onboard/:id", (req, res) => {
    const account = store.get(String(req.params.id), "account");
    if (!account) return res.status(404).type("html").send(messagePage("Not found", "There is no account with this address."));
    res.type("html").send(onboardingPage(account, String(req.query.return_url ?? ""), String(req.query.refresh_url ?? "")));
  });
  app.post("/onboard/:id", (req, res) => {
    const account = store.get(String(req.params.id), "account");
    if (!account) return res.status(404).type("html").send(messagePage("Not found", "There is no account with this address."));
    const body = req.body as Record<string, string>;
    const previous = {
      details_submitted: account.details_submitted,
      payouts_enabled: account.payouts_enabled,
      charges_enabled: account.charges_enabled,
    };
    Object.assign(account, {
      details_submitted: true,
      payouts_enabled: true,
      charges_enabled: true,
      business_profile: { name: body.name ?? null },
    });
    store.put(account);
    webhooks.emit("account.updated", account, previous);
    res.redirect(303, body.return_url || "/");
  });

  // ---- Test controls: how webhooks are delivered (twice, shuffled), and a resend ----------------
  app.post("/_test/webhooks", express.json(), (req, res) => {
    const body = (req.body ?? {}) as { copies?: number; shuffle?: boolean; url?: string; resendAll?: boolean };
    if (body.copies !== undefined) webhooks.options.copies = Math.max(1, Math.min(5, Number(body.copies)));
    if (body.shuffle !== undefined) webhooks.options.shuffle = Boolean(body.shuffle);
    if (body.url !== undefined) webhooks.options.url = body.url || undefined;
    if (body.resendAll) webhooks.resendAll();
    res.json({
      copies: webhooks.options.copies,
      shuffle: webhooks.options.shuffle,
      url: webhooks.options.url ?? null,
      attempts: webhooks.attempts.length,
    });
  });

  app.use((req: Request, res: Response) => {
    res.status(404).json({ error: { type: "invalid_request_error", message: `Unrecognized request URL (${req.method}: ${req.path}).` } });
  });
  app.use((error: unknown, _req: Request, res: Response, _next: NextFunction) => {
    if (error instanceof ProviderError)
      return res.status(error.status).json({ error: { type: error.type, message: error.message, ...error.extra } });
    const status = (error as { status?: number }).status;
    if (status && status < 500)
      return res.status(status).json({ error: { type: "invalid_request_error", message: "The request could not be read." } });
    res.status(500).json({ error: { type: "api_error", message: "Something went wrong in the payments stand-in." } });
  });

  function publicSession(session: ProviderObject) {
    const { display_items: _items, payment_intent_data: _data, ...rest } = session;
    return rest;
  }
  /** Open and not past its expiry: a declined card leaves it open, so the buyer can try another. */
  function isPayable(session: ProviderObject): boolean {
    return session.status === "open" && (session.expires_at as number) > nowSeconds();
  }
  function successUrl(session: ProviderObject): string {
    return String(session.success_url).replace("{CHECKOUT_SESSION_ID}", session.id);
  }
  function paymentIntentFor(session: ProviderObject): ProviderObject {
    if (session.payment_intent) return store.get(String(session.payment_intent))!;
    const intent = store.put({
      id: newId("pi"),
      object: "payment_intent",
      amount: session.amount_total,
      amount_received: 0,
      amount_refunded: 0,
      currency: session.currency,
      status: "requires_payment_method",
      metadata: {
        ...(session.payment_intent_data as { metadata: Record<string, string> }).metadata,
        ...(session.metadata as Record<string, string>),
      },
      latest_charge: null,
      last_payment_error: null,
      created: nowSeconds(),
    });
    session.payment_intent = intent.id;
    store.put(session);
    return intent;
  }
  function chargeOf(intent: ProviderObject) {
    return {
      id: String(intent.latest_charge),
      object: "charge",
      amount: intent.amount,
      amount_captured: intent.amount_received,
      amount_refunded: intent.amount_refunded,
      refunded: intent.amount_refunded === intent.amount_received,
      currency: intent.currency,
      payment_intent: intent.id,
      metadata: intent.metadata,
    };
  }

  return Object.assign(app, { webhooks, store });
}

export type PaymentsFakeApp = ReturnType<typeof createPaymentsFakeApp>;
