import { afterEach, describe, expect, it } from "vitest";
import { flushPromises } from "@vue/test-utils";
import { payoutEndpoints } from "@grainyard/contracts";
import AdminPayoutsView from "./AdminPayoutsView.vue";
import { mountView } from "../test/mount-view.ts";
import { transport } from "../api/http.ts";

const admin = {
  id: "acc_9",
  email: "desk@grainyard.test",
  displayName: "Desk",
  role: "admin",
  emailVerified: true,
  yardName: null,
  pickupTown: null,
  createdAt: "2025-01-10T09:00:00.000Z",
};
const sawyerId = "6f1c1d7e-0000-4000-8000-000000000001";
const line = {
  orderId: "0d7e7a52-1111-4000-8000-000000000001",
  listingTitle: "Bookmatched black walnut pair",
  handedOverAt: "2026-12-01T10:00:00.000Z",
  amountMinor: 226_200,
};
const dueItem = (amountMinor: number, dueKey: string) => ({
  sawyerId,
  sawyerName: "Mara Lindqvist",
  yardName: "Northshore Kiln Co-op",
  currency: "USD",
  amountMinor,
  dueKey,
  accountState: "ready",
  blockedReason: null,
  lines: [{ ...line, amountMinor }],
  lastFailure: null,
});
const sentPayout = {
  id: "p1",
  sawyerId,
  sawyerName: "Mara Lindqvist",
  yardName: "Northshore Kiln Co-op",
  currency: "USD",
  amountMinor: 226_200,
  status: "sent",
  failureReason: null,
  transferId: "tr_1",
  approvedBy: "desk@grainyard.test",
  createdAt: "2026-12-09T10:00:00.000Z",
  sentAt: "2026-12-09T10:00:01.000Z",
  lines: [line],
};

afterEach(() => {
  transport.useFetch(undefined);
  document.body.innerHTML = "";
});

const dialog = () => document.querySelector('[data-test="confirm-dialog"]');
const click = async (selector: string) => {
  (document.querySelector(selector) as HTMLElement).click();
  await flushPromises();
};

describe("AdminPayoutsView", () => {
  it("asks before sending, naming the amount and the recipient, then shows it sent", async () => {
    const { wrapper, fetchMock } = await mountView(AdminPayoutsView, {
      path: "/admin/payouts",
      session: { account: admin },
      answers: {
        [`GET ${payoutEndpoints.payoutsDue.path}`]: [
          { status: 200, body: { due: [dueItem(226_200, "k1")], holdDays: 7 } },
          { status: 200, body: { due: [], holdDays: 7 } },
        ],
        [`GET ${payoutEndpoints.listPayouts.path}`]: [
          { status: 200, body: { payouts: [] } },
          { status: 200, body: { payouts: [sentPayout] } },
        ],
        [`POST ${payoutEndpoints.approvePayout.path}`]: [{ status: 200, body: { payout: sentPayout } }],
      },
    });
    expect(wrapper.find('[data-test="due-amount"]').text()).toBe("$2,262.00");
    await click('[data-test="approve-one"]');
    expect(dialog()?.textContent).toContain("Send $2,262.00?");
    expect(document.querySelector('[data-test="confirm-recipient"]')?.textContent).toMatch(
      /\$2,262\.00.*Northshore Kiln Co-op \(Mara Lindqvist\).*1\s+order/s,
    );
    // Nothing is sent before the confirmation.
    expect(fetchMock.mock.calls.some(([, init]) => init?.method === "POST")).toBe(false);
    await click('[data-test="confirm"]');
    const post = fetchMock.mock.calls.find(([, init]) => init?.method === "POST")!;
    expect(JSON.parse(String(post[1]!.body))).toEqual({ sawyerId, currency: "USD", dueKey: "k1" });
    expect(wrapper.find('[data-test="desk-notice"]').text()).toContain("Sent $2,262.00 to Northshore Kiln Co-op (Mara Lindqvist)");
    expect(wrapper.find('[data-test="recent-status"]').text()).toBe("Paid out");
  });

  it("reloads the list with a clear message when the payout changed since it was loaded (409 payout_changed)", async () => {
    const { wrapper } = await mountView(AdminPayoutsView, {
      path: "/admin/payouts",
      session: { account: admin },
      answers: {
        [`GET ${payoutEndpoints.payoutsDue.path}`]: [
          { status: 200, body: { due: [dueItem(226_200, "k1")], holdDays: 7 } },
          { status: 200, body: { due: [dueItem(180_000, "k2")], holdDays: 7 } },
        ],
        [`GET ${payoutEndpoints.listPayouts.path}`]: [
          { status: 200, body: { payouts: [] } },
          { status: 200, body: { payouts: [] } },
        ],
        [`POST ${payoutEndpoints.approvePayout.path}`]: [
          { status: 409, body: { error: { code: "payout_changed", message: "This payout changed since the list was loaded." } } },
        ],
      },
    });
    await click('[data-test="approve-one"]');
    await click('[data-test="confirm"]');
    expect(wrapper.find('[data-test="desk-notice"]').text()).toMatch(/changed since the list was loaded.*nothing was sent/);
    expect(wrapper.find('[data-test="due-amount"]').text()).toBe("$1,800.00");
  });

  it("approves the selected payouts as one batch and lists each outcome", async () => {
    const other = {
      ...dueItem(50_000, "k3"),
      sawyerId: "6f1c1d7e-0000-4000-8000-000000000002",
      sawyerName: "Iris Okafor",
      yardName: "Cobble Lane Slabworks",
    };
    const { wrapper, fetchMock } = await mountView(AdminPayoutsView, {
      path: "/admin/payouts",
      session: { account: admin },
      answers: {
        [`GET ${payoutEndpoints.payoutsDue.path}`]: [
          { status: 200, body: { due: [dueItem(226_200, "k1"), other], holdDays: 7 } },
          { status: 200, body: { due: [], holdDays: 7 } },
        ],
        [`GET ${payoutEndpoints.listPayouts.path}`]: [
          { status: 200, body: { payouts: [] } },
          { status: 200, body: { payouts: [] } },
        ],
        [`POST ${payoutEndpoints.approvePayoutBatch.path}`]: [
          {
            status: 200,
            body: {
              results: [
                { sawyerId, currency: "USD", payout: sentPayout, error: null },
                { sawyerId: other.sawyerId, currency: "USD", payout: null, error: "This sawyer's payout account is not finished yet." },
              ],
            },
          },
        ],
      },
    });
    await wrapper.find('[data-test="select-all"]').setValue(true);
    expect(wrapper.find('[data-test="approve-selected"]').text()).toBe("Approve 2 selected · $2,762.00");
    await click('[data-test="approve-selected"]');
    expect(document.querySelector('[data-test="confirm-batch-list"]')?.textContent).toContain("Cobble Lane Slabworks (Iris Okafor)");
    await click('[data-test="confirm"]');
    const post = fetchMock.mock.calls.find(([, init]) => init?.method === "POST")!;
    expect(JSON.parse(String(post[1]!.body)).payouts).toHaveLength(2);
    const rows = wrapper.findAll('[data-test="batch-results"] li').map((li) => li.text());
    expect(rows[0]).toMatch(/Northshore Kiln Co-op.*\$2,262\.00.*Sent\./);
    expect(rows[1]).toMatch(/Cobble Lane Slabworks.*not finished yet/);
    expect(wrapper.find('[data-test="desk-notice"]').text()).toContain("1 of 2 payouts sent");
  });
});
