/**
 * A yard's public page: rendered on the server with its data (the same for everyone), hydrated
 * in the browser without asking again. A 404 answer is kept as the page's error (not found).
 */
import { toValue, type MaybeRefOrGetter } from "vue";
import { useQuery } from "@pinia/colada";
import { yardPageEndpoints, type YardPage } from "@grainyard/contracts";
import type { ApiRequestError } from "../api/errors.ts";
import { rethrow, useClient } from "./api.ts";
import { queryKeys } from "./keys.ts";

export function useYardPage(slug: MaybeRefOrGetter<string>) {
  const client = useClient(yardPageEndpoints);
  return useQuery<YardPage, ApiRequestError>({
    key: () => queryKeys.catalogue.yard(toValue(slug)),
    query: ({ signal }) => client.getYardPage({ slug: toValue(slug) }, { signal }).catch(rethrow),
  });
}
