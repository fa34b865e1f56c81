import { z } from "zod";
import { currencies } from "./listings.ts";
import { orderSchema } from "./orders.ts";

/*
 * Offers on a listing, in one place for the API and the web: the statuses, who may move an offer
 * and from where (every service update takes its from-statuses from `offerTransitions`), the
 * limits, and the schemas.
 *
 * In short: a sawyer says per listing whether offers are welcome, with an optional floor they never
 * show. A signed-in buyer offers an amount below the price with a message and how they would take
 * the slab (pickup or freight). An offer below the floor is declined at once, politely, without the
 * floor's value. Otherwise the sawyer answers once per round — accept, decline or counter — within
 * OFFER_HOURS, or the offer expires. A counter waits OFFER_HOURS for the buyer, who may accept it,
 * offer again (a new round, up to OFFER_ROUNDS) or withdraw. Accepting reserves the slab for the
 * buyer at the agreed price (the same conditional update as "Buy") and opens the same hosted
 * checkout; every other open offer on the listing is declined in that transaction.
 */

/** Hours an offer (or a counter) waits for its answer before it expires. */
export const OFFER_HOURS = 48;
/** Rounds of offer and counter on one offer thread: the buyer's first offer and up to two more after counters. */
export const OFFER_ROUNDS = 3;
/** The largest amount anyone may type (the listing form's own upper bound). */
export const MAX_OFFER_MINOR = 100_000_000;

export const offerStatuses = ["open", "countered", "accepted", "declined", "withdrawn", "expired"] as const;
export type OfferStatus = (typeof offerStatuses)[number];

export const offerStatusLabels: Record<OfferStatus, string> = {
  open: "Waiting for the sawyer",
  countered: "Counter waiting for the buyer",
  accepted: "Accepted",
  declined: "Declined",
  withdrawn: "Withdrawn",
  expired: "Expired unanswered",
};

/** Why an offer was declined. */
export const offerDeclineReasons = ["sawyer", "below_floor", "other_offer_accepted", "slab_sold"] as const;
export type OfferDeclineReason = (typeof offerDeclineReasons)[number];

export const offerDeclineReasonLabels: Record<OfferDeclineReason, string> = {
  sawyer: "The sawyer declined it.",
  below_floor: "The sawyer is not taking offers this low on this slab.",
  other_offer_accepted: "The sawyer accepted another offer on this slab.",
  slab_sold: "The slab was sold.",
};

export type OfferParty = "buyer" | "sawyer" | "system";

export interface OfferTransition {
  readonly from: readonly OfferStatus[];
  readonly to: OfferStatus;
  readonly by: readonly OfferParty[];
}

/** Statuses still waiting on someone: what expires, what accepting another offer declines. */
export const openOfferStatuses = ["open", "countered"] as const satisfies readonly OfferStatus[];

/** Every allowed move of an offer, by name, with who may make it. */
export const offerTransitions = {
  /** The sawyer takes the buyer's amount. */
  accept: { from: ["open"], to: "accepted", by: ["sawyer"] },
  /** The sawyer says no. */
  decline: { from: ["open"], to: "declined", by: ["sawyer"] },
  /** The sawyer names their own amount (once per round). */
  counter: { from: ["open"], to: "countered", by: ["sawyer"] },
  /** The buyer takes the sawyer's counter. */
  acceptCounter: { from: ["countered"], to: "accepted", by: ["buyer"] },
  /** The buyer offers again after a counter: a new round. */
  offerAgain: { from: ["countered"], to: "open", by: ["buyer"] },
  /** The buyer calls it off. */
  withdraw: { from: openOfferStatuses, to: "withdrawn", by: ["buyer"] },
  /** Nobody answered within OFFER_HOURS. */
  expire: { from: openOfferStatuses, to: "expired", by: ["system"] },
  /** Another offer was accepted, or the slab sold through "Buy". */
  closeForOthers: { from: openOfferStatuses, to: "declined", by: ["system"] },
} as const satisfies Record<string, OfferTransition>;
export type OfferTransitionName = keyof typeof offerTransitions;

/** The statuses a transition starts from: the "from" of its conditional update. */
export function offerTransitionFrom(name: OfferTransitionName): OfferStatus[] {
  return [...offerTransitions[name].from];
}

export function canMakeOfferTransition(name: OfferTransitionName, status: OfferStatus, party: OfferParty): boolean {
  const transition: OfferTransition = offerTransitions[name];
  return transition.by.includes(party) && transition.from.includes(status);
}

// ---- Input ----

/** An amount of money a person types, in minor units: more than zero and within what Grainyard takes. */
export const offerAmountSchema = z
  .number({ error: "Give the amount." })
  .int("Give the amount in whole cents.")
  .min(1, "Give an amount above zero.")
  .max(MAX_OFFER_MINOR, "That amount is beyond what Grainyard takes.");

