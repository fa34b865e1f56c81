import { afterEach, beforeEach, describe, expect, it } from "vitest";
import { flushPromises } from "@vue/test-utils";
import { yardEndpoints } from "@grainyard/contracts";
import SlabFormView from "./SlabFormView.vue";
import { mountView, noteFor, typeInto } from "../test/mount-view.ts";
import { transport } from "../api/http.ts";
import { createMemoryDraftStorage, useDraftStorage } from "../offline/draft-store.ts";
import { UNITS_STORAGE_KEY } from "../stores/units.ts";

const sawyer = {
  id: "acc_2",
  email: "moss@ridgeback.example",
  displayName: "Moss Ferrand",
  role: "sawyer",
  emailVerified: true,
  yardName: "Ridgeback Urban Timber",
  pickupTown: "Lakemont",
  createdAt: "2025-01-10T09:00:00.000Z",
};

beforeEach(() => {
  localStorage.setItem(UNITS_STORAGE_KEY, "metric");
  useDraftStorage(createMemoryDraftStorage());
});
afterEach(() => {
  transport.useFetch(undefined);
  useDraftStorage(null);
  localStorage.clear();
  document.body.innerHTML = "";
});

async function fillValidSlab(wrapper: Awaited<ReturnType<typeof mountView>>["wrapper"]) {
  await typeInto(wrapper, "lengthMm", "2440");
  await typeInto(wrapper, "thicknessMm", "57");
  for (const station of wrapper.findAll('input[data-test="width-station"]')) await station.setValue("600");
  const species = wrapper.find("#speciesSlug");
  await species.setValue("Black walnut");
  await species.trigger("blur");
  await wrapper.find("#liveEdge-0").setValue(true);
  await wrapper.find("#surfacing-0").setValue(true);
  await wrapper.find("#dryingMethod").setValue("air");
}

async function open() {
  return mountView(SlabFormView, {
    path: "/yard/slabs/new",
    session: { account: sawyer },
    answers: { [`GET ${yardEndpoints.listLogs.path}`]: [{ status: 200, body: { logs: [] } }] },
  });
}

