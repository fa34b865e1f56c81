/**
 * The browser's half. A server-rendered public page is hydrated with the state it was rendered
 * with (so the first paint is the server's and no query runs again); any other page is the bare
 * shell and is drawn here. The session (who is signed in) is read after either.
 */
import { createHead } from "@unhead/vue/client";
import { hydrateQueryCache, useQueryCache } from "@pinia/colada";
import { createWebHistory } from "vue-router";
import { api } from "./api/client.ts";
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
  api,
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
api.useCsrfToken(() => session.csrfToken);

void router.isReady().then(() => {
  const container = document.getElementById("app")!;
  app.mount(container);
  container.dataset.ready = "true";
});
