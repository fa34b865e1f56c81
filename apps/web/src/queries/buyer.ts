/**
 * A buyer's actions on the public pages: a question to the sawyer about a listing, and saving the
 * catalogue search being looked at (with e-mail alerts).
 */
import { toValue, type MaybeRefOrGetter } from "vue";
import { useMutation } from "@pinia/colada";
import type { MessagePosted, SavedSearch, SavedSearchInput } from "@grainyard/contracts";
import { toApiRequestError, type ApiRequestError } from "../api/errors.ts";
import { useApiClient } from "./api.ts";

export function useAskAboutListing(listingId: MaybeRefOrGetter<string>) {
  const client = useApiClient();
  return useMutation<MessagePosted, string, ApiRequestError>({
    mutation: (body) =>
      client.askAboutListing(toValue(listingId), body).catch((error: unknown) => {
        throw toApiRequestError(error);
      }),
  });
}

export function useSaveSearch() {
  const client = useApiClient();
  return useMutation<SavedSearch, SavedSearchInput, ApiRequestError>({
    mutation: (input) =>
      client
        .saveSearch(input)
        .then((answer) => answer.savedSearch)
        .catch((error: unknown) => {
          throw toApiRequestError(error);
        }),
  });
}
