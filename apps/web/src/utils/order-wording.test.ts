import { describe, expect, it } from "vitest";
import { orderStatuses, type Order } from "@grainyard/contracts";
import { orderStepWording, type OrderReader } from "./order-wording.ts";

type Facts = Pick<Order, "status" | "handover" | "chosenPickupWindow" | "pickupTimeZone" | "carrier">;
const facts = (over: Partial<Facts>): Facts => ({
  status: "paid",
  handover: "pickup",
  chosenPickupWindow: null,
  pickupTimeZone: "America/Chicago",
  carrier: null,
  ...over,
});
const readers: OrderReader[] = ["buyer", "sawyer", "other"];
const window = { startsAt: "2026-12-05T15:00:00.000Z", endsAt: "2026-12-05T17:00:00.000Z" };

/** Every combination the order page and list can show: each status, pickup and freight, with and without a booked window. */
const cases: Facts[] = orderStatuses.flatMap((status) =>
  (["pickup", "freight"] as const).flatMap((handover) =>
    [null, window].map((chosenPickupWindow) => facts({ status, handover, chosenPickupWindow, carrier: "Lakeshore Freight Lines" })),
  ),
);

describe("order step wording for the one reading it", () => {
  it("tells the buyer to choose a pickup time, and the sawyer that the buyer chooses", () => {
    const ready = facts({ status: "ready_for_pickup" });
    expect(orderStepWording(ready, "buyer")).toMatchObject({ next: "Choose a pickup time", yours: true });
    expect(orderStepWording(ready, "sawyer")).toMatchObject({ next: "Waiting for the buyer to choose a pickup time", yours: false });
  });

  it("tells the sawyer to propose times or ship, and the buyer that the sawyer will", () => {
    expect(orderStepWording(facts({ status: "paid" }), "sawyer")).toMatchObject({ next: "Propose pickup times", yours: true });
    expect(orderStepWording(facts({ status: "paid" }), "buyer")).toMatchObject({
      next: "The sawyer will propose pickup times",
      yours: false,
    });
    expect(orderStepWording(facts({ status: "paid", handover: "freight" }), "sawyer")).toMatchObject({ yours: true });
    expect(orderStepWording(facts({ status: "shipped", handover: "freight", carrier: "Lakeshore Freight Lines" }), "buyer").next).toBe(
      "On its way with Lakeshore Freight Lines",
    );
  });

  it("asks the buyer, after hand-over, to confirm or report a problem; the sawyer waits; the desk settles a problem", () => {
    expect(orderStepWording(facts({ status: "handed_over" }), "buyer")).toMatchObject({ yours: true });
    expect(orderStepWording(facts({ status: "handed_over" }), "buyer").next).toMatch(/report a problem/);
    expect(orderStepWording(facts({ status: "handed_over" }), "sawyer")).toMatchObject({ yours: false });
    expect(orderStepWording(facts({ status: "problem_reported" }), "other")).toMatchObject({
      next: "Settle the reported problem",
      yours: true,
    });
    expect(orderStepWording(facts({ status: "problem_reported" }), "buyer").detail).toMatch(/^You reported a problem/);
    expect(orderStepWording(facts({ status: "problem_reported" }), "sawyer").detail).toMatch(/^The buyer reported a problem/);
  });

  it("never words a step for the wrong party: no line tells its own reader to wait for themselves", () => {
    for (const order of cases)
      for (const reader of readers) {
        const { next, detail } = orderStepWording(order, reader);
        const text = `${next ?? ""} ${detail ?? ""}`;
        if (reader === "buyer") expect({ order, reader, text }).not.toMatchObject({ text: expect.stringMatching(/the buyer/i) });
        if (reader === "sawyer") expect({ order, reader, text }).not.toMatchObject({ text: expect.stringMatching(/the sawyer/i) });
        // Anyone else reads about both sides in the third person, never "you".
        if (reader === "other" && order.status !== "problem_reported")
          expect({ order, reader, text }).not.toMatchObject({ text: expect.stringMatching(/\byou(r)?\b/i) });
      }
  });

  it("gives a next step to every open order and none to an ended one", () => {
    for (const order of cases)
      for (const reader of readers) {
        const wording = orderStepWording(order, reader);
        const ended = ["completed", "cancelled", "refunded", "payment_failed", "expired"].includes(order.status);
        expect({ status: order.status, reader, has: wording.next !== null && wording.detail !== null }).toEqual({
          status: order.status,
          reader,
          has: !ended,
        });
      }
  });

  it("gives each step to exactly one party, matching the order life-cycle's transitions", () => {
    const owner = (order: Facts) => readers.filter((reader) => orderStepWording(order, reader).yours);
    expect(owner(facts({ status: "paid" }))).toEqual(["sawyer"]);
    expect(owner(facts({ status: "ready_for_pickup" }))).toEqual(["buyer"]);
    expect(owner(facts({ status: "ready_for_pickup", chosenPickupWindow: window }))).toEqual(["sawyer"]);
    expect(owner(facts({ status: "shipped", handover: "freight" }))).toEqual(["sawyer"]);
    expect(owner(facts({ status: "handed_over" }))).toEqual(["buyer"]);
    expect(owner(facts({ status: "problem_reported" }))).toEqual(["other"]);
  });
});
