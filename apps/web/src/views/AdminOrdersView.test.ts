import { afterEach, describe, expect, it, vi } from "vitest";
import { flushPromises } from "@vue/test-utils";
import { orderEndpoints, pathOf, type Order } from "@grainyard/contracts";
import AdminOrdersView from "./AdminOrdersView.vue";
import { mountView } from "../test/mount-view.ts";
import { transport } from "../api/http.ts";
import { buyerAccount } from "../test/fixtures.ts";

const admin = { ...buyerAccount, id: "acc_admin", email: "desk@grainyard.test", displayName: "Mirela Sand", role: "admin" };
const searchPath = pathOf(orderEndpoints.searchOrders, {});
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
function order(id: string, title: string, buyerName: string, createdAt: string): Order {
  return {
    id,
    status: "paid",
    listingId: `lst_${id.slice(0, 4)}`,
    title,
    currency: "USD",
    priceMinor: 80_000,
    taxMinor: 0,
    totalMinor: 80_000,
    handover: "pickup",
    deliveryAddress: null,
    reservedUntil: createdAt,
    paymentPageUrl: null,
    paidAt: createdAt,
    slabs: [],
    sawyerShare: { platformFeeMinor: 8_000, processingFeeMinor: 2_350, sawyerNetMinor: 69_650 },
    createdAt,
    viewerIs: "other",
    parties: { buyerName, yardName: "Ridgeback Urban Timber", pickupTown: "Lakemont" },
    pickupWindows: [],
    pickupTimeZone: "America/Chicago",
    problem: null,
    pickupAddress: null,
    chosenPickupWindow: null,
    carrier: null,
    trackingReference: null,
    steps: { ...noSteps, paidAt: createdAt },
    completedBy: null,
    cancelledBy: null,
    cancelReason: null,
    handOverNote: null,
    autoCompleteAt: null,
    actions: [],
  };
}
const maple = order("5a1e0000-0000-4000-8000-000000000003", "Silver maple slab 3", "Wren Halvorsen", "2026-12-03T10:00:00.000Z");
const walnut = order("5a1e0000-0000-4000-8000-000000000002", "Walnut bench slab 1", "Wren Halvorsen", "2026-12-02T10:00:00.000Z");
const elm = order("5a1e0000-0000-4000-8000-000000000001", "American elm counter", "Ada Lindqvist", "2026-12-01T10:00:00.000Z");

afterEach(() => {
  transport.useFetch(undefined);
  document.body.innerHTML = "";
});

const cards = () => [...document.querySelectorAll('[data-test="desk-orders"] li')].map((li) => li.querySelector("strong")?.textContent);
/** The query of each order search the page sent, in order. */
const searches = (fetchMock: { mock: { calls: unknown[][] } }) =>
  fetchMock.mock.calls
    .map(([url]) => new URL(String(url), "http://x"))
    .filter((url) => url.pathname === searchPath)
    .map((url) => Object.fromEntries(url.searchParams));

describe("AdminOrdersView", () => {
  it("shows a loading state, then the newest page; 'Show older orders' appends the next page by its cursor", async () => {
    let release!: () => void;
    const { fetchMock } = await mountView(AdminOrdersView, {
      path: "/admin/orders",
      session: { account: admin },
      answers: {
        [`GET ${searchPath}`]: [
          {
            status: 200,
            body: { orders: [maple, walnut], nextCursor: `1764756000000.${walnut.id}` },
            until: new Promise<void>((r) => (release = r)),
          },
          { status: 200, body: { orders: [elm], nextCursor: null } },
        ],
      },
    });
    expect(document.querySelector('[data-test="orders-loading"]')).not.toBeNull();
    release();
    await flushPromises();
    expect(document.querySelector('[data-test="orders-loading"]')).toBeNull();
    expect(cards()).toEqual(["Silver maple slab 3", "Walnut bench slab 1"]);
    expect(document.body.textContent).toContain("Wren Halvorsen from Ridgeback Urban Timber");

    (document.querySelector('[data-test="orders-more"]') as HTMLElement).click();
    await flushPromises();
    expect(cards()).toEqual(["Silver maple slab 3", "Walnut bench slab 1", "American elm counter"]);
    expect(document.querySelector('[data-test="orders-more"]')).toBeNull();
    expect(document.body.textContent).toContain("That is every order.");
    expect(searches(fetchMock)).toEqual([{ limit: "20" }, { limit: "20", cursor: `1764756000000.${walnut.id}` }]);
  });

  it("searches as the admin types (once typing pauses), keeps the words in the address, and says when no order matches", async () => {
    const { fetchMock, router } = await mountView(AdminOrdersView, {
      path: "/admin/orders",
      session: { account: admin },
      answers: {
        [`GET ${searchPath}`]: [
          { status: 200, body: { orders: [maple, walnut, elm], nextCursor: null } },
          { status: 200, body: { orders: [], nextCursor: null } },
        ],
      },
    });
    const input = document.querySelector<HTMLInputElement>("#order-search")!;
    input.value = "black locust";
    input.dispatchEvent(new Event("input"));
    await vi.waitFor(() => expect(document.querySelector('[data-test="orders-none-match"]')).not.toBeNull(), { timeout: 2_000 });
    expect(document.querySelector('[data-test="orders-none-match"]')!.textContent).toContain("No orders match");
    expect(document.querySelector('[data-test="orders-none-match"]')!.textContent).toContain("“black locust”");
    expect(searches(fetchMock)).toEqual([{ limit: "20" }, { q: "black locust", limit: "20" }]);
    expect(router.currentRoute.value.query.q).toBe("black locust");
  });

  it("opens with the search in the address (the back button returns to it)", async () => {
    const { fetchMock } = await mountView(AdminOrdersView, {
      path: "/admin/orders?q=wren",
      session: { account: admin },
      answers: { [`GET ${searchPath}`]: [{ status: 200, body: { orders: [maple, walnut], nextCursor: null } }] },
    });
    expect(document.querySelector<HTMLInputElement>("#order-search")!.value).toBe("wren");
    expect(searches(fetchMock)).toEqual([{ q: "wren", limit: "20" }]);
    expect(document.body.textContent).toContain("That is every order that matches.");
  });
});
