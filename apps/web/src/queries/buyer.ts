/**
 * A buyer's actions on the public pages: a question to the sawyer about a listing, and saving the
 * catalogue search being looked at (with e-mail alerts).
 */
import { toValue, type MaybeRefOrGetter } from "vue";
import { useMutation } from "@pinia/colada";
import { buyerEndpoints, messageEndpoints, type MessagePosted, type SavedSearch, type SavedSearchInput } from "@grainyard/contracts";
import { toApiRequestError, type ApiRequestError } from "../api/errors.ts";
import { useClient } from "./api.ts";

export function useAskAboutListing(listingId: MaybeRefOrGetter<string>) {
  const client = useClient(messageEndpoints);
  return useMutation<MessagePosted, string, ApiRequestError>({
    mutation: (body) =>
      client.askAboutListing({ listingId: toValue(listingId), body: { body } }).catch((error: unknown) => {
        throw toApiRequestError(error);
      }),
  });
}

export function useSaveSearch() {
  const client = useClient(buyerEndpoints);
  return useMutation<SavedSearch, SavedSearchInput, ApiRequestError>({
    mutation: (input) =>
      client
        .saveSearch({ body: input })
        .then((answer) => answer.savedSearch)
        .catch((error: unknown) => {
          throw toApiRequestError(error);
        }),
  });
}
