import { getCurrentScope, onScopeDispose } from "vue";

/**
 * Calls `tick` every `intervalMs` while started and while the page is in view (a phone in a
 * pocket polls nothing); coming back into view ticks at once. One tick at a time: a slow answer
 * is never overlapped by the next. Stops by itself with the component (or effect scope).
 */
export function usePolling(tick: () => Promise<unknown> | unknown, intervalMs: number) {
  let timer: ReturnType<typeof setTimeout> | null = null;
  let running = false;
  let busy = false;

  const visible = () => typeof document === "undefined" || document.visibilityState !== "hidden";

  function schedule() {
    if (timer) clearTimeout(timer);
    timer = running ? setTimeout(() => void runTick(), intervalMs) : null;
  }

  async function runTick() {
    timer = null;
    if (!running) return;
    if (visible() && !busy) {
      busy = true;
      try {
        await tick();
      } catch {
        // The caller shows its own errors; polling carries on.
      } finally {
        busy = false;
      }
    }
    schedule();
  }

  function onVisibility() {
    if (!running || !visible()) return;
    if (timer) clearTimeout(timer);
    void runTick();
  }

  function start() {
    if (running) return;
    running = true;
    if (typeof document !== "undefined") document.addEventListener("visibilitychange", onVisibility);
    schedule();
  }

  function stop() {
    running = false;
    if (timer) clearTimeout(timer);
    timer = null;
    if (typeof document !== "undefined") document.removeEventListener("visibilitychange", onVisibility);
  }

  if (getCurrentScope()) onScopeDispose(stop);

  return { start, stop, isRunning: () => running };
}
