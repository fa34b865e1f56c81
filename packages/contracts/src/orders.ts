import { z } from "zod";
import { orderStatuses } from "./order-lifecycle.ts";
import { slabSchema } from "./yard.ts";

/** Buying a slab: the handover choice, and the order as the buyer (or the sawyer) sees it. */
export const checkoutInputSchema = z
  .object({
    handover: z.enum(["pickup", "freight"], { error: "Choose pickup at the yard or freight." }),
    deliveryAddress: z.string().trim().max(500, "Keep the address under 500 characters.").nullable().optional(),
  })
  .superRefine((input, context) => {
    if (input.handover === "freight" && !input.deliveryAddress)
      context.addIssue({ code: "custom", path: ["deliveryAddress"], message: "Where should the freight go?" });
  });
export type CheckoutInput = z.infer<typeof checkoutInputSchema>;

/** A pickup window, ISO instants. */
export const pickupWindowSchema = z.object({ startsAt: z.string(), endsAt: z.string() });
export type PickupWindow = z.infer<typeof pickupWindowSchema>;

const instant = (what: string) => z.iso.datetime({ offset: true, error: `Give the ${what} as a date and time.` });

/**
 * The sawyer proposes 1–5 windows and says where to come. Windows are instants; the sawyer's form
 * reads the times typed as yard time (`yardTimeToInstant` with the order's `pickupTimeZone`).
 */
export const pickupWindowsInputSchema = z.object({
  windows: z
    .array(
      z
        .object({ startsAt: instant("start"), endsAt: instant("end") })
        .refine((w) => Date.parse(w.endsAt) > Date.parse(w.startsAt), { path: ["endsAt"], message: "A window must end after it starts." }),
      { error: "Propose at least one pickup window." },
    )
    .min(1, "Propose at least one pickup window.")
    .max(5, "Propose at most five pickup windows."),
  pickupAddress: z
    .string({ error: "Say where the buyer should come." })
    .trim()
    .min(3, "Say where the buyer should come.")
    .max(300, "Keep the address under 300 characters."),
});
export type PickupWindowsInput = z.infer<typeof pickupWindowsInputSchema>;

/** The buyer picks one of the proposed windows by its start. */
export const chooseWindowInputSchema = z.object({ startsAt: instant("window") });
export type ChooseWindowInput = z.infer<typeof chooseWindowInputSchema>;

export const shipmentInputSchema = z.object({
  carrier: z.string({ error: "Name the carrier." }).trim().min(2, "Name the carrier.").max(80, "Keep the carrier under 80 characters."),
  trackingReference: z
    .string({ error: "Give the tracking reference." })
    .trim()
    .min(3, "Give the tracking reference.")
    .max(120, "Keep the reference under 120 characters."),
});
export type ShipmentInput = z.infer<typeof shipmentInputSchema>;

/**
 * The sawyer marks an order handed over. Before the booked pickup time a reason is needed (the
 * buyer reads it on the order); at or after it, or for freight, nothing is asked.
 */
export const handOverInputSchema = z
  .object({
    reason: z.string().trim().max(500, "Keep the reason under 500 characters.").optional(),
  })
  .default({});
export type HandOverInput = z.input<typeof handOverInputSchema>;

export const cancellationInputSchema = z.object({
  reason: z
    .string({ error: "Say why the order is cancelled." })
    .trim()
    .min(3, "Say why the order is cancelled.")
    .max(500, "Keep the reason under 500 characters."),
});
export type CancellationInput = z.infer<typeof cancellationInputSchema>;

/** What the buyer says went wrong after hand-over, instead of confirming receipt. */
export const orderProblemKinds = ["not_received", "not_as_described"] as const;
export type OrderProblemKind = (typeof orderProblemKinds)[number];
export const orderProblemKindLabels: Record<OrderProblemKind, string> = {
  not_received: "I have not received it",
  not_as_described: "It is not as described",
};

