import { createHmac } from "node:crypto";
import type { ProviderObject, Store } from "./store.ts";
import { newId, nowSeconds } from "./store.ts";
import { request as httpRequest } from "node:http";
import { request as httpsRequest } from "node:https";

/**
 * Signs a payload the way the provider does: header `t=<unix seconds>,v1=<hex HMAC-SHA256 of
 * "<t>.<payload>" with the endpoint's signing secret>`. The official SDK's constructEvent checks it.
 */
export function signatureHeader(payload: string, secret: string, timestamp = nowSeconds()): string {
  const signature = createHmac("sha256", secret).update(`${timestamp}.${payload}`).digest("hex");
  return `t=${timestamp},v1=${signature}`;
}

export interface DeliveryOptions {
  /** Where events are posted (the API's webhook route); none → events are only stored. */
  url?: string;
  secret: string;
  /** First retry after this many ms, doubling each time (the provider backs off the same way). */
  retryBaseMs: number;
  maxAttempts: number;
  /** For tests: deliver each event this many times … */
  copies: number;
  /** … and in a shuffled order within a batch. */
  shuffle: boolean;
}

interface Pending {
  eventId: string;
  attempt: number;
}

/**
 * Creates events and posts them, signed, to the webhook URL; a failed delivery (network error or
 * a non-2xx answer) is retried with exponential back-off, as the provider does.
 */
export class WebhookSender {
  private timers = new Set<NodeJS.Timeout>();
  private batch: Pending[] = [];
  private flushScheduled = false;
  readonly attempts: { eventId: string; status: number | "network_error" }[] = [];
  private inFlight = 0;
  private idleWaiters: (() => void)[] = [];

  constructor(
    private readonly store: Store,
    readonly options: DeliveryOptions,
  ) {}

  emit(type: string, object: ProviderObject, previous?: Record<string, unknown>): ProviderObject {
    const event = this.store.put({
      id: newId("evt"),
      object: "event",
      api_version: "2025-01-01",
      created: nowSeconds(),
      livemode: false,
      type,
      data: { object: structuredClone(object), ...(previous ? { previous_attributes: previous } : {}) },
      pending_webhooks: 1,
      request: { id: null, idempotency_key: null },
    });
    this.store.state.events.push(event.id);
    this.store.save();
    for (let copy = 0; copy < Math.max(1, this.options.copies); copy++) this.batch.push({ eventId: event.id, attempt: 1 });
    if (!this.flushScheduled) {
      this.flushScheduled = true;
      // Events of one request go out together, so a test can ask for them shuffled.
      queueMicrotask(() => this.flush());
    }
    return event;
  }

  private flush(): void {
    this.flushScheduled = false;
    const batch = this.batch;
    this.batch = [];
    if (this.options.shuffle) batch.sort(() => Math.random() - 0.5);
    for (const pending of batch) void this.deliver(pending);
    this.wakeIfIdle();
  }

  private async deliver(pending: Pending): Promise<void> {
    this.inFlight += 1;
    try {
      await this.deliverOnce(pending);
    } finally {
      this.inFlight -= 1;
      this.wakeIfIdle();
    }
  }

  private async deliverOnce(pending: Pending): Promise<void> {
    const url = this.options.url;
    if (!url) return;
    const event = this.store.get(pending.eventId);
    if (!event) return;
    const payload = JSON.stringify(event, null, 2);
    let status: number | "network_error";
    try {
      status = await postOnce(
        url,
        {
          "content-type": "application/json; charset=utf-8",
          "stripe-signature": signatureHeader(payload, this.options.secret),
          "user-agent": "GrainyardPaymentsFake/1.0",
        },
        payload,
        10_000,
      );
    } catch {
      status = "network_error";
    }
    this.attempts.push({ eventId: pending.eventId, status });
    const delivered = typeof status === "number" && status >= 200 && status < 300;
    if (!delivered && pending.attempt < this.options.maxAttempts) {
      const delay = this.options.retryBaseMs * 2 ** (pending.attempt - 1);
      const timer = setTimeout(() => {
        this.timers.delete(timer);
        void this.deliver({ eventId: pending.eventId, attempt: pending.attempt + 1 });
      }, delay);
      timer.unref();
      this.timers.add(timer);
    }
  }

  private idle(): boolean {
    return this.inFlight === 0 && this.batch.length === 0 && !this.flushScheduled && this.timers.size === 0;
  }

  private wakeIfIdle(): void {
    if (!this.idle()) return;
    for (const wake of this.idleWaiters.splice(0)) wake();
  }

  /**
   * Resolves once nothing is queued, in flight or waiting to be retried: every copy of every
   * event emitted so far has had its answer. Tests wait on this instead of a fixed time.
   */
  settled(): Promise<void> {
    if (this.idle()) return Promise.resolve();
    return new Promise((resolve) => this.idleWaiters.push(resolve));
  }

  /** How many copies of the event (of every event, without an id) the receiver answered with 2xx. */
  deliveredCopies(eventId?: string): number {
    return this.attempts.filter(
      (a) => (eventId === undefined || a.eventId === eventId) && typeof a.status === "number" && a.status < 300 && a.status >= 200,
    ).length;
  }

  /** Resends every stored event (a test helper, like the provider's "resend" button). */
  resendAll(): void {
    for (const id of this.store.state.events) this.batch.push({ eventId: id, attempt: 1 });
    this.flush();
  }

  stop(): void {
    for (const timer of this.timers) clearTimeout(timer);
    this.timers.clear();
  }
}

/**
 * One POST through node:http, answering the status. Not fetch: fetch refuses the "bad ports" of
 * the Fetch standard (10080 among them), and a local stack's port base may land on one.
 */
function postOnce(url: string, headers: Record<string, string>, body: string, timeoutMs: number): Promise<number> {
  return new Promise((resolvePromise, reject) => {
    const target = new URL(url);
    const send = target.protocol === "https:" ? httpsRequest : httpRequest;
    const request = send(
      target,
      { method: "POST", headers: { ...headers, "content-length": Buffer.byteLength(body) }, timeout: timeoutMs },
      (response) => {
        // The status is known with the headers (as with fetch); the body is read and dropped.
        response.resume();
        resolvePromise(response.statusCode ?? 0);
      },
    );
    request.on("timeout", () => request.destroy(new Error("timed out")));
    request.on("error", reject);
    request.end(body);
  });
}
