/**
 * Asks a query again every `intervalMs` while `active` says so and the page is in view (a phone in
 * a pocket polls nothing); coming back into view asks at once. One ask at a time: the next waits
 * for the answer (VueUse's timeout poll). Stops with the component.
 */
import { watch, type MaybeRefOrGetter, toValue } from "vue";
import { useDocumentVisibility, useTimeoutPoll } from "@vueuse/core";

export function usePolledQuery(refetch: () => Promise<unknown>, intervalMs: number, active: MaybeRefOrGetter<boolean> = true) {
  const visibility = useDocumentVisibility();
  const poll = useTimeoutPoll(
    async () => {
      try {
        await refetch();
      } catch {
        // The query shows its own error; polling carries on (a throw would end VueUse's loop).
      }
    },
    intervalMs,
    { immediate: false },
  );
  watch(
    () => [toValue(active), visibility.value === "visible"] as const,
    ([on, visible], before) => {
      if (!on || !visible) return poll.pause();
      // Back in view: ask at once (a first start or a sign-in is covered by the query's own load).
      if (before && before[0] && !before[1]) void refetch();
      poll.resume();
    },
    { immediate: true },
  );
  return poll;
}
