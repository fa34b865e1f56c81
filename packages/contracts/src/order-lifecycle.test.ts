import { describe, expect, it } from "vitest";
import {
  canMakeTransition,
  isOrderStatusIn,
  orderParties,
  orderStatuses,
  orderStatusLabels,
  orderStatusSets,
  orderTransitions,
  transitionFrom,
  type OrderParty,
  type OrderTransition,
  type OrderStatus,
  type OrderTransitionName,
} from "./order-lifecycle.ts";

/*
 * The rules of PRODUCT.md's checkout and money sections, written out as a grid: for each
 * transition and each party, one mark per status in this order —
 *   awaiting_payment, paid, ready_for_pickup, shipped, handed_over, completed, cancelled,
 *   payment_failed, expired, refunded, problem_reported
 * — "x" where the party may make it from that status, "." where it is refused. Every one of the
 * 15 × 4 × 11 combinations is checked against the module.
 */
const none = "...........";
const grid: Record<OrderTransitionName, Record<OrderParty, string>> = {
  //                         a p r s h c C f e R P
  confirmPayment: { buyer: none, sawyer: none, admin: none, system: "x......xx.." },
  refundLatePayment: { buyer: none, sawyer: none, admin: none, system: "x......xx.." },
  expireReservation: { buyer: none, sawyer: none, admin: "x..........", system: "x.........." },
  dropUnopenedCheckout: { buyer: none, sawyer: none, admin: none, system: "x.........." },
  proposePickupWindows: { buyer: none, sawyer: ".xx........", admin: none, system: none },
  choosePickupWindow: { buyer: "..x........", sawyer: none, admin: none, system: none },
  markShipped: { buyer: none, sawyer: ".x.........", admin: none, system: none },
  markHandedOver: { buyer: none, sawyer: "..xx.......", admin: none, system: none },
  confirmReceipt: { buyer: "....x......", sawyer: none, admin: none, system: none },
  completeAutomatically: { buyer: none, sawyer: none, admin: none, system: "....x......" },
  cancel: { buyer: ".xx........", sawyer: ".xx........", admin: none, system: none },
  recordCancellationRefund: { buyer: none, sawyer: none, admin: none, system: "......x...." },
  refundInFull: { buyer: none, sawyer: none, admin: ".xxxxx....x", system: none },
  reportProblem: { buyer: "....x......", sawyer: none, admin: none, system: none },
  settleProblem: { buyer: none, sawyer: none, admin: "..........x", system: none },
};

describe("the order life-cycle", () => {
  it("names every transition in the grid, and the grid names no other", () => {
    expect(Object.keys(orderTransitions).sort()).toEqual(Object.keys(grid).sort());
  });

  for (const [name, byParty] of Object.entries(grid) as [OrderTransitionName, Record<OrderParty, string>][]) {
    it(`${name}: allowed and refused for every party and status`, () => {
      for (const party of orderParties) {
        const marks = byParty[party];
        expect(marks).toHaveLength(orderStatuses.length);
        orderStatuses.forEach((status, index) => {
          const expected = marks[index] === "x";
          const order = { status, handover: (orderTransitions[name] as OrderTransition).handover };
          expect({ name, party, status, allowed: canMakeTransition(name, order, party) }).toEqual({
            name,
            party,
            status,
            allowed: expected,
          });
        });
      }
    });
  }

  it("lands each transition where the product says", () => {
    const lands: Record<OrderTransitionName, OrderStatus> = {
      confirmPayment: "paid",
      refundLatePayment: "refunded",
      expireReservation: "expired",
      dropUnopenedCheckout: "cancelled",
      proposePickupWindows: "ready_for_pickup",
      choosePickupWindow: "ready_for_pickup",
      markShipped: "shipped",
      markHandedOver: "handed_over",
      confirmReceipt: "completed",
      completeAutomatically: "completed",
      cancel: "cancelled",
      recordCancellationRefund: "refunded",
      refundInFull: "refunded",
      reportProblem: "problem_reported",
      settleProblem: "completed",
    };
    for (const [name, to] of Object.entries(lands) as [OrderTransitionName, OrderStatus][]) expect(orderTransitions[name].to).toBe(to);
  });

  it("keeps pickup steps to pickup orders and shipping to freight orders", () => {
    expect(canMakeTransition("proposePickupWindows", { status: "paid", handover: "pickup" }, "sawyer")).toBe(true);
    expect(canMakeTransition("proposePickupWindows", { status: "paid", handover: "freight" }, "sawyer")).toBe(false);
    expect(canMakeTransition("choosePickupWindow", { status: "ready_for_pickup", handover: "freight" }, "buyer")).toBe(false);
    expect(canMakeTransition("markShipped", { status: "paid", handover: "freight" }, "sawyer")).toBe(true);
    expect(canMakeTransition("markShipped", { status: "paid", handover: "pickup" }, "sawyer")).toBe(false);
    // Hand-over and cancelling do not depend on the way it goes.
    expect(canMakeTransition("markHandedOver", { status: "shipped", handover: "freight" }, "sawyer")).toBe(true);
    expect(canMakeTransition("cancel", { status: "ready_for_pickup", handover: "pickup" }, "buyer")).toBe(true);
  });

  it("answers a fresh list of from-statuses (a caller changing it cannot change the rules)", () => {
    const from = transitionFrom("cancel");
    expect(from).toEqual(["paid", "ready_for_pickup"]);
    from.push("shipped");
    expect(transitionFrom("cancel")).toEqual(["paid", "ready_for_pickup"]);
  });
});

