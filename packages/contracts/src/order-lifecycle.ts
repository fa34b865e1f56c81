/**
 * The order's life-cycle in one place, for the API and the web: its statuses and their labels,
 * the named sets of statuses the rules talk about, and every allowed transition with who may make
 * it. A service's conditional status update takes its "from" statuses from `orderTransitions`;
 * the web reads the same sets to draw an order.
 *
 * In short: "Buy" makes an order awaiting payment (the slab held); the provider's word makes it
 * paid, or expired when the hold runs out (the slab back on sale). A declined card changes nothing:
 * the buyer may try another card on the same page while the hold lasts. (payment_failed is kept
 * for orders stored before that rule; no transition leads there now.) A pickup order becomes ready for
 * pickup when the sawyer proposes windows, a freight order shipped; either is then handed over and
 * completed (by the buyer, or by itself some days later). Before hand-over either side may cancel;
 * the refund then makes it refunded. An admin may refund a paid order for a dispute. After
 * hand-over the buyer may report a problem instead of confirming receipt: the order then waits for
 * the desk (it does not complete by itself), which refunds it (in full: refunded; in part: the rest
 * is the sawyer's and it completes) or releases the sale to the sawyer (completed).
 */

export const orderStatuses = [
  "awaiting_payment",
  "paid",
  "ready_for_pickup",
  "shipped",
  "handed_over",
  "completed",
  "cancelled",
  "payment_failed",
  "expired",
  "refunded",
  "problem_reported",
] as const;
export type OrderStatus = (typeof orderStatuses)[number];

export const orderStatusLabels: Record<OrderStatus, string> = {
  // The buyer holds the slab while on the payment page; they may leave it without paying.
  awaiting_payment: "Waiting for payment",
  paid: "Paid",
  ready_for_pickup: "Ready for pickup",
  shipped: "Shipped",
  handed_over: "Handed over",
  completed: "Completed",
  cancelled: "Cancelled",
  payment_failed: "Payment did not go through",
  expired: "Reservation ran out",
  refunded: "Refunded",
  problem_reported: "Problem reported",
};

/**
 * An order still awaiting payment whose buyer came back from the payment page having paid: the
 * provider's word has not arrived yet. Only the order page knows this (the provider sends the
 * buyer back to it with `?paid=1`); everywhere else the status's own label applies.
 */
export const paymentConfirmingLabel = "Payment being confirmed";

/** Who moves an order: its buyer, its sawyer, an admin, or Grainyard itself (provider events, sweeps). */
export type OrderParty = "buyer" | "sawyer" | "admin" | "system";
export const orderParties: readonly OrderParty[] = ["buyer", "sawyer", "admin", "system"];

/** The named groups of statuses the rules speak of. */
export const orderStatusSets = {
  /** The buyer is at the provider's page; the slab is held for them. */
  awaitingPayment: ["awaiting_payment"],
  /** A payment may still arrive for these (late, after the page failed or the hold ran out). */
  paymentMayArrive: ["awaiting_payment", "payment_failed", "expired"],
  /** Paid, not yet on its way or handed over: buyer or sawyer may call it off. */
  cancellable: ["paid", "ready_for_pickup"],
  /** Paid and not settled: an admin may refund all or part of it for a dispute. */
  refundable: ["paid", "ready_for_pickup", "shipped", "handed_over", "completed", "problem_reported"],
  /**
   * The slab left the sawyer's hands: the sale is theirs once the hold is over. (Not an order whose
   * buyer reported a problem: its money waits for the desk.)
   */
  handedOver: ["handed_over", "completed"],
  /** Called off after payment: the money went (or is going) back. */
  calledOff: ["cancelled", "refunded"],
  /** The money is settled one way or the other (what is still owed to the sawyer is paid or taken back at once). */
  settled: ["cancelled", "refunded"],
  /** A sale happened (not just a hold that lapsed): what a sawyer sees in their orders. */
  sold: ["paid", "ready_for_pickup", "shipped", "handed_over", "completed", "cancelled", "refunded", "problem_reported"],
  /** The buyer reported a problem after hand-over: the desk decides; it never completes by itself. */
  withTheDesk: ["problem_reported"],
  /** Completed: its buyer may review it (once; see order-reviews.ts). */
  reviewable: ["completed"],
  /** Nothing is left for the buyer or the sawyer to do. */
  ended: ["completed", "cancelled", "refunded", "payment_failed", "expired"],
} as const satisfies Record<string, readonly OrderStatus[]>;
export type OrderStatusSet = keyof typeof orderStatusSets;

