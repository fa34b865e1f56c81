import { describe, expect, it } from "vitest";
import { mount } from "@vue/test-utils";
import { shippingEstimate } from "@grainyard/slab-math";
import type { Order } from "@grainyard/contracts";
import OrderSteps from "./OrderSteps.vue";
import { freightEstimateMinor } from "../../utils/shipping.ts";
import { SHIPPING_PREVIEW_RATES } from "../../constants/shipping-preview.ts";

const steps = {
  paidAt: null,
  readyForPickupAt: null,
  pickupChosenAt: null,
  shippedAt: null,
  handedOverAt: null,
  completedAt: null,
  cancelledAt: null,
  refundedAt: null,
};
const order = (over: Partial<Order>): Order =>
  ({ status: "paid", handover: "pickup", steps: { ...steps, paidAt: "2026-12-01T10:00:00.000Z" }, ...over }) as unknown as Order;
const states = (wrapper: ReturnType<typeof mount>) =>
  wrapper.findAll("li").map((li) => [
    li.find("strong").text(),
    li
      .classes()
      .find((c) => c.startsWith("steps__item--"))!
      .replace("steps__item--", ""),
  ]);

describe("OrderSteps", () => {
  it("draws pickup orders as paid → ready for pickup → handed over → completed, marking the next step", () => {
    expect(states(mount(OrderSteps, { props: { order: order({}) } }))).toEqual([
      ["Paid", "done"],
      ["Ready for pickup", "next"],
      ["Handed over", "todo"],
      ["Completed", "todo"],
    ]);
  });

  it("draws freight orders with the shipment step, and no next step once cancelled", () => {
    const shipped = order({
      status: "shipped",
      handover: "freight",
      steps: { ...steps, paidAt: "2026-12-01T10:00:00.000Z", shippedAt: "2026-12-02T10:00:00.000Z" },
    });
    expect(states(mount(OrderSteps, { props: { order: shipped } })).map((s) => s.join(":"))).toEqual([
      "Paid:done",
      "Shipped:done",
      "Handed over:next",
      "Completed:todo",
    ]);
    const cancelled = order({ status: "refunded" });
    expect(states(mount(OrderSteps, { props: { order: cancelled } })).map((s) => s[1])).toEqual(["done", "todo", "todo", "todo"]);
  });
});

describe("freightEstimateMinor", () => {
  // The figures are slab-math's shippingEstimate from the preview rate table (tested in slab-math);
  // here: the set's estimate is the sum of each slab's, and a pickup-only slab leaves no estimate.
  const slab = { id: "a", label: "Slab 1", lengthMm: 2440, maxWidthMm: 560, thicknessMm: 51, weightHighKg: 45 };
  it("adds up each slab's crate", () => {
    const one = shippingEstimate({
      lengthMm: slab.lengthMm,
      widthMm: slab.maxWidthMm,
      thicknessMm: slab.thicknessMm,
      slabKg: slab.weightHighKg,
      rates: SHIPPING_PREVIEW_RATES,
    });
    expect(one.costMinor).toBeGreaterThan(0);
    expect(freightEstimateMinor([slab, { ...slab, id: "b" }])).toBe(2 * one.costMinor!);
  });
  it("gives none when a slab is too long for freight", () => {
    expect(freightEstimateMinor([slab, { ...slab, id: "c", lengthMm: 9000 }])).toBeNull();
  });
});
