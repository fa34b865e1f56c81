import { ref, shallowRef } from "vue";
import { toApiRequestError, type ApiRequestError } from "../api/errors.ts";

/**
 * One piece of remote data with its loading and error state, and a `run` to load or retry.
 * An older answer never overwrites a newer one (the earlier request is aborted).
 */
export function useRemote<T>(loader: (signal: AbortSignal) => Promise<T>) {
  const data = shallowRef<T | null>(null);
  const error = ref<ApiRequestError | null>(null);
  const loading = ref(false);
  let controller: AbortController | null = null;

  async function run(): Promise<void> {
    controller?.abort();
    const current = new AbortController();
    controller = current;
    loading.value = true;
    error.value = null;
    try {
      const result = await loader(current.signal);
      if (controller !== current) return;
      data.value = result;
    } catch (caught) {
      if (current.signal.aborted) return;
      error.value = toApiRequestError(caught);
    } finally {
      if (controller === current) loading.value = false;
    }
  }

  return { data, error, loading, run };
}