const offerMessage = z
  .string()
  .trim()
  .max(1000, "Keep the message under 1000 characters.")
  .optional()
  .transform((value) => value ?? "");

const handoverFields = {
  handover: z.enum(["pickup", "freight"], { error: "Choose pickup at the yard or freight." }),
  deliveryAddress: z.string().trim().max(500, "Keep the address under 500 characters.").nullable().optional(),
};

function freightNeedsAddress(input: { handover?: "pickup" | "freight"; deliveryAddress?: string | null }, context: z.RefinementCtx) {
  if (input.handover === "freight" && !input.deliveryAddress)
    context.addIssue({ code: "custom", path: ["deliveryAddress"], message: "Where should the freight go?" });
}

/** A buyer's offer: the amount, a message, and how they would take the slab if it is accepted. */
export const offerInputSchema = z
  .object({ amountMinor: offerAmountSchema, message: offerMessage, ...handoverFields })
  .superRefine(freightNeedsAddress);
export type OfferInput = z.input<typeof offerInputSchema>;

/** The sawyer's counter, or the buyer's next offer after one. */
export const offerAmountInputSchema = z.object({ amountMinor: offerAmountSchema, message: offerMessage });
export type OfferAmountInput = z.input<typeof offerAmountInputSchema>;

export const offerDeclineInputSchema = z.object({ message: offerMessage }).default({ message: "" });
export type OfferDeclineInput = z.input<typeof offerDeclineInputSchema>;

/** The buyer accepting a counter may change how they take the slab. */
export const acceptCounterInputSchema = z
  .object({ handover: handoverFields.handover.optional(), deliveryAddress: handoverFields.deliveryAddress })
  .superRefine(freightNeedsAddress)
  .default({});
export type AcceptCounterInput = z.input<typeof acceptCounterInputSchema>;

/** Per listing: whether offers are welcome, and the floor below which they are declined at once (never shown to buyers). */
export const offerSettingsSchema = z
  .object({
    offersWelcome: z.boolean({ error: "Say whether offers are welcome." }),
    floorMinor: offerAmountSchema.nullable().optional(),
  })
  .transform((value) => ({ offersWelcome: value.offersWelcome, floorMinor: value.floorMinor ?? null }));
export type OfferSettingsInput = z.input<typeof offerSettingsSchema>;
export type OfferSettings = z.output<typeof offerSettingsSchema>;

export const offerListQuerySchema = z.object({
  listingId: z.string().uuid("Not a listing.").optional(),
  /** "open": only offers still waiting on someone. */
  state: z.enum(["open", "all"]).default("all"),
});

// ---- Answers ----

/** One step of an offer's back and forth, oldest first. */
export const offerStepSchema = z.object({
  kind: z.enum(["offer", "counter", "decline"]),
  /** The amount named (null for a decline). */
  amountMinor: z.number().nullable(),
  message: z.string(),
  at: z.string(),
});
export type OfferStep = z.infer<typeof offerStepSchema>;

export const offerSchema = z.object({
  id: z.string(),
  listingId: z.string(),
  listingTitle: z.string(),
  listingPriceMinor: z.number(),
  currency: z.enum(currencies),
  /** The status as it stands now (an offer past its time reads as expired even before the sweep). */
  status: z.enum(offerStatuses),
  declineReason: z.enum(offerDeclineReasons).nullable(),
  /** The buyer's latest amount. */
  amountMinor: z.number(),
  /** The sawyer's counter in this round (null when not countered). */
  counterMinor: z.number().nullable(),
  /** The agreed price once accepted. */
  agreedMinor: z.number().nullable(),
  round: z.number(),
  roundsLeft: z.number(),
  steps: z.array(offerStepSchema),
  handover: z.enum(["pickup", "freight"]),
  /** Until when the one it waits on may answer (null once settled). */
  expiresAt: z.string().nullable(),
  /** The order an accepted offer made. */
  orderId: z.string().nullable(),
  buyerName: z.string(),
  yardName: z.string().nullable(),
  viewerIs: z.enum(["buyer", "sawyer"]),
  /** What the one looking may do now. */
  actions: z.array(z.enum(["accept", "decline", "counter", "accept_counter", "offer_again", "withdraw"])),
  createdAt: z.string(),
  updatedAt: z.string(),
});
export type Offer = z.infer<typeof offerSchema>;
export type OfferAction = Offer["actions"][number];

export const offerEnvelopeSchema = z.object({ offer: offerSchema });
export const offerListSchema = z.object({ offers: z.array(offerSchema) });
/** An accepted offer: the order it made and, for the buyer, the hosted checkout to go to. */
export const offerAcceptedSchema = z.object({ offer: offerSchema, order: orderSchema, checkoutUrl: z.string().nullable() });
export const offerSettingsEnvelopeSchema = z.object({
  settings: z.object({ offersWelcome: z.boolean(), floorMinor: z.number().nullable() }),
});
