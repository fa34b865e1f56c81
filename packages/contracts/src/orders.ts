import { z } from "zod";

/** Buying a slab: the handover choice, and the order as the buyer (or the sawyer) sees it. */
export const checkoutInputSchema = z
  .object({
    handover: z.enum(["pickup", "freight"], { error: "Choose pickup at the yard or freight." }),
    deliveryAddress: z.string().trim().max(500, "Keep the address under 500 characters.").nullable().optional(),
  })
  .superRefine((input, context) => {
    if (input.handover === "freight" && !input.deliveryAddress) context.addIssue({ code: "custom", path: ["deliveryAddress"], message: "Where should the freight go?" });
  });
export type CheckoutInput = z.infer<typeof checkoutInputSchema>;

export const orderStatusLabels = {
  awaiting_payment: "Payment being confirmed",
  paid: "Paid",
  ready_for_pickup: "Ready for pickup",
  shipped: "Shipped",
  handed_over: "Handed over",
  completed: "Completed",
  cancelled: "Cancelled",
  payment_failed: "Payment did not go through",
  expired: "Reservation ran out",
  refunded: "Refunded",
} as const;

export const orderSchema = z.object({
  id: z.string(),
  status: z.enum(Object.keys(orderStatusLabels) as [keyof typeof orderStatusLabels, ...(keyof typeof orderStatusLabels)[]]),
  listingId: z.string(),
  title: z.string(),
  currency: z.string(),
  priceMinor: z.number(),
  taxMinor: z.number(),
  totalMinor: z.number(),
  handover: z.enum(["pickup", "freight"]),
  deliveryAddress: z.string().nullable(),
  reservedUntil: z.string(),
  paidAt: z.string().nullable(),
  slabs: z.array(z.record(z.string(), z.unknown())),
  sawyerShare: z.object({ platformFeeMinor: z.number(), processingFeeMinor: z.number(), sawyerNetMinor: z.number() }).nullable(),
  createdAt: z.string(),
});
export type Order = z.infer<typeof orderSchema>;
export const checkoutResultSchema = z.object({ order: orderSchema, checkoutUrl: z.string() });
export const orderEnvelopeSchema = z.object({ order: orderSchema });
export const orderListSchema = z.object({ orders: z.array(orderSchema) });