describe("the named sets of statuses", () => {
  it("has a label for every status", () => {
    expect(Object.keys(orderStatusLabels).sort()).toEqual([...orderStatuses].sort());
    for (const status of orderStatuses) expect(orderStatusLabels[status].length).toBeGreaterThan(0);
  });

  it("says which orders can be cancelled, refunded for a dispute, are settled, handed over, sold", () => {
    expect(orderStatusSets.cancellable).toEqual(["paid", "ready_for_pickup"]);
    expect(orderStatusSets.refundable).toEqual(["paid", "ready_for_pickup", "shipped", "handed_over", "completed", "problem_reported"]);
    expect(orderStatusSets.settled).toEqual(["cancelled", "refunded"]);
    expect(orderStatusSets.handedOver).toEqual(["handed_over", "completed"]);
    // A reported problem holds the sawyer's money and the order's completion until the desk decides.
    expect(isOrderStatusIn("handedOver", "problem_reported")).toBe(false);
    expect(isOrderStatusIn("sold", "problem_reported")).toBe(true);
    expect(transitionFrom("completeAutomatically")).not.toContain("problem_reported");
    // Only a completed order may be reviewed: not one still with the carrier, nor one refunded.
    expect(orderStatusSets.reviewable).toEqual(["completed"]);
    expect(isOrderStatusIn("sold", "awaiting_payment")).toBe(false);
    expect(isOrderStatusIn("sold", "expired")).toBe(false);
    expect(isOrderStatusIn("sold", "refunded")).toBe(true);
    // Whatever can be cancelled can be refunded by an admin instead.
    for (const status of orderStatusSets.cancellable) expect(isOrderStatusIn("refundable", status)).toBe(true);
  });

  it("leaves nothing for the buyer or the sawyer to do on an ended order or one with the desk, and something on every other", () => {
    const stepsFor = (status: OrderStatus, party: OrderParty) =>
      (Object.keys(orderTransitions) as OrderTransitionName[]).filter((name) =>
        (["pickup", "freight"] as const).some((handover) => canMakeTransition(name, { status, handover }, party)),
      );
    for (const status of orderStatuses) {
      const people = [...stepsFor(status, "buyer"), ...stepsFor(status, "sawyer")];
      if (isOrderStatusIn("ended", status)) expect({ status, people }).toEqual({ status, people: [] });
      else if (isOrderStatusIn("withTheDesk", status)) {
        expect({ status, people }).toEqual({ status, people: [] });
        expect(stepsFor(status, "admin").length, status).toBeGreaterThan(0);
      }
      // An order awaiting payment waits for the provider, not for a person.
      else if (status !== "awaiting_payment") expect(people.length, status).toBeGreaterThan(0);
    }
  });

  it("reaches every status from awaiting payment, except payment_failed, which only orders stored before retries were allowed carry", () => {
    const reached = new Set<OrderStatus>(["awaiting_payment"]);
    for (let round = 0; round < orderStatuses.length; round++)
      for (const transition of Object.values(orderTransitions))
        if (transition.from.some((status) => reached.has(status))) reached.add(transition.to);
    expect([...reached].sort()).toEqual(orderStatuses.filter((status) => status !== "payment_failed").sort());
  });
});
