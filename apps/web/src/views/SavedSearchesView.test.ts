import { afterEach, beforeEach, describe, expect, it } from "vitest";
import { flushPromises } from "@vue/test-utils";
import { catalogueEndpoints, buyerEndpoints } from "@grainyard/contracts";
import { transport } from "../api/http.ts";
import { mountView } from "../test/mount-view.ts";
import { buyerAccount, savedSearch } from "../test/fixtures.ts";
import { UNITS_STORAGE_KEY } from "../stores/units.ts";
import SavedSearchesView from "./SavedSearchesView.vue";

beforeEach(() => localStorage.setItem(UNITS_STORAGE_KEY, "metric"));
afterEach(() => {
  transport.useFetch(undefined);
  localStorage.removeItem(UNITS_STORAGE_KEY);
  document.body.innerHTML = "";
});

const LIST = `GET ${buyerEndpoints.listSavedSearches.path}`;
const one = `${buyerEndpoints.listSavedSearches.path}/ss_1`;
const dining = savedSearch({
  query: "species=black-walnut&lengthMin=2000&seats=8",
  name: "Dining walnut",
  pendingMatches: 2,
  lastAlertAt: "2026-11-30T08:00:00.000Z",
});

function calls(fetchMock: { mock: { calls: unknown[][] } }, method: string) {
  return fetchMock.mock.calls
    .filter(([, init]) => (init as RequestInit | undefined)?.method === method)
    .map(([url, init]) => ({
      url: String(url),
      body: (init as RequestInit).body ? JSON.parse(String((init as RequestInit).body)) : undefined,
    }));
}

describe("Saved searches page", () => {
  it("lists each search with its filters in words, waiting matches, last e-mail and a catalogue link", async () => {
    const { wrapper } = await mountView(SavedSearchesView, {
      path: "/saved-searches",
      session: { account: buyerAccount },
      answers: {
        [LIST]: [
          { status: 200, body: { savedSearches: [dining, savedSearch({ id: "ss_2", name: "Anything", query: "", alerts: false })] } },
        ],
      },
    });
    const items = wrapper.findAll('[data-test="saved-search"]');
    expect(items).toHaveLength(2);
    expect(items[0]!.find('[data-test="saved-search-name"]').text()).toBe("Dining walnut");
    expect(items[0]!.findAll(".saved__word").map((w) => w.text())).toEqual(["Black walnut", "Length from 2,000 mm", "Table for 8"]);
    expect(items[0]!.find('[data-test="saved-search-pending"]').text()).toBe("2 new slabs waiting for the next e-mail");
    expect(items[0]!.find('[data-test="saved-search-last-alert"]').text()).toBe("Nov 30, 2026");
    expect(items[0]!.find('[data-test="saved-search-open"]').attributes("href")).toBe(
      "/browse?species=black-walnut&lengthMin=2000&seats=8",
    );
    expect(items[1]!.find('[data-test="saved-search-pending"]').text()).toBe("Alerts are off");
    expect(items[1]!.find('[data-test="saved-search-last-alert"]').text()).toBe("None yet");
    expect(items[1]!.findAll(".saved__word").map((w) => w.text())).toEqual(["Every slab"]);
  });

  it("names the town of a search near one (the catalogue's answer gives its name)", async () => {
    const { wrapper, fetchMock } = await mountView(SavedSearchesView, {
      path: "/saved-searches",
      session: { account: buyerAccount },
      answers: {
        [LIST]: [{ status: 200, body: { savedSearches: [savedSearch({ query: "near=demo%3Anorthshore&radiusKm=30" })] } }],
        [`GET ${catalogueEndpoints.searchCatalogue.path}`]: [
          {
            status: 200,
            body: {
              results: [],
              total: 0,
              totalIsAtLeast: false,
              nextCursor: null,
              near: { name: "Northshore", region: "Lakemont region (demo)", latitude: 44.7, longitude: -85.4 },
              fitTop: null,
            },
          },
        ],
      },
    });
    await flushPromises();
    expect(wrapper.findAll(".saved__word").map((w) => w.text())).toEqual(["Within 30 km of Northshore"]);
    const asked = fetchMock.mock.calls.map(([url]) => String(url)).find((url) => url.startsWith(catalogueEndpoints.searchCatalogue.path))!;
    expect(new URLSearchParams(asked.split("?")[1]).get("near")).toBe("demo:northshore");
  });

  it("says what to do when there are none", async () => {
    const { wrapper } = await mountView(SavedSearchesView, {
      path: "/saved-searches",
      session: { account: buyerAccount },
      answers: { [LIST]: [{ status: 200, body: { savedSearches: [] } }] },
    });
    expect(wrapper.find('[data-test="saved-searches-empty"]').text()).toContain("Save this search");
  });

  it("renames in place", async () => {
    const { wrapper, fetchMock } = await mountView(SavedSearchesView, {
      path: "/saved-searches",
      session: { account: buyerAccount },
      answers: {
        [LIST]: [{ status: 200, body: { savedSearches: [dining] } }],
        [`PATCH ${one}`]: [{ status: 200, body: { savedSearch: { ...dining, name: "Our table" } } }],
      },
    });
    await wrapper.find('[data-test="rename"]').trigger("click");
    await wrapper.find('[data-test="rename-input"]').setValue("Our table");
    await wrapper.find(".saved__rename").trigger("submit");
    await flushPromises();
    expect(calls(fetchMock, "PATCH")).toEqual([{ url: one, body: { name: "Our table" } }]);
    expect(wrapper.find('[data-test="saved-search-name"]').text()).toBe("Our table");
  });

  it("switches alerts off at once and puts the switch back when the API says no", async () => {
    const { wrapper, fetchMock } = await mountView(SavedSearchesView, {
      path: "/saved-searches",
      session: { account: buyerAccount },
      answers: {
        [LIST]: [{ status: 200, body: { savedSearches: [dining] } }],
        [`PATCH ${one}`]: [{ status: 503, body: { error: { code: "unavailable", message: "Grainyard is busy; try again." } } }],
      },
    });
    const toggle = wrapper.find<HTMLInputElement>('[data-test="saved-search-alerts"]');
    expect(toggle.element.checked).toBe(true);
    await toggle.setValue(false);
    expect(calls(fetchMock, "PATCH")).toEqual([{ url: one, body: { alerts: false } }]);
    await flushPromises();
    expect(wrapper.find<HTMLInputElement>('[data-test="saved-search-alerts"]').element.checked).toBe(true);
    expect(wrapper.find(".saved__error").text()).toBe("Grainyard is busy; try again.");
  });

  it("deletes only after the buyer confirms", async () => {
    const { wrapper, fetchMock } = await mountView(SavedSearchesView, {
      path: "/saved-searches",
      session: { account: buyerAccount },
      answers: { [LIST]: [{ status: 200, body: { savedSearches: [dining] } }], [`DELETE ${one}`]: [{ status: 204 }] },
    });
    await wrapper.find('[data-test="delete"]').trigger("click");
    await flushPromises();
    expect(calls(fetchMock, "DELETE")).toEqual([]);
    const dialog = document.querySelector('[data-test="confirm-dialog"]');
    expect(dialog?.textContent).toContain("“Dining walnut” goes");
    (document.querySelector('[data-test="confirm"]') as HTMLButtonElement).click();
    await flushPromises();
    expect(calls(fetchMock, "DELETE")).toEqual([{ url: one, body: undefined }]);
    expect(wrapper.find('[data-test="saved-searches-empty"]').exists()).toBe(true);
  });
});
