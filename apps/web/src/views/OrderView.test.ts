import { afterEach, describe, expect, it, vi } from "vitest";
import { flushPromises } from "@vue/test-utils";
import { orderEndpoints, pathOf, type Order } from "@grainyard/contracts";
import OrderView from "./OrderView.vue";
import { mountView } from "../test/mount-view.ts";
import { transport } from "../api/http.ts";
import { buyerAccount, sawyerAccount } from "../test/fixtures.ts";

const orderId = "0d7e7a52-3333-4000-8000-000000000003";
const orderPath = pathOf(orderEndpoints.getOrder, { orderId });
const noSteps = {
  paidAt: null,
  readyForPickupAt: null,
  pickupChosenAt: null,
  shippedAt: null,
  handedOverAt: null,
  completedAt: null,
  cancelledAt: null,
  refundedAt: null,
};
const baseOrder: Order = {
  id: orderId,
  status: "awaiting_payment",
  listingId: "lst_oak",
  title: "Wide red oak dining slab, seats eight",
  currency: "USD",
  priceMinor: 114_418,
  taxMinor: 0,
  totalMinor: 114_418,
  handover: "pickup",
  deliveryAddress: null,
  reservedUntil: "2026-12-03T15:34:00.000Z",
  paymentPageUrl: "http://127.0.0.1:1/pay/cs_1",
  paidAt: null,
  slabs: [],
  sawyerShare: null,
  createdAt: "2026-12-03T15:04:00.000Z",
  viewerIs: "buyer",
  parties: { buyerName: "Ana and Theo Brandt", yardName: "Ridgeback Urban Timber", pickupTown: "Lakemont" },
  pickupWindows: [],
  pickupTimeZone: "America/Detroit",
  pickupAddress: null,
  chosenPickupWindow: null,
  carrier: null,
  trackingReference: null,
  steps: noSteps,
  completedBy: null,
  cancelledBy: null,
  cancelReason: null,
  handOverNote: null,
  autoCompleteAt: null,
  problem: null,
  actions: [],
};
const paid = (over: Partial<Order> = {}): Order => ({
  ...baseOrder,
  status: "paid",
  paymentPageUrl: null,
  paidAt: "2026-12-03T15:05:00.000Z",
  steps: { ...noSteps, paidAt: "2026-12-03T15:05:00.000Z" },
  ...over,
});

afterEach(() => {
  transport.useFetch(undefined);
  document.body.innerHTML = "";
});

const text = (selector: string) => document.querySelector(selector)?.textContent?.trim() ?? "";

