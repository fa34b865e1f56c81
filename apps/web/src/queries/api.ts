/**
 * Which API client the queries use. The browser uses the app's one client (same-origin cookies,
 * the anti-forgery token); the server's render gives each request its own client that reaches the
 * API over loopback without anyone's cookies, so a rendered page is always the anonymous one.
 * Only files in this folder call the client; views and components use the queries.
 */
import { inject, type InjectionKey } from "vue";
import { api, type ApiClient } from "../api/client.ts";

export const API_CLIENT: InjectionKey<ApiClient> = Symbol("grainyard-api-client");

/** The client for this app instance (call in setup, where inject works). */
export function useApiClient(): ApiClient {
  return inject(API_CLIENT, api);
}
