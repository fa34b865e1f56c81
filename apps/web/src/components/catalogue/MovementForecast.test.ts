import { afterEach, beforeEach, describe, expect, it } from "vitest";
import { mount } from "@vue/test-utils";
import { createPinia, setActivePinia } from "pinia";
import { millimetresToInches, seasonalMovement } from "@grainyard/slab-math";
import MovementForecast from "./MovementForecast.vue";
import { CLIMATE_PRESETS } from "../../constants/indoor-climates.ts";
import { UNITS_STORAGE_KEY } from "../../stores/units.ts";

// The expected figures come from slab-math itself (tested there against the Wood Handbook,
// eq. 4-5 and ch. 13); this test checks the page shows them, rounded as the text says.
const oneDecimal = (value: number) => value.toFixed(1);
const twoDecimals = (value: number) => value.toFixed(2);

const oak = { id: "s1", label: "Slab 3", speciesSlug: "northern-red-oak", averageWidthMm: 986 };
const walnut = { id: "s2", label: "Slab 1", speciesSlug: "black-walnut", averageWidthMm: 536.3 };

function mountForecast(slabs = [oak]) {
  const pinia = createPinia();
  setActivePinia(pinia);
  return mount(MovementForecast, { props: { slabs }, global: { plugins: [pinia] } });
}

beforeEach(() => localStorage.setItem(UNITS_STORAGE_KEY, "metric"));
afterEach(() => localStorage.removeItem(UNITS_STORAGE_KEY));

describe("MovementForecast", () => {
  it("shows the EMC of each season and the width change for the first climate", () => {
    const preset = CLIMATE_PRESETS[0]!;
    const expected = seasonalMovement({
      widthMm: oak.averageWidthMm,
      speciesSlug: oak.speciesSlug,
      summer: preset.summer,
      winter: preset.winter,
    });
    const wrapper = mountForecast();
    expect(wrapper.find('[data-test="movement-summer-emc"]').text()).toContain(`${oneDecimal(expected.summerEmcPct)} %`);
    expect(wrapper.find('[data-test="movement-winter-emc"]').text()).toContain(`${oneDecimal(expected.winterEmcPct)} %`);
    const change = wrapper.find('[data-test="movement-width-change"]').text();
    expect(change).toContain(`${oneDecimal(expected.widthChangeMm)} mm`);
    expect(change).toContain(`${twoDecimals(millimetresToInches(expected.widthChangeMm))} in`);
    expect(expected.widthChangeMm).toBeGreaterThan(0);
    expect(wrapper.text()).toContain("wider in summer than in winter");
    expect(wrapper.text()).toContain("tangential coefficient");
    expect(wrapper.text()).toMatch(/figure-8 fasteners/);
  });

  it("follows another climate and another slab of the set", async () => {
    const preset = CLIMATE_PRESETS[1]!;
    const wrapper = mountForecast([oak, walnut]);
    await wrapper.find(`input[name="movement-climate"][value="${preset.id}"]`).setValue(true);
    await wrapper.find(`input[name="movement-slab"][value="${walnut.id}"]`).setValue(true);
    const expected = seasonalMovement({
      widthMm: walnut.averageWidthMm,
      speciesSlug: walnut.speciesSlug,
      summer: preset.summer,
      winter: preset.winter,
    });
    expect(wrapper.find('[data-test="movement-width-change"]').text()).toContain(`${oneDecimal(expected.widthChangeMm)} mm`);
    expect(wrapper.find('[data-test="movement-summer-emc"]').text()).toContain(`${oneDecimal(expected.summerEmcPct)} %`);
  });

  it("works out the person's own figures, and says what is missing", async () => {
    const wrapper = mountForecast();
    await wrapper.find('input[name="movement-climate"][value="custom"]').setValue(true);
    await wrapper.find("#movement-summer-temperature").setValue("26");
    await wrapper.find("#movement-summer-humidity").setValue("80");
    await wrapper.find("#movement-winter-temperature").setValue("21");
    await wrapper.find("#movement-winter-humidity").setValue("25");
    const expected = seasonalMovement({
      widthMm: oak.averageWidthMm,
      speciesSlug: oak.speciesSlug,
      summer: { temperatureC: 26, relativeHumidityPct: 80 },
      winter: { temperatureC: 21, relativeHumidityPct: 25 },
    });
    expect(wrapper.find('[data-test="movement-width-change"]').text()).toContain(`${oneDecimal(expected.widthChangeMm)} mm`);
    // 80 % RH gives an EMC above 14 %, outside the handbook coefficients' range: the page says so.
    expect(expected.notes).toContain("outside_coefficient_range");
    expect(wrapper.text()).toContain("rough guide");

    await wrapper.find("#movement-winter-humidity").setValue("");
    expect(wrapper.find('[data-test="movement-width-change"]').exists()).toBe(false);
    expect(wrapper.find('[role="alert"]').text()).toContain("for both seasons");
  });
});
