import { afterEach, describe, expect, it, vi } from "vitest";
import { flushPromises, mount } from "@vue/test-utils";
import { createPinia } from "pinia";
import { PiniaColada } from "@pinia/colada";
import { payoutEndpoints, pathOf, type Order } from "@grainyard/contracts";
import DisputeRefundPanel from "./DisputeRefundPanel.vue";
import { transport } from "../../api/http.ts";

const orderId = "0d7e7a52-1111-4000-8000-000000000001";
const order = { id: orderId, currency: "USD", totalMinor: 100_000 } as unknown as Order;
const state = (refundedMinor: number, refunds: { amountMinor: number; reason: string; createdAt: string }[] = []) => ({
  orderId,
  currency: "USD",
  totalMinor: 100_000,
  refundedMinor,
  refundableMinor: 100_000 - refundedMinor,
  canRefund: refundedMinor < 100_000,
  refunds,
});

afterEach(() => {
  transport.useFetch(undefined);
  document.body.innerHTML = "";
});

function stub(answers: { method: string; status: number; body: unknown }[]) {
  const fetchMock = vi.fn(async (_url: string | URL | Request, init?: RequestInit) => {
    const index = answers.findIndex((a) => a.method === (init?.method ?? "GET"));
    const [next] = answers.splice(index, 1);
    return new Response(JSON.stringify(next!.body), { status: next!.status });
  });
  transport.useFetch(fetchMock as unknown as typeof fetch);
  return fetchMock;
}
const mountPanel = () =>
  mount(DisputeRefundPanel, { props: { order }, global: { plugins: [createPinia(), PiniaColada] }, attachTo: document.body });
const click = async (selector: string) => {
  (document.querySelector(selector) as HTMLElement).click();
  await flushPromises();
};

describe("DisputeRefundPanel", () => {
  it("starts with what is left, checks the reason, confirms that both parties get an e-mail, then shows the result", async () => {
    const fetchMock = stub([
      {
        method: "GET",
        status: 200,
        body: state(20_000, [{ amountMinor: 20_000, reason: "A check at one end was not shown.", createdAt: "2026-12-05T10:00:00.000Z" }]),
      },
      { method: "POST", status: 200, body: { refundedMinor: 50_000, refundableMinor: 50_000 } },
      { method: "GET", status: 200, body: state(50_000) },
    ]);
    const wrapper = mountPanel();
    await flushPromises();
    expect((wrapper.find('[data-test="refund-amount"]').element as HTMLInputElement).value).toBe("800.00");
    expect(wrapper.text()).toContain("A check at one end was not shown.");

    // No reason: the field says so and nothing is asked or sent.
    await wrapper.find("form").trigger("submit");
    expect(wrapper.find("#refund-reason-note").text()).toBe("Give the reason both parties will read.");
    expect(document.querySelector('[data-test="confirm-dialog"]')).toBeNull();

    await wrapper.find('[data-test="refund-amount"]').setValue("300");
    await wrapper.find('[data-test="refund-reason"]').setValue("The slab arrived with a split along one edge.");
    await wrapper.find("form").trigger("submit");
    await flushPromises();
    const text = document.querySelector('[data-test="refund-confirm-text"]')!.textContent!;
    expect(text).toContain("Part of what the buyer paid");
    expect(text).toContain("$300.00");
    expect(text).toContain("buyer and the sawyer both get an e-mail");
    expect(document.querySelector('[data-test="confirm-dialog"]')!.textContent).toContain("The slab arrived with a split along one edge.");

    await click('[data-test="confirm"]');
    const post = fetchMock.mock.calls.find(([, init]) => init?.method === "POST")!;
    expect(String(post[0])).toBe(pathOf(payoutEndpoints.disputeRefund, { orderId }));
    expect(JSON.parse(String(post[1]!.body))).toEqual({ amountMinor: 30_000, reason: "The slab arrived with a split along one edge." });
    expect(wrapper.find('[data-test="refund-result"]').text()).toMatch(/\$500\.00 of \$1,000\.00.*\$500\.00 is left.*e-mailed/);
    // The refunds were asked again: the sum under the result is the new one.
    expect(fetchMock.mock.calls.filter(([, init]) => (init?.method ?? "GET") === "GET")).toHaveLength(2);
    expect(wrapper.find('[data-test="refund-sum"]').text()).toMatch(/refunded \$500\.00.*left \$500\.00/);
  });

  it("says so when nothing is left to refund", async () => {
    stub([{ method: "GET", status: 200, body: state(100_000) }]);
    const wrapper = mountPanel();
    await flushPromises();
    expect(wrapper.find("form").exists()).toBe(false);
    expect(wrapper.find('[data-test="refund-none"]').text()).toContain("Everything paid on this order has been refunded");
  });
});
