/**
 * Buying one listing: the price with tax (the same for everyone, so it is rendered with the page)
 * and the checkout that reserves the slab and sends the buyer to the payment provider's page.
 */
import { toValue, type MaybeRefOrGetter } from "vue";
import { useMutation, useQuery } from "@pinia/colada";
import { orderEndpoints, type CheckoutInput, type CheckoutQuote } from "@grainyard/contracts";
import { toApiRequestError, type ApiRequestError } from "../api/errors.ts";
import { useClient } from "./api.ts";
import { queryKeys } from "./keys.ts";

/** The price, tax and total a buyer pays now for one listing. */
export function useCheckoutQuote(listingId: MaybeRefOrGetter<string>, enabled: MaybeRefOrGetter<boolean> = true) {
  const client = useClient(orderEndpoints);
  return useQuery<CheckoutQuote, ApiRequestError>({
    key: () => queryKeys.checkout.quote(toValue(listingId)),
    query: ({ signal }) =>
      client
        .getCheckoutQuote({ listingId: toValue(listingId) }, { signal })
        .then((answer) => answer.quote)
        .catch((error: unknown) => {
          throw toApiRequestError(error);
        }),
    enabled: () => toValue(enabled),
  });
}

/** Reserves the listing and answers the payment page's address (the caller goes there). */
export function useCheckout(listingId: MaybeRefOrGetter<string>) {
  const client = useClient(orderEndpoints);
  return useMutation<{ checkoutUrl: string }, CheckoutInput, ApiRequestError>({
    mutation: (input) =>
      client.checkout({ listingId: toValue(listingId), body: input }).catch((error: unknown) => {
        throw toApiRequestError(error);
      }),
  });
}
