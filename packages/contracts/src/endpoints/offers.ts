import { endpoint } from "../endpoint.ts";
import {
  acceptCounterInputSchema,
  offerAcceptedSchema,
  offerAmountInputSchema,
  offerDeclineInputSchema,
  offerEnvelopeSchema,
  offerInputSchema,
  offerListQuerySchema,
  offerListSchema,
  offerSettingsEnvelopeSchema,
  offerSettingsSchema,
} from "../offers.ts";
import { API_PREFIX } from "./prefix.ts";

const buyerOnly = ["buyer"] as const;
const sawyerOnly = ["sawyer"] as const;

/** Offers on a listing: the sawyer's settings, the buyer's offer and each answer (see offers.ts for the rules). */
export const offerEndpoints = {
  getOfferSettings: endpoint({
    method: "GET",
    path: `${API_PREFIX}/yard/listings/:listingId/offer-settings`,
    summary: "Whether the sawyer's listing welcomes offers, and its floor (the sawyer's own listing only).",
    access: sawyerOnly,
    answer: offerSettingsEnvelopeSchema,
  }),
  setOfferSettings: endpoint({
    method: "PUT",
    path: `${API_PREFIX}/yard/listings/:listingId/offer-settings`,
    summary: "The sawyer welcomes offers on a listing (or not), with an optional floor buyers never see.",
    access: sawyerOnly,
    body: offerSettingsSchema,
    answer: offerSettingsEnvelopeSchema,
    errors: ["listing_not_editable"],
  }),
  makeOffer: endpoint({
    method: "POST",
    path: `${API_PREFIX}/listings/:listingId/offers`,
    summary: "A buyer offers an amount below the price, with a message (declined at once below the sawyer's floor).",
    access: buyerOnly,
    body: offerInputSchema,
    answer: offerEnvelopeSchema,
    status: 201,
    errors: ["offers_closed", "offer_exists", "listing_not_available"],
  }),
  listOffers: endpoint({
    method: "GET",
    path: `${API_PREFIX}/offers`,
    summary: "The buyer's own offers, or the offers on the sawyer's listings, newest first.",
    access: ["buyer", "sawyer"],
    query: offerListQuerySchema,
    answer: offerListSchema,
  }),
  getOffer: endpoint({
    method: "GET",
    path: `${API_PREFIX}/offers/:offerId`,
    summary: "One offer, for its buyer or the listing's sawyer.",
    access: ["buyer", "sawyer"],
    answer: offerEnvelopeSchema,
  }),
  acceptOffer: endpoint({
    method: "POST",
    path: `${API_PREFIX}/offers/:offerId/accept`,
    summary:
      "The sawyer accepts: the slab is reserved for the buyer at that price and the hosted checkout opened; other offers are declined.",
    access: sawyerOnly,
    answer: offerAcceptedSchema,
    errors: ["offer_state", "listing_not_available", "payments_unavailable"],
  }),
  declineOffer: endpoint({
    method: "POST",
    path: `${API_PREFIX}/offers/:offerId/decline`,
    summary: "The sawyer declines, with an optional message.",
    access: sawyerOnly,
    body: offerDeclineInputSchema,
    answer: offerEnvelopeSchema,
    errors: ["offer_state"],
  }),
  counterOffer: endpoint({
    method: "POST",
    path: `${API_PREFIX}/offers/:offerId/counter`,
    summary: "The sawyer names their own amount, once per round.",
    access: sawyerOnly,
    body: offerAmountInputSchema,
    answer: offerEnvelopeSchema,
    errors: ["offer_state"],
  }),
  acceptCounter: endpoint({
    method: "POST",
    path: `${API_PREFIX}/offers/:offerId/accept-counter`,
    summary: "The buyer takes the sawyer's counter: reserved at that price, on to the hosted checkout.",
    access: buyerOnly,
    body: acceptCounterInputSchema,
    answer: offerAcceptedSchema,
    errors: ["offer_state", "listing_not_available", "payments_unavailable"],
  }),
  offerAgain: endpoint({
    method: "POST",
    path: `${API_PREFIX}/offers/:offerId/offer-again`,
    summary: "The buyer answers a counter with a new amount (a new round, while rounds are left).",
    access: buyerOnly,
    body: offerAmountInputSchema,
    answer: offerEnvelopeSchema,
    errors: ["offer_state"],
  }),
  withdrawOffer: endpoint({
    method: "POST",
    path: `${API_PREFIX}/offers/:offerId/withdraw`,
    summary: "The buyer calls off an offer still waiting on someone.",
    access: buyerOnly,
    answer: offerEnvelopeSchema,
    errors: ["offer_state"],
  }),
} as const;
