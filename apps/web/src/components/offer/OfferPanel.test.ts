import { afterEach, describe, expect, it } from "vitest";
import { flushPromises, mount } from "@vue/test-utils";
import { createPinia, setActivePinia } from "pinia";
import { createMemoryHistory } from "vue-router";
import { offerEndpoints, pathOf, type Offer } from "@grainyard/contracts";
import { transport } from "../../api/http.ts";
import { appPlugins } from "../../test/app-plugins.ts";
import { createGrainyardRouter } from "../../router.ts";
import { useSessionStore } from "../../stores/session.ts";
import { buyerAccount } from "../../test/fixtures.ts";
import OfferPanel from "./OfferPanel.vue";

afterEach(() => {
  transport.useFetch(undefined);
  document.body.innerHTML = "";
});

const offerPath = `POST ${pathOf(offerEndpoints.makeOffer, { listingId: "lst_walnut" })}`;

function offer(over: Partial<Offer> = {}): Offer {
  return {
    id: "off_1",
    listingId: "lst_walnut",
    listingTitle: "Walnut top",
    listingPriceMinor: 120_000,
    currency: "USD",
    status: "open",
    declineReason: null,
    amountMinor: 95_000,
    counterMinor: null,
    agreedMinor: null,
    round: 1,
    roundsLeft: 2,
    steps: [],
    handover: "pickup",
    expiresAt: "2026-12-05T10:00:00.000Z",
    orderId: null,
    buyerName: "Ana",
    yardName: "Ridgeback Urban Timber",
    viewerIs: "buyer",
    actions: ["withdraw"],
    createdAt: "2026-12-03T10:00:00.000Z",
    updatedAt: "2026-12-03T10:00:00.000Z",
    ...over,
  };
}

async function mountPanel(answer: { status: number; body: unknown }) {
  const requests: { key: string; body: unknown }[] = [];
  transport.useFetch((async (url: string, init?: RequestInit) => {
    const key = `${init?.method ?? "GET"} ${String(url).split("?")[0]}`;
    requests.push({ key, body: init?.body ? JSON.parse(String(init.body)) : undefined });
    if (key === offerPath) return new Response(JSON.stringify(answer.body), { status: answer.status });
    return new Response(JSON.stringify({ account: buyerAccount, csrfToken: "t" }), { status: 200 });
  }) as unknown as typeof fetch);
  const pinia = createPinia();
  setActivePinia(pinia);
  transport.useCsrfToken(() => useSessionStore(pinia).csrfToken);
  const router = createGrainyardRouter(pinia, createMemoryHistory());
  await router.push("/slabs/lst_walnut");
  await router.isReady();
  await useSessionStore(pinia).load();
  const wrapper = mount(OfferPanel, {
    props: { listingId: "lst_walnut", priceMinor: 120_000, currency: "USD", pickup: true, freight: true },
    global: { plugins: appPlugins(pinia, router) },
  });
  await wrapper.find('[data-test="open-offer"]').trigger("click");
  return { wrapper, requests };
}

describe("Make an offer", { timeout: 60_000 }, () => {
  it("reads the amount the way people type it and sends minor units with the message", async () => {
    const { wrapper, requests } = await mountPanel({ status: 201, body: { offer: offer() } });
    await wrapper.find('[data-test="offer-amount"]').setValue("$950");
    expect(wrapper.text()).toContain("You offer $950.00");
    await wrapper.find('[data-test="offer-message"]').setValue("For a desk");
    await wrapper.find("form").trigger("submit");
    await flushPromises();
    expect(requests.find((r) => r.key === offerPath)?.body).toEqual({
      amountMinor: 95_000,
      message: "For a desk",
      handover: "pickup",
      deliveryAddress: null,
    });
    expect(wrapper.find('[data-test="offer-sent"]').text()).toContain("Offer of $950.00 sent");
  });

  it("says what is wrong before sending: not a number, nothing, or not below the price", async () => {
    const { wrapper, requests } = await mountPanel({ status: 201, body: { offer: offer() } });
    for (const [typed, words] of [
      ["", "Give the amount"],
      ["twelve", "Type the amount like 12.50"],
      ["0", "above zero"],
      ["1200", "less than the price of $1,200.00"],
    ] as const) {
      await wrapper.find('[data-test="offer-amount"]').setValue(typed);
      await wrapper.find("form").trigger("submit");
      await flushPromises();
      expect(wrapper.find('[data-test="offer-amount-error"]').text()).toContain(words);
    }
    expect(requests.some((r) => r.key === offerPath)).toBe(false);
  });

  it("shows the API's field message, and a polite decline below the floor without any floor amount", async () => {
    const refused = await mountPanel({
      status: 422,
      body: { error: { code: "invalid_input", message: "Check the amount.", fields: { amountMinor: "Give the amount in whole cents." } } },
    });
    await refused.wrapper.find('[data-test="offer-amount"]').setValue("500");
    await refused.wrapper.find("form").trigger("submit");
    await flushPromises();
    expect(refused.wrapper.find('[data-test="offer-amount-error"]').text()).toBe("Give the amount in whole cents.");

    const low = await mountPanel({
      status: 201,
      body: { offer: offer({ status: "declined", declineReason: "below_floor", amountMinor: 50_000, actions: [] }) },
    });
    await low.wrapper.find('[data-test="offer-amount"]').setValue("500");
    await low.wrapper.find("form").trigger("submit");
    await flushPromises();
    expect(low.wrapper.find('[data-test="offer-declined"]').text()).toContain("not taking offers this low");
  });
});
