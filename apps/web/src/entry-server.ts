/**
 * The server's half of the public pages: renders one address to HTML for the API's web module
 * (apps/api/src/web/). Public pages (route meta `ssr`) are rendered with their data, head and
 * state; every other page gets the bare shell and is drawn in the browser.
 *
 * The render is always the anonymous one: the API client it is given carries no cookie, the
 * session store is never read, and only the person's unit choice (not personal) comes in.
 */
import { renderToString } from "vue/server-renderer";
import { createMemoryHistory } from "vue-router";
import { createHead, transformHtmlTemplate } from "@unhead/vue/server";
import { setup as setupCssRender } from "@css-render/vue3-ssr";
import { serializeQueryCache, useQueryCache } from "@pinia/colada";
import { createTransport } from "./api/http.ts";
import { createGrainyardApp } from "./app.ts";
import { useUnitsStore, unitsForRequest } from "./stores/units.ts";
import { pageStateElement } from "./ssr/state.ts";
import { preloadLinks, type SsrManifest } from "./ssr/preload.ts";

export interface RenderRequest {
  /** Path and query of the page. */
  url: string;
  /** index.html with its placeholders (in development, already transformed by Vite). */
  template: string;
  /** Which built files each source module needs (production only). */
  manifest?: SsrManifest;
  /** Reaches the API without any cookie (the server's loopback). */
  fetch: typeof fetch;
  /** The site's public address (PUBLIC_URL). */
  origin: string;
  /** The person's unit choice (cookie) and languages (Accept-Language), nothing else of theirs. */
  preferences: { units?: string; acceptLanguage?: string };
}

export interface RenderResult {
  html: string;
  status: number;
  /** False when the page is the shell for the browser to draw (a private page). */
  rendered: boolean;
}

const escapeHtml = (text: string) => text.replace(/[&<>"]/g, (c) => ({ "&": "&amp;", "<": "&lt;", ">": "&gt;", '"': "&quot;" })[c]!);

export async function render(request: RenderRequest): Promise<RenderResult> {
  const site = { origin: request.origin.replace(/\/$/, "") };
  const { app, pinia, router } = createGrainyardApp({
    ssr: true,
    history: createMemoryHistory(),
    transport: createTransport({ fetch: request.fetch }),
    site,
  });
  useUnitsStore(pinia).system = unitsForRequest(request.preferences.units, request.preferences.acceptLanguage);

  await router.push(request.url);
  await router.isReady();
  const route = router.currentRoute.value;

  if (!route.meta.ssr) {
    // A private page: the shell, with the page's name and nothing else; the browser does the rest.
    const title = route.meta.title ? `${route.meta.title} · Grainyard` : "Grainyard";
    const html = request.template
      .replace("<!--app-head-->", `<title>${escapeHtml(title)}</title><meta name="robots" content="noindex, nofollow">`)
      .replace("<!--app-html-->", "")
      .replace("<!--app-state-->", "");
    return { html, status: 200, rendered: false };
  }

  const head = createHead();
  app.use(head);
  // Naive UI's styles for what was rendered, collected into the head (they would otherwise come with the script).
  const cssRender = setupCssRender(app);

  // Vue fills `modules` (for the preload links); a page may set `statusCode` (404 for a missing slab).
  const context: { modules?: Set<string>; statusCode?: number } = {};
  const appHtml = await renderToString(app, context);

  const queryCache = useQueryCache(pinia);
  const colada = serializeQueryCache(queryCache);
  // The query cache's own stores hold live maps, not state: they travel as `colada` instead.
  const piniaState = Object.fromEntries(Object.entries(pinia.state.value).filter(([id]) => !id.startsWith("_pc_")));
  const state = pageStateElement({ site, pinia: piniaState, colada });

  const headExtra = cssRender.collect() + (request.manifest ? preloadLinks(context.modules, request.manifest) : "");
  const html = transformHtmlTemplate(
    head,
    request.template.replace("<!--app-head-->", headExtra).replace("<!--app-html-->", appHtml).replace("<!--app-state-->", state),
  );
  // The head reads the page's data (computed): the cache goes only once the head is written.
  queryCache.caches.clear();
  return { html, status: context.statusCode ?? 200, rendered: true };
}