export interface OrderTransition {
  readonly from: readonly OrderStatus[];
  readonly to: OrderStatus;
  readonly by: readonly OrderParty[];
  /** Only for orders handed over this way. */
  readonly handover?: "pickup" | "freight";
}

const sets = orderStatusSets;

/** Every allowed move of an order's status, by name, with who may make it. */
export const orderTransitions = {
  /** The provider says the buyer paid (and the slab is still theirs to have). */
  confirmPayment: { from: sets.paymentMayArrive, to: "paid", by: ["system"] },
  /** The payment arrived after the slab was sold to someone else: the money goes straight back. */
  refundLatePayment: { from: sets.paymentMayArrive, to: "refunded", by: ["system"] },
  /** The hold ran out (the sweep, the provider's expiry), or an admin suspended the buyer. */
  expireReservation: { from: sets.awaitingPayment, to: "expired", by: ["system", "admin"] },
  /** The provider could not be reached to open the payment page, so nothing stays reserved. */
  dropUnopenedCheckout: { from: sets.awaitingPayment, to: "cancelled", by: ["system"] },
  /** The sawyer proposes pickup windows (again, if none suits). */
  proposePickupWindows: { from: ["paid", "ready_for_pickup"], to: "ready_for_pickup", by: ["sawyer"], handover: "pickup" },
  /** The buyer picks one of the windows (the status stays). */
  choosePickupWindow: { from: ["ready_for_pickup"], to: "ready_for_pickup", by: ["buyer"], handover: "pickup" },
  markShipped: { from: ["paid"], to: "shipped", by: ["sawyer"], handover: "freight" },
  markHandedOver: { from: ["ready_for_pickup", "shipped"], to: "handed_over", by: ["sawyer"] },
  confirmReceipt: { from: ["handed_over"], to: "completed", by: ["buyer"] },
  /** Instead of confirming receipt, the buyer says there is a problem (once): it waits for the desk. */
  reportProblem: { from: ["handed_over"], to: "problem_reported", by: ["buyer"] },
  /** The desk decides a reported problem for the sawyer (or refunds part of it): the sale is theirs. */
  settleProblem: { from: ["problem_reported"], to: "completed", by: ["admin"] },
  /** The days after hand-over ran out without the buyer confirming. */
  completeAutomatically: { from: ["handed_over"], to: "completed", by: ["system"] },
  cancel: { from: sets.cancellable, to: "cancelled", by: ["buyer", "sawyer"] },
  /** The provider took the full refund of a cancelled order. */
  recordCancellationRefund: { from: ["cancelled"], to: "refunded", by: ["system"] },
  /** An admin's dispute refund that returns everything left of what the buyer paid. */
  refundInFull: { from: sets.refundable, to: "refunded", by: ["admin"] },
} as const satisfies Record<string, OrderTransition>;
export type OrderTransitionName = keyof typeof orderTransitions;

/** The statuses a transition starts from: the "from" of its conditional update. */
export function transitionFrom(name: OrderTransitionName): OrderStatus[] {
  return [...orderTransitions[name].from];
}

/** Whether this party may make this transition on an order as it stands now. */
export function canMakeTransition(
  name: OrderTransitionName,
  order: { status: OrderStatus; handover?: "pickup" | "freight" },
  party: OrderParty,
): boolean {
  const transition: OrderTransition = orderTransitions[name];
  if (!transition.by.includes(party)) return false;
  if (transition.handover && order.handover && transition.handover !== order.handover) return false;
  return transition.from.includes(order.status);
}

/** Whether a status belongs to one of the named sets. */
export function isOrderStatusIn(set: OrderStatusSet, status: OrderStatus): boolean {
  return (orderStatusSets[set] as readonly OrderStatus[]).includes(status);
}

/** The statuses of a named set, as a fresh list (for a query's `IN`). */
export function orderStatusesIn(set: OrderStatusSet): OrderStatus[] {
  return [...orderStatusSets[set]];
}