describe("OrderView", () => {
  it("calls an unpaid order 'Waiting for payment', offers the payment page again, and shows it paid once the provider's word arrives", async () => {
    await mountView(OrderView, {
      path: `/orders/${orderId}`,
      session: { account: buyerAccount },
      answers: {
        [`GET ${orderPath}`]: [
          { status: 200, body: { order: baseOrder } },
          { status: 200, body: { order: paid() } },
        ],
      },
    });
    expect(text('[data-test="order-status"]')).toBe("Waiting for payment");
    expect(text('[data-test="payment-pending"] h2')).toBe("Not paid yet");
    expect(document.querySelector('[data-test="back-to-payment"]')?.getAttribute("href")).toBe(baseOrder.paymentPageUrl);
    // The page asks again every two seconds while the order awaits payment.
    await vi.waitFor(() => expect(text('[data-test="order-status"]')).toBe("Paid"), { timeout: 6_000, interval: 100 });
    expect(document.querySelector('[data-test="payment-pending"]')).toBeNull();
  });

  it("says the payment is being confirmed only when the buyer came back from the payment page having paid", async () => {
    await mountView(OrderView, {
      path: `/orders/${orderId}?paid=1`,
      session: { account: buyerAccount },
      answers: { [`GET ${orderPath}`]: [{ status: 200, body: { order: baseOrder } }] },
    });
    expect(text('[data-test="order-status"]')).toBe("Payment being confirmed");
    expect(text('[data-test="payment-pending"] h2')).toBe("Payment being confirmed");
    expect(document.querySelector('[data-test="back-to-payment"]')).toBeNull();
  });

  it("tells a buyer who left the payment page that the slab stays reserved", async () => {
    await mountView(OrderView, {
      path: `/orders/${orderId}?cancelled=1`,
      session: { account: buyerAccount },
      answers: { [`GET ${orderPath}`]: [{ status: 200, body: { order: baseOrder } }] },
    });
    expect(text('[data-test="order-status"]')).toBe("Waiting for payment");
    expect(text('[data-test="payment-pending"] h2')).toBe("You left the payment page");
  });

  it("marks a pickup handed over after a confirmation; the step's answer redraws the order without asking again", async () => {
    const window = { startsAt: "2026-12-01T09:00:00.000Z", endsAt: "2026-12-01T11:00:00.000Z" };
    const ready = paid({
      status: "ready_for_pickup",
      viewerIs: "sawyer",
      pickupWindows: [window],
      chosenPickupWindow: window,
      pickupAddress: "Ridgeback yard, gate B",
      actions: ["mark_handed_over", "cancel"],
    });
    const handedOver = { ...ready, status: "handed_over" as const, actions: [] };
    const { fetchMock } = await mountView(OrderView, {
      path: `/orders/${orderId}`,
      session: { account: sawyerAccount },
      answers: {
        [`GET ${orderPath}`]: [{ status: 200, body: { order: ready } }],
        [`POST ${pathOf(orderEndpoints.markHandedOver, { orderId })}`]: [{ status: 200, body: { order: handedOver } }],
      },
    });
    expect(text('[data-test="order-status"]')).toBe("Ready for pickup");
    (document.querySelector('[data-test="mark-handed-over"]') as HTMLElement).click();
    await flushPromises();
    // The booked time has passed: no reason is asked for.
    expect(document.querySelector('[data-test="handover-early"]')).toBeNull();
    (document.querySelector('[data-test="confirm"]') as HTMLElement).click();
    await flushPromises();
    const post = fetchMock.mock.calls.find(([, init]) => init?.method === "POST")!;
    expect(JSON.parse(String(post[1]!.body))).toEqual({});
    expect(text('[data-test="order-status"]')).toBe("Handed over");
    // Nothing left for the sawyer to do: the page says what the buyer does next, in words for the sawyer.
    expect(document.querySelector('[data-test="mark-handed-over"]')).toBeNull();
    expect(text('[data-test="waiting-note"]')).toBe("The buyer is asked to confirm they have it; otherwise it completes by itself.");
    expect(fetchMock.mock.calls.filter(([url]) => String(url).startsWith(orderPath) && !String(url).includes("/handed-over"))).toHaveLength(
      1,
    );
  });

  it("lets the buyer report a problem instead of confirming receipt: a choice and their words, then the order waits for the desk", async () => {
    const handedOver = paid({
      status: "handed_over",
      handover: "freight",
      deliveryAddress: "7 Heron Walk, Lakemont",
      steps: { ...noSteps, paidAt: "2026-12-03T15:05:00.000Z", handedOverAt: "2026-12-04T10:00:00.000Z" },
      autoCompleteAt: "2026-12-18T10:00:00.000Z",
      actions: ["confirm_receipt", "report_problem"],
    });
    const comment = "A split runs the whole length that the photos did not show.";
    const reported: Order = {
      ...handedOver,
      status: "problem_reported",
      autoCompleteAt: null,
      actions: [],
      problem: {
        id: "prb-1",
        kind: "not_as_described",
        comment,
        status: "open",
        reportedAt: "2026-12-04T12:00:00.000Z",
        resolutionNote: null,
        resolvedAt: null,
        refundedMinor: null,
      },
    };
    const { fetchMock } = await mountView(OrderView, {
      path: `/orders/${orderId}`,
      session: { account: buyerAccount },
      answers: {
        [`GET ${orderPath}`]: [{ status: 200, body: { order: handedOver } }],
        [`POST ${pathOf(orderEndpoints.reportProblem, { orderId })}`]: [{ status: 201, body: { order: reported } }],
      },
    });
    (document.querySelector('[data-test="report-problem"]') as HTMLElement).click();
    await flushPromises();
    // Nothing chosen or said yet: the form says what is missing and sends nothing.
    (document.querySelector('[data-test="confirm"]') as HTMLElement).click();
    await flushPromises();
    expect(document.querySelector('[data-test="report-problem-form"]')?.textContent).toContain("Choose what is wrong.");
    expect(fetchMock.mock.calls.filter(([, init]) => init?.method === "POST")).toHaveLength(0);

    (document.querySelector('[data-test="problem-not_as_described"]') as HTMLInputElement).click();
    const box = document.querySelector('[data-test="problem-comment"]') as HTMLTextAreaElement;
    box.value = comment;
    box.dispatchEvent(new Event("input"));
    await flushPromises();
    (document.querySelector('[data-test="confirm"]') as HTMLElement).click();
    await flushPromises();
    const post = fetchMock.mock.calls.find(([, init]) => init?.method === "POST")!;
    expect(JSON.parse(String(post[1]!.body))).toEqual({ kind: "not_as_described", comment });
    expect(text('[data-test="order-status"]')).toBe("Problem reported");
    expect(text('[data-test="problem-comment-shown"]')).toBe(comment);
    expect(text('[data-test="problem-outcome"]')).toBe("Our desk is looking at it and will write to you and the sawyer.");
    expect(document.querySelector('[data-test="confirm-receipt"]')).toBeNull();
  });
});