describe("SlabFormView", () => {
  it("labels the fields and starts with three width stations", async () => {
    const { wrapper } = await open();
    const labels = wrapper.findAll("label[for]").map((label) => [label.attributes("for"), label.text()]);
    expect(labels).toEqual(
      expect.arrayContaining([
        ["speciesSlug", "Species"],
        ["lengthMm", "Length"],
        ["thicknessMm", "Thickness"],
      ]),
    );
    expect(wrapper.findAll('input[data-test="width-station"]')).toHaveLength(3);
    expect(wrapper.text()).toContain("Measure at evenly spaced points from one end to the other");
    await wrapper.find('[data-test="add-station"]').trigger("click");
    expect(wrapper.findAll('input[data-test="width-station"]')).toHaveLength(4);
  });

  it("never goes below two width stations", async () => {
    const { wrapper } = await open();
    await wrapper.find('button[aria-label="Remove width 3"]').trigger("click");
    expect(wrapper.findAll('input[data-test="width-station"]')).toHaveLength(2);
    const removers = wrapper.findAll('button[aria-label^="Remove width"]');
    expect(removers.every((button) => button.attributes("disabled") !== undefined)).toBe(true);
  });

  it("shows the shared schema's messages beside the fields and sends nothing", async () => {
    const { wrapper, fetchMock } = await open();
    await wrapper.find("form").trigger("submit");
    await flushPromises();
    expect(noteFor(wrapper, "speciesSlug")).toBe("Choose the species.");
    expect(noteFor(wrapper, "lengthMm")).toBe("Give the length in millimetres.");
    expect(noteFor(wrapper, "thicknessMm")).toBe("Give the thickness in millimetres.");
    expect(noteFor(wrapper, "width-0")).toBe("Type width 1, or remove this measurement.");
    expect(wrapper.text()).toContain("Choose the edges.");
    expect(wrapper.text()).toContain("Choose the surfacing.");
    expect(wrapper.text()).toContain("Choose how the slab was dried.");
    expect(fetchMock.mock.calls.some(([, init]) => init?.method === "POST")).toBe(false);
  });

  it("asks for the temperature and minutes of a heat treatment", async () => {
    const { wrapper, fetchMock } = await open();
    await fillValidSlab(wrapper);
    await wrapper.find("#heatTreated").setValue(true);
    await wrapper.find("form").trigger("submit");
    await flushPromises();
    expect(noteFor(wrapper, "heatTreatmentTemperatureC")).toBe(
      "Give the core temperature and the minutes it was held (ISPM 15: 56 °C for 30 minutes).",
    );
    expect(fetchMock.mock.calls.some(([, init]) => init?.method === "POST")).toBe(false);
  });

  it("works out board feet and weight while typing, and says when 12 % is assumed", async () => {
    const { wrapper } = await open();
    await typeInto(wrapper, "lengthMm", "2440");
    await typeInto(wrapper, "thicknessMm", "57");
    for (const station of wrapper.findAll('input[data-test="width-station"]')) await station.setValue("600");
    // NHLA: bf = T(in) × W(in) × L(ft) / 12 = (57/25.4) × (600/25.4) × (2440/304.8) / 12 = 35.36
    expect(wrapper.find('[data-test="live-board-feet"]').text()).toBe("35.4 bf");
    expect(wrapper.find('[data-test="live-weight"]').text()).toBe("—  at 12 % moisture (assumed: no reading yet)".replace("  ", " "));

    const species = wrapper.find("#speciesSlug");
    await species.setValue("Black walnut");
    await species.trigger("blur");
    const weight = wrapper.find('[data-test="live-weight"]').text();
    expect(weight).toMatch(/^\d+–\d+ kg/);
    expect(weight).toContain("at 12 % moisture (assumed: no reading yet)");
    expect(wrapper.find('[data-test="heavy-lift"]').text()).toContain(
      "Heavier than a safe one-person lift (23 kg, NIOSH): use two people or a machine",
    );
  });

  it("shows slab-math's objection at the field instead of crashing", async () => {
    const { wrapper } = await open();
    await typeInto(wrapper, "lengthMm", "50000");
    await typeInto(wrapper, "thicknessMm", "57");
    for (const station of wrapper.findAll('input[data-test="width-station"]')) await station.setValue("600");
    expect(noteFor(wrapper, "lengthMm")).toBe("That is longer than any slab we take (12 m, about 39 ft). Check the number and the units.");
    expect(wrapper.find('[data-test="live-board-feet"]').text()).toBe("—");
  });

  it("reads inches when the sawyer works in imperial and sends the millimetres exactly as entered", async () => {
    localStorage.setItem(UNITS_STORAGE_KEY, "imperial");
    const { wrapper, fetchMock } = await open();
    await typeInto(wrapper, "lengthMm", "96");
    await typeInto(wrapper, "thicknessMm", "2 1/4");
    const stations = wrapper.findAll('input[data-test="width-station"]');
    await stations[0]!.setValue("24");
    await stations[1]!.setValue("24 1/8");
    await stations[2]!.setValue("23.5");
    const species = wrapper.find("#speciesSlug");
    await species.setValue("White oak");
    await species.trigger("blur");
    await wrapper.find("#liveEdge-0").setValue(true);
    await wrapper.find("#surfacing-1").setValue(true);
    await wrapper.find("#dryingMethod").setValue("kiln");
    await wrapper.find("form").trigger("submit");
    await flushPromises();
    const post = fetchMock.mock.calls.find(([, init]) => init?.method === "POST");
    expect(post).toBeDefined();
    const body = JSON.parse(String(post![1]!.body));
    // 96 in = 2438.4 mm; 2 1/4 in = 57.15 mm; 24 1/8 in = 612.775 mm; 23.5 in = 596.9 mm
    expect(body).toMatchObject({
      speciesSlug: "white-oak",
      lengthMm: 2438.4,
      thicknessMm: 57.15,
      widthStationsMm: [609.6, 612.775, 596.9],
      liveEdge: "both",
      surfacing: "flattened",
      dryingMethod: "kiln",
    });
  });
});
