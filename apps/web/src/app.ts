/**
 * The app factory, shared by the server's render (a fresh app for every request) and the browser
 * (once). Nothing here may touch `window` or `document`: the same code runs in Node.
 */
import "@fontsource/ibm-plex-sans/latin-400.css";
import "@fontsource/ibm-plex-sans/latin-500.css";
import "@fontsource/ibm-plex-sans/latin-600.css";
import "@fontsource/fraunces/latin-600.css";
import "@fontsource/fraunces/latin-400-italic.css";
import "virtual:linux-font-fallbacks.css";
import "./styles/base.css";

import { createApp, createSSRApp } from "vue";
import { createPinia } from "pinia";
import { PiniaColada, PiniaColadaSSRNoGc } from "@pinia/colada";
import type { RouterHistory } from "vue-router";
import App from "./App.vue";
import type { Transport } from "./api/http.ts";
import { API_TRANSPORT } from "./queries/api.ts";
import { createGrainyardRouter } from "./router.ts";
import { SITE } from "./seo/site.ts";
import type { SiteInfo } from "./ssr/state.ts";

export interface AppOptions {
  /** Server-rendered (or about to hydrate server HTML) rather than a plain browser mount. */
  ssr: boolean;
  history: RouterHistory;
  /** How this app instance reaches the API (the server gives each render its own). */
  transport: Transport;
  site: SiteInfo;
}

export function createGrainyardApp(options: AppOptions) {
  const app = options.ssr ? createSSRApp(App) : createApp(App);
  const pinia = createPinia();
  app.use(pinia);
  app.use(PiniaColada, {
    // On the server the cache lives for one render: no timers that would keep entries (or Node) alive.
    plugins: import.meta.env.SSR ? [PiniaColadaSSRNoGc()] : [],
    queryOptions: {
      staleTime: 30_000,
      // A failed answer (a slab that is not found) is rendered as the page's error, not thrown.
      ssrCatchError: true,
    },
  });
  const router = createGrainyardRouter(pinia, options.history);
  app.use(router);
  app.provide(API_TRANSPORT, options.transport);
  app.provide(SITE, options.site);
  return { app, pinia, router };
}
