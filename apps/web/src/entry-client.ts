/**
 * The browser's half. A server-rendered public page is hydrated with the state it was rendered
 * with (so the first paint is the server's and no query runs again); any other page is the bare
 * shell and is drawn here. The session (who is signed in) is read after either.
 */
import { watch } from "vue";
import { createHead } from "@unhead/vue/client";
import { hydrateQueryCache, useQueryCache } from "@pinia/colada";
import { createWebHistory } from "vue-router";
import { transport } from "./api/http.ts";
import { createGrainyardApp } from "./app.ts";
import { useSessionStore } from "./stores/session.ts";
import { STATE_ELEMENT_ID, parsePageState, type PageState } from "./ssr/state.ts";

function readPageState(): PageState | null {
  const element = document.getElementById(STATE_ELEMENT_ID);
  if (!element?.textContent) return null;
  try {
    return parsePageState(element.textContent);
  } catch (error) {
    console.error("The page's state could not be read; drawing the page afresh.", error);
    return null;
  }
}

const state = readPageState();
const { app, pinia, router } = createGrainyardApp({
  ssr: state !== null,
  history: createWebHistory(),
  transport,
  site: state?.site ?? { origin: window.location.origin },
});
app.use(createHead());

if (state) {
  // Per store: the query cache's own stores already exist, so the root object is not replaced.
  Object.assign(pinia.state.value, state.pinia);
  hydrateQueryCache(useQueryCache(pinia), state.colada as Parameters<typeof hydrateQueryCache>[1]);
}

// The API client asks the session store for the anti-forgery token on every state-changing call.
const session = useSessionStore(pinia);
transport.useCsrfToken(() => session.csrfToken);

/**
 * The installable app is the sawyer's: the service worker (the app's files, the shell for when
 * there is no connection; never an API answer) is registered once a sawyer is signed in, and kept
 * up to date wherever it already runs.
 */
let registered = false;
function registerServiceWorker() {
  if (registered || !import.meta.env.PROD || !("serviceWorker" in navigator)) return;
  registered = true;
  void import("virtual:pwa-register").then(({ registerSW }) => registerSW({ immediate: true }));
}
if (typeof navigator !== "undefined" && navigator.serviceWorker?.controller) registerServiceWorker();
watch(
  () => session.role,
  (role) => {
    if (role === "sawyer") registerServiceWorker();
  },
);

void router.isReady().then(() => {
  const container = document.getElementById("app")!;
  app.mount(container);
  container.dataset.ready = "true";
});