export const problemReportInputSchema = z.object({
  kind: z.enum(orderProblemKinds, { error: "Choose what is wrong." }),
  comment: z
    .string({ error: "Tell the desk what happened." })
    .trim()
    .min(10, "Tell the desk what happened (a sentence or two).")
    .max(2000, "Keep it under 2000 characters."),
});
export type ProblemReportInput = z.infer<typeof problemReportInputSchema>;

/** How the desk settled a reported problem: money back (all or part), or the sale released to the sawyer. */
export const orderProblemStatuses = ["open", "refunded", "released"] as const;

/** A problem the buyer reported on an order, as its buyer, its sawyer and the desk read it. */
export const orderProblemSchema = z.object({
  id: z.string(),
  kind: z.enum(orderProblemKinds),
  comment: z.string(),
  status: z.enum(orderProblemStatuses),
  reportedAt: z.string(),
  /** The desk's words to both sides when it settled it. */
  resolutionNote: z.string().nullable(),
  resolvedAt: z.string().nullable(),
  /** What went back to the buyer when it was settled with a refund. */
  refundedMinor: z.number().nullable(),
});
export type OrderProblem = z.infer<typeof orderProblemSchema>;

/** What buying a listing would cost, from the same code as checkout (tax at the configured rate). */
export const checkoutQuoteSchema = z.object({
  quote: z.object({
    currency: z.string(),
    priceMinor: z.number(),
    taxMinor: z.number(),
    taxRateBps: z.number(),
    totalMinor: z.number(),
    reservationMinutes: z.number(),
  }),
});
export type CheckoutQuote = z.infer<typeof checkoutQuoteSchema>["quote"];

/**
 * One slab of an order as it was when the order was made (the figures the buyer agreed to): the
 * slab as the yard showed it then. The API writes each order's snapshot through this schema and
 * the web reads it with the same type. It is the yard's slab schema, so a field added to
 * `slabSchema` later must be optional (or have a default), or the snapshots stored before it stop
 * reading: orders.test.ts keeps a snapshot as stored to prove it.
 */
export const orderSlabSnapshotSchema = slabSchema;
export type OrderSlabSnapshot = z.infer<typeof orderSlabSnapshotSchema>;

export const orderSchema = z.object({
  id: z.string(),
  status: z.enum(orderStatuses),
  listingId: z.string(),
  title: z.string(),
  currency: z.string(),
  priceMinor: z.number(),
  taxMinor: z.number(),
  totalMinor: z.number(),
  handover: z.enum(["pickup", "freight"]),
  deliveryAddress: z.string().nullable(),
  reservedUntil: z.string(),
  /** The provider's payment page, for the buyer while the order awaits payment (a declined card may be retried there). */
  paymentPageUrl: z.string().nullable(),
  paidAt: z.string().nullable(),
  slabs: z.array(orderSlabSnapshotSchema),
  sawyerShare: z.object({ platformFeeMinor: z.number(), processingFeeMinor: z.number(), sawyerNetMinor: z.number() }).nullable(),
  createdAt: z.string(),
  /** Whether the one looking is the buyer or the sawyer of this order (admins: neither). */
  viewerIs: z.enum(["buyer", "sawyer", "other"]),
  parties: z.object({ buyerName: z.string(), yardName: z.string().nullable(), pickupTown: z.string().nullable() }),
  pickupWindows: z.array(pickupWindowSchema),
  /** The yard's IANA time zone: pickup windows are shown to everyone in it (formatPickupWindow). */
  pickupTimeZone: z.string(),
  pickupAddress: z.string().nullable(),
  chosenPickupWindow: pickupWindowSchema.nullable(),
  carrier: z.string().nullable(),
  trackingReference: z.string().nullable(),
  steps: z.object({
    paidAt: z.string().nullable(),
    readyForPickupAt: z.string().nullable(),
    pickupChosenAt: z.string().nullable(),
    shippedAt: z.string().nullable(),
    handedOverAt: z.string().nullable(),
    completedAt: z.string().nullable(),
    cancelledAt: z.string().nullable(),
    refundedAt: z.string().nullable(),
  }),
  /** Who completed it: the buyer, the sweep after the days ran out, or the desk settling a reported problem. */
  completedBy: z.enum(["buyer", "automatic", "desk"]).nullable(),
  cancelledBy: z.enum(["buyer", "sawyer"]).nullable(),
  cancelReason: z.string().nullable(),
  /** Why the sawyer marked it handed over before the booked pickup time (null when it was not early). */
  handOverNote: z.string().nullable(),
  /** When the order completes by itself if the buyer does not confirm (handed over + the configured days). */
  autoCompleteAt: z.string().nullable(),
  /** The problem its buyer reported after hand-over, if any (for the buyer, the sawyer and admins). */
  problem: orderProblemSchema.nullable(),
  /** What the one looking may do now. */
  actions: z.array(
    z.enum([
      "propose_pickup_windows",
      "choose_pickup_window",
      "mark_shipped",
      "mark_handed_over",
      "confirm_receipt",
      "report_problem",
      "cancel",
    ]),
  ),
});
export type Order = z.infer<typeof orderSchema>;
export const checkoutResultSchema = z.object({ order: orderSchema, checkoutUrl: z.string() });
export const orderEnvelopeSchema = z.object({ order: orderSchema });
export const orderListSchema = z.object({ orders: z.array(orderSchema) });

