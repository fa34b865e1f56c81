import { describe, expect, it } from "vitest";
import { mount } from "@vue/test-utils";
import { createPinia } from "pinia";
import naive from "naive-ui";
import ListingPriceSection from "./ListingPriceSection.vue";

const walnut = [{ speciesSlug: "black-walnut", figures: { boardFeet: 20 } }];
const mountWith = (priceMinor: number | null, currency: "USD" | "EUR" = "USD") =>
  mount(ListingPriceSection, {
    props: { editable: true, errors: {}, slabs: walnut, priceMinor, priceMode: "fixed", rate: "", currency },
    global: { plugins: [createPinia(), naive] },
  });

describe("ListingPriceSection", () => {
  it("notes gently, as the price changes, when it is far below the species' usual range", async () => {
    const wrapper = mountWith(40_000);
    expect(wrapper.find('[data-test="low-price-note"]').exists()).toBe(false);
    // $140 for 20 bf of walnut: $7.00 per bf against a usual $15–35 (slab-math's price guide).
    await wrapper.setProps({ priceMinor: 14_000 });
    expect(wrapper.find('[data-test="low-price-note"]').text()).toContain("$7.00 per board foot, far below the $15.00–$35.00");
    await wrapper.setProps({ priceMinor: null });
    expect(wrapper.find('[data-test="low-price-note"]').exists()).toBe(false);
  });

  it("says nothing for a currency the guide does not cover", () => {
    expect(mountWith(14_000, "EUR").find('[data-test="low-price-note"]').exists()).toBe(false);
  });
});
