import type { Order } from "@grainyard/contracts";
import { windowLabel } from "./orders.ts";

/**
 * Every line that says where an order stands and what comes next, worded for the one reading it:
 * the buyer and the sawyer are told what to do themselves ("Choose a pickup time") or what the
 * other side does next ("The sawyer will propose pickup times"); anyone else (an admin) reads about
 * both in the third person. One function of the order's status (with the facts that change the
 * step: pickup or freight, a chosen window, the carrier) and the reader, so no screen words a step
 * for the wrong party. The order list shows `next`; the order page shows `detail`.
 */

export type OrderReader = Order["viewerIs"];

type Facts = Pick<Order, "status" | "handover" | "chosenPickupWindow" | "pickupTimeZone" | "carrier">;

export interface OrderStepWording {
  /** A short line for lists: "Choose a pickup time". Null when nothing comes next. */
  next: string | null;
  /** The same in a sentence or two, for the order page. Null when nothing comes next. */
  detail: string | null;
  /** Whether the next step is the reader's own to take. */
  yours: boolean;
}

const none: OrderStepWording = { next: null, detail: null, yours: false };
const mine = (next: string, detail: string): OrderStepWording => ({ next, detail, yours: true });
const theirs = (next: string, detail: string): OrderStepWording => ({ next, detail, yours: false });

export function orderStepWording(order: Facts, reader: OrderReader): OrderStepWording {
  const pickup = order.handover === "pickup";
  const carrier = order.carrier ?? "the carrier";
  switch (order.status) {
    case "awaiting_payment":
      if (reader === "buyer") return mine("Finish paying", "The slab is held for you while you pay on the payment page.");
      return theirs("Waiting for the buyer's payment", "The slab is held while the buyer pays; it goes back on sale if they do not.");
    case "paid":
      if (pickup) {
        if (reader === "sawyer")
          return mine("Propose pickup times", "Propose a few pickup times and say where to come; the buyer picks one.");
        if (reader === "buyer")
          return theirs(
            "The sawyer will propose pickup times",
            "The sawyer is getting it ready and will propose pickup times. We'll e-mail you.",
          );
        return theirs("Waiting for the sawyer to propose pickup times", "The sawyer has not proposed pickup times yet.");
      }
      if (reader === "sawyer")
        return mine("Ship it and add tracking", "Crate it for the carrier, then add the carrier and the tracking reference here.");
      if (reader === "buyer")
        return theirs(
          "The sawyer is preparing the shipment",
          "The sawyer is crating it for the carrier and will add the tracking reference. We'll e-mail you.",
        );
      return theirs("Waiting for the sawyer to ship it", "The sawyer has not shipped it yet.");
    case "ready_for_pickup": {
      const booked = order.chosenPickupWindow ? windowLabel(order.chosenPickupWindow, order) : null;
      if (booked) {
        if (reader === "buyer") return theirs(`Collect it ${booked}`, `Your pickup is booked for ${booked}. Bring help to lift it.`);
        if (reader === "sawyer")
          return mine(`Hand it over ${booked}`, `The buyer comes ${booked}. Mark it handed over once it has left the yard.`);
        return theirs(`Pickup booked ${booked}`, `The buyer collects it ${booked}.`);
      }
      if (reader === "buyer") return mine("Choose a pickup time", "Choose one of the sawyer's pickup times.");
      if (reader === "sawyer")
        return theirs("Waiting for the buyer to choose a pickup time", "Waiting for the buyer to choose one of your pickup times.");
      return theirs("Waiting for the buyer to choose a pickup time", "The buyer has not chosen a pickup time yet.");
    }
    case "shipped":
      if (reader === "sawyer")
        return mine("Mark as handed over when delivered", `When ${carrier} has delivered it, mark it handed over here.`);
      if (reader === "buyer") return theirs(`On its way with ${carrier}`, `On its way with ${carrier}. Have help ready for the delivery.`);
      return theirs(`With ${carrier}`, `On its way with ${carrier}.`);
    case "handed_over":
      if (reader === "buyer")
        return mine(
          "Confirm you have it, or report a problem",
          "Check the slab, then confirm you have it — or tell us if it did not arrive or is not as described.",
        );
      if (reader === "sawyer")
        return theirs(
          "Waiting for the buyer to confirm receipt",
          "The buyer is asked to confirm they have it; otherwise it completes by itself.",
        );
      return theirs("Waiting for the buyer to confirm receipt", "The buyer has not confirmed receipt yet.");
    case "problem_reported":
      if (reader === "buyer")
        return theirs(
          "The desk is looking at your problem",
          "You reported a problem. Our desk is looking at it and will write to you and the sawyer.",
        );
      if (reader === "sawyer")
        return theirs(
          "The buyer reported a problem",
          "The buyer reported a problem. Our desk is looking at it; your share of this sale is held until it decides.",
        );
      return mine("Settle the reported problem", "The buyer reported a problem: refund all or part, or release the sale to the sawyer.");
    default:
      return none;
  }
}