/** The most orders one page of the desk's order search holds. */
export const ORDER_SEARCH_PAGE_MAX = 50;
/**
 * The operator desk's order search: words found in the buyer's name or e-mail, the sawyer's name,
 * e-mail or yard, the slab's title, or the start of the order number; newest first, in keyset pages
 * ("<created ms>.<order id>" of the last order of the page before).
 */
export const orderSearchSchema = z.object({
  q: z.string().trim().max(100, "Keep the search under 100 characters.").optional(),
  cursor: z
    .string()
    .regex(/^\d{1,15}\.[0-9a-f-]{36}$/, "Not a page of these orders.")
    .optional(),
  limit: z.coerce
    .number({ error: "Give the page size as a number." })
    .int("Give the page size as a whole number.")
    .min(1, "A page holds at least one order.")
    .max(ORDER_SEARCH_PAGE_MAX, `A page holds at most ${ORDER_SEARCH_PAGE_MAX} orders.`)
    .default(20),
});
export type OrderSearchInput = z.input<typeof orderSearchSchema>;
export const orderSearchPageSchema = z.object({ orders: z.array(orderSchema), nextCursor: z.string().nullable() });
export type OrderSearchPage = z.infer<typeof orderSearchPageSchema>;

/** The desk's list of reported problems: each with its order and both parties. */
export const orderProblemCaseSchema = orderProblemSchema.extend({
  orderId: z.string(),
  title: z.string(),
  orderStatus: z.enum(orderStatuses),
  currency: z.string(),
  totalMinor: z.number(),
  handover: z.enum(["pickup", "freight"]),
  handedOverAt: z.string().nullable(),
  buyer: z.object({ id: z.string(), displayName: z.string(), email: z.string() }),
  sawyer: z.object({ id: z.string(), displayName: z.string(), yardName: z.string().nullable(), email: z.string() }),
});
export type OrderProblemCase = z.infer<typeof orderProblemCaseSchema>;
export const orderProblemQuerySchema = z.object({ status: z.enum(orderProblemStatuses).optional() });
export const orderProblemListSchema = z.object({ problems: z.array(orderProblemCaseSchema) });

/**
 * The desk settles a problem: a refund through the refund service (everything left when no amount
 * is given; a part leaves the rest to the sawyer), or the sale released to the sawyer. The note
 * goes to both sides.
 */
export const problemResolutionSchema = z.object({
  resolution: z.enum(["refund", "release"], { error: "Choose a refund or releasing the sale." }),
  amountMinor: z.number().int("Give the amount in whole cents.").positive("Refund more than nothing.").optional(),
  note: z
    .string({ error: "Say why (both sides read it)." })
    .trim()
    .min(3, "Say why (both sides read it).")
    .max(1000, "Keep it under 1000 characters."),
});
export type ProblemResolution = z.infer<typeof problemResolutionSchema>;
export const orderProblemCaseEnvelopeSchema = z.object({ problem: orderProblemCaseSchema });
