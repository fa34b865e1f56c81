import { mount, flushPromises } from "@vue/test-utils";
import { transport } from "../api/http.ts";
import { createPinia, setActivePinia } from "pinia";
import { vi } from "vitest";
import type { Component } from "vue";
import { createMemoryHistory } from "vue-router";
import { createGrainyardRouter } from "../router.ts";
import { useSessionStore } from "../stores/session.ts";
import { appPlugins } from "./app-plugins.ts";

export interface StubbedAnswer {
  status: number;
  body?: unknown;
  /** The answer waits for this (a test looks at the page while its data is on its way). */
  until?: Promise<unknown>;
}

/**
 * Mounts one view inside a real router and Pinia, with the API client's fetch replaced by a
 * queue of answers keyed by "METHOD path". Only for unit tests.
 */
export async function mountView(
  view: Component,
  options: { path: string; answers?: Record<string, StubbedAnswer[]>; session?: { account: unknown } },
) {
  const answers = options.answers ?? {};
  const fetchMock = vi.fn(async (url: string | URL | Request, init?: RequestInit) => {
    const key = `${init?.method ?? "GET"} ${String(url).split("?")[0]}`;
    const queue = answers[key];
    const next = queue?.shift();
    if (!next) return new Response(JSON.stringify({ account: options.session?.account ?? null, csrfToken: "test-token" }), { status: 200 });
    if (next.until) await next.until;
    return new Response(next.body === undefined ? null : JSON.stringify(next.body), { status: next.status });
  });
  transport.useFetch(fetchMock as unknown as typeof fetch);

  const pinia = createPinia();
  setActivePinia(pinia);
  const session = useSessionStore(pinia);
  transport.useCsrfToken(() => session.csrfToken);
  const router = createGrainyardRouter(pinia, createMemoryHistory());
  await router.push(options.path);
  await router.isReady();
  // The app reads the session once a public page shows; a unit test starts with it known.
  await session.ensureLoaded();

  const wrapper = mount(view, { global: { plugins: appPlugins(pinia, router) }, attachTo: document.body });
  await flushPromises();
  return { wrapper, router, fetchMock, session };
}

/** The text shown under a field (its error or hint), found through the input's aria-describedby. */
export function noteFor(wrapper: ReturnType<typeof mount>, id: string): string {
  const input = wrapper.find(`#${id}`);
  const noteId = input.attributes("aria-describedby");
  if (!noteId) return "";
  return wrapper.find(`#${noteId}`).text();
}

export async function typeInto(wrapper: ReturnType<typeof mount>, id: string, value: string) {
  await wrapper.find(`#${id}`).setValue(value);
}
