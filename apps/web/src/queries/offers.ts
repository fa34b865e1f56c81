/**
 * Offers: the reader's offers (a buyer's own, or those on a sawyer's listings), making one from
 * the slab page, each answer (accept, decline, counter; accept a counter, offer again, withdraw),
 * and a sawyer's offer settings of a listing. Private answers, never rendered on the server; the
 * session forgets them on sign-out. An answer puts the offer as it is now into the lists.
 */
import { toValue, type MaybeRefOrGetter } from "vue";
import { useMutation, useQuery, useQueryCache } from "@pinia/colada";
import {
  offerEndpoints,
  type AcceptCounterInput,
  type Offer,
  type OfferAmountInput,
  type OfferInput,
  type OfferSettings,
  type OfferSettingsInput,
} from "@grainyard/contracts";
import type { ApiRequestError } from "../api/errors.ts";
import { useSessionStore } from "../stores/session.ts";
import { markStale, rethrow, useClient } from "./api.ts";
import { queryKeys } from "./keys.ts";

/** The reader's offers, newest first; on one listing only when `listingId` is given. */
export function useOffers(listingId: MaybeRefOrGetter<string | null> = null, enabled: MaybeRefOrGetter<boolean> = true) {
  const client = useClient(offerEndpoints);
  const session = useSessionStore();
  return useQuery<Offer[], ApiRequestError>({
    key: () => queryKeys.offers.list(session.account?.id ?? "", toValue(listingId)),
    query: ({ signal }) =>
      client
        .listOffers({ query: toValue(listingId) ? { listingId: toValue(listingId)! } : {} }, { signal })
        .then((answer) => answer.offers)
        .catch(rethrow),
    enabled: () => toValue(enabled) && session.isSignedIn,
    // The other side answers too: every visit asks again.
    staleTime: 0,
  });
}

/** The offer lists and the slab's page (reserved once one is accepted) ask again. */
function useOfferLists() {
  const cache = useQueryCache();
  return () => {
    void markStale(cache, { key: [...queryKeys.offers.all, "list"] });
    void markStale(cache, { key: queryKeys.orders.all });
  };
}

/** A buyer offers on a listing; answers the offer (already declined when below the sawyer's floor). */
export function useMakeOffer(listingId: MaybeRefOrGetter<string>) {
  const client = useClient(offerEndpoints);
  const changed = useOfferLists();
  return useMutation<Offer, OfferInput, ApiRequestError>({
    mutation: (input) =>
      client
        .makeOffer({ listingId: toValue(listingId), body: input })
        .then((answer) => answer.offer)
        .catch(rethrow),
    onSettled: changed,
  });
}

/** One answer to an offer. Accepting answers the order too (and, for the buyer, the payment page to go to). */
export type OfferStep =
  | { step: "accept" }
  | { step: "decline"; message: string }
  | { step: "counter"; body: OfferAmountInput }
  | { step: "accept_counter"; body: AcceptCounterInput }
  | { step: "offer_again"; body: OfferAmountInput }
  | { step: "withdraw" };

export interface OfferStepResult {
  offer: Offer;
  orderId: string | null;
  checkoutUrl: string | null;
}

export function useOfferStep() {
  const client = useClient(offerEndpoints);
  const cache = useQueryCache();
  const changed = useOfferLists();
  return useMutation<OfferStepResult, { offerId: string; step: OfferStep }, ApiRequestError>({
    mutation: async ({ offerId, step: input }) => {
      try {
        switch (input.step) {
          case "accept": {
            const answer = await client.acceptOffer({ offerId });
            return { offer: answer.offer, orderId: answer.order.id, checkoutUrl: answer.checkoutUrl };
          }
          case "accept_counter": {
            const answer = await client.acceptCounter({ offerId, body: input.body });
            return { offer: answer.offer, orderId: answer.order.id, checkoutUrl: answer.checkoutUrl };
          }
          case "decline":
            return {
              offer: (await client.declineOffer({ offerId, body: { message: input.message } })).offer,
              orderId: null,
              checkoutUrl: null,
            };
          case "counter":
            return { offer: (await client.counterOffer({ offerId, body: input.body })).offer, orderId: null, checkoutUrl: null };
          case "offer_again":
            return { offer: (await client.offerAgain({ offerId, body: input.body })).offer, orderId: null, checkoutUrl: null };
          case "withdraw":
            return { offer: (await client.withdrawOffer({ offerId })).offer, orderId: null, checkoutUrl: null };
        }
      } catch (error) {
        rethrow(error);
      }
    },
    onSettled: (result) => {
      changed();
      // Accepted: the slab is reserved now, so its page asks again.
      if (result?.orderId) void markStale(cache, { key: queryKeys.catalogue.listing(result.offer.listingId) });
    },
  });
}

/** A sawyer's offer settings of their own listing. */
export function useOfferSettings(listingId: MaybeRefOrGetter<string | null>) {
  const client = useClient(offerEndpoints);
  return useQuery<OfferSettings, ApiRequestError>({
    key: () => queryKeys.offers.settings(toValue(listingId) ?? ""),
    query: ({ signal }) =>
      client
        .getOfferSettings({ listingId: toValue(listingId)! }, { signal })
        .then((answer) => answer.settings)
        .catch(rethrow),
    enabled: () => toValue(listingId) !== null,
  });
}

export function useSaveOfferSettings(listingId: MaybeRefOrGetter<string | null>) {
  const client = useClient(offerEndpoints);
  const cache = useQueryCache();
  return useMutation<OfferSettings, OfferSettingsInput, ApiRequestError>({
    mutation: (input) =>
      client
        .setOfferSettings({ listingId: toValue(listingId)!, body: input })
        .then((answer) => answer.settings)
        .catch(rethrow),
    onSuccess: (settings) => {
      const id = toValue(listingId)!;
      cache.setQueryData(queryKeys.offers.settings(id), settings);
      void markStale(cache, { key: queryKeys.catalogue.listing(id) });
    },
  });
}
