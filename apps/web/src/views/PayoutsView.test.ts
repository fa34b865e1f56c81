import { afterEach, describe, expect, it } from "vitest";
import { payoutEndpoints } from "@grainyard/contracts";
import PayoutsView from "./PayoutsView.vue";
import { mountView } from "../test/mount-view.ts";
import { transport } from "../api/http.ts";

const sawyer = {
  id: "acc_2",
  email: "kiln@northshore-coop.test",
  displayName: "Mara Lindqvist",
  role: "sawyer",
  emailVerified: true,
  yardName: "Northshore Kiln Co-op",
  pickupTown: "Northshore",
  createdAt: "2025-01-10T09:00:00.000Z",
};
const page = (state: "none" | "unfinished" | "ready", over: object = {}) => ({
  account: { state, updatedAt: null },
  blockedReason: state === "ready" ? null : "Set up a payout account so Grainyard can send you money.",
  holdDays: 7,
  balances: [],
  pending: [],
  payouts: [],
  ...over,
});

afterEach(() => {
  transport.useFetch(undefined);
  document.body.innerHTML = "";
});

describe("PayoutsView", () => {
  it("without an account: the plain-words reason, a set-up button, and the empty states", async () => {
    const { wrapper } = await mountView(PayoutsView, {
      path: "/yard/payouts",
      session: { account: sawyer },
      answers: { [`GET ${payoutEndpoints.myPayouts.path}`]: [{ status: 200, body: page("none") }] },
    });
    expect(wrapper.find('[data-test="account-state"]').text()).toBe("Not set up");
    expect(wrapper.find('[data-test="blocked-reason"]').text()).toContain("Set up a payout account");
    expect(wrapper.find('[data-test="start-setup"]').text()).toBe("Set up payouts");
    expect(wrapper.text()).toContain("No earnings yet");
    expect(wrapper.text()).toContain("No payouts yet");
    expect(wrapper.find('[data-test="hold-explanation"]').text()).toContain("7 days");
    expect(wrapper.find('[data-test="statement-csv"]').attributes("href")).toBe(payoutEndpoints.statementCsv.path);
  });

  it("back from the hosted set-up, asks the API to check with the provider (not the redirect) and says it is ready", async () => {
    const { wrapper, fetchMock, router } = await mountView(PayoutsView, {
      path: "/yard/payouts?setup=returned",
      session: { account: sawyer },
      answers: { [`POST ${payoutEndpoints.refreshPayoutAccount.path}`]: [{ status: 200, body: page("ready") }] },
    });
    expect(
      fetchMock.mock.calls.some(([url, init]) => String(url) === payoutEndpoints.refreshPayoutAccount.path && init?.method === "POST"),
    ).toBe(true);
    expect(wrapper.find('[data-test="setup-confirmed"]').exists()).toBe(true);
    expect(wrapper.find('[data-test="account-state"]').text()).toBe("Ready to receive money");
    expect(wrapper.find('[data-test="start-setup"]').exists()).toBe(false);
    expect(router.currentRoute.value.query.setup).toBeUndefined();
  });

  it("shows balances in the currency and each payout with its orders", async () => {
    const payout = {
      id: "p1",
      sawyerId: "s",
      sawyerName: "Mara",
      yardName: "Northshore Kiln Co-op",
      currency: "USD",
      amountMinor: 226_200,
      status: "sent",
      failureReason: null,
      transferId: "tr_1",
      approvedBy: null,
      createdAt: "2026-12-09T10:00:00.000Z",
      sentAt: "2026-12-09T10:00:01.000Z",
      lines: [
        { orderId: "o1", listingTitle: "Bookmatched black walnut pair", handedOverAt: "2026-12-01T10:00:00.000Z", amountMinor: 226_200 },
      ],
    };
    const { wrapper } = await mountView(PayoutsView, {
      path: "/yard/payouts",
      session: { account: sawyer },
      answers: {
        [`GET ${payoutEndpoints.myPayouts.path}`]: [
          {
            status: 200,
            body: page("ready", {
              balances: [{ currency: "USD", pendingMinor: 5_000, availableMinor: 0, paidMinor: 226_200 }],
              pending: [
                {
                  orderId: "o2",
                  listingTitle: "Cherry slab 4",
                  currency: "USD",
                  amountMinor: 3_000,
                  availableFrom: "2026-12-12T10:00:00.000Z",
                },
                { orderId: "o3", listingTitle: "Ash slab 1", currency: "USD", amountMinor: 2_000, availableFrom: null },
              ],
              payouts: [payout],
            }),
          },
        ],
      },
    });
    expect(wrapper.find('[data-test="balance-pending"]').text()).toBe("$50.00");
    expect(wrapper.find('[data-test="balance-paid"]').text()).toBe("$2,262.00");
    expect(wrapper.find('[data-test="payout-status"]').text()).toBe("Paid out");
    expect(wrapper.find('[data-test="payout-lines"]').text()).toContain("Bookmatched black walnut pair");
    // Each pending sale says when its money becomes available.
    const pending = wrapper.findAll('[data-test="pending-sales"] li').map((item) => item.text());
    expect(pending[0]).toMatch(/Cherry slab 4.*Available Dec 12, 2026.*\$30\.00/);
    expect(pending[1]).toMatch(/Ash slab 1.*once the slab is handed over.*\$20\.00/);
  });

  it("shows an error with a retry when the page cannot load", async () => {
    const { wrapper } = await mountView(PayoutsView, {
      path: "/yard/payouts",
      session: { account: sawyer },
      answers: {
        [`GET ${payoutEndpoints.myPayouts.path}`]: [
          { status: 503, body: { error: { code: "unavailable", message: "Grainyard is resting." } } },
        ],
      },
    });
    expect(wrapper.text()).toContain("We couldn't load your payouts");
  });
});
