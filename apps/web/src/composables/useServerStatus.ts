import { onServerPrefetch, useSSRContext } from "vue";

/**
 * Lets a page set the HTTP status of its server-rendered answer (404 for a slab that is not for
 * sale) once its data is known. Does nothing in the browser.
 */
export function useServerStatus(statusOnceLoaded: () => Promise<number | null>) {
  if (!import.meta.env.SSR) return;
  const context = useSSRContext<{ statusCode?: number }>();
  onServerPrefetch(async () => {
    const status = await statusOnceLoaded();
    if (status !== null && context) context.statusCode = status;
  });
}
