import type { offerEndpoints } from "@grainyard/contracts";
import type { Handlers } from "../http/endpoints.ts";
import type { OfferService } from "../services/offer-service.ts";

/** Offers on listings: the sawyer's settings, the buyer's offer, and each answer. */
export function offerHandlers(offers: OfferService): Handlers<typeof offerEndpoints> {
  return {
    getOfferSettings: async ({ actor, params }) => ({ settings: await offers.settings(actor, params.listingId) }),
    setOfferSettings: async ({ actor, params, body }) => ({ settings: await offers.setSettings(actor, params.listingId, body) }),
    makeOffer: async ({ actor, params, body }) => ({ offer: await offers.make(actor, params.listingId, body) }),
    listOffers: async ({ actor, query }) => ({ offers: await offers.list(actor, query) }),
    getOffer: async ({ actor, params }) => ({ offer: await offers.get(actor, params.offerId) }),
    acceptOffer: ({ actor, params }) => offers.accept(actor, params.offerId),
    declineOffer: async ({ actor, params, body }) => ({ offer: await offers.decline(actor, params.offerId, body) }),
    counterOffer: async ({ actor, params, body }) => ({ offer: await offers.counter(actor, params.offerId, body) }),
    acceptCounter: ({ actor, params, body }) => offers.acceptCounter(actor, params.offerId, body),
    offerAgain: async ({ actor, params, body }) => ({ offer: await offers.offerAgain(actor, params.offerId, body) }),
    withdrawOffer: async ({ actor, params }) => ({ offer: await offers.withdraw(actor, params.offerId) }),
  };
}
