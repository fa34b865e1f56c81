/**
 * Which transport the queries' API clients use. The browser uses the app's one transport
 * (same-origin cookies, the anti-forgery token); the server's render gives each request its own
 * transport that reaches the API over loopback without anyone's cookies, so a rendered page is
 * always the anonymous one. Only files in this folder call the clients this way; views and
 * components use the queries.
 */
import { inject, type InjectionKey } from "vue";
import type { useQueryCache } from "@pinia/colada";
import type { EndpointSpec } from "@grainyard/contracts";
import { clientFor, transport, type ClientMethod, type Transport } from "../api/http.ts";
import { toApiRequestError } from "../api/errors.ts";

export const API_TRANSPORT: InjectionKey<Transport> = Symbol("grainyard-api-transport");

type Client<T extends Record<string, EndpointSpec>> = { [K in keyof T]: ClientMethod<T[K]> };

const clients = new WeakMap<Transport, Map<object, unknown>>();

/** The derived client of one domain table over this app instance's transport (call in setup, where inject works). */
export function useClient<T extends Record<string, EndpointSpec>>(table: T): Client<T> {
  const via = inject(API_TRANSPORT, transport);
  let byTable = clients.get(via);
  if (!byTable) clients.set(via, (byTable = new Map()));
  let client = byTable.get(table) as Client<T> | undefined;
  if (!client) byTable.set(table, (client = clientFor(table, via)));
  return client;
}

/** For a query's or mutation's `.catch`: every failure reaches the view as an ApiRequestError. */
export function rethrow(error: unknown): never {
  throw toApiRequestError(error);
}

type QueryCache = ReturnType<typeof useQueryCache>;

/**
 * Marks answers stale (the ones on screen ask again at once unless `refetchActive` is false). A
 * refetch cut short by a newer one, or one that failed, is already in its entry's state for the
 * views to show, so nothing is thrown here (an unhandled rejection would be a page error).
 */
export function markStale(
  cache: QueryCache,
  filters: Parameters<QueryCache["invalidateQueries"]>[0],
  refetchActive?: boolean,
): Promise<void> {
  return cache.invalidateQueries(filters, refetchActive).then(
    () => undefined,
    () => undefined,
  );
}
