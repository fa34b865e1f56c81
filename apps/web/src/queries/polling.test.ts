import { afterEach, beforeEach, describe, expect, it, vi } from "vitest";
import { effectScope, nextTick, ref } from "vue";
import { usePolledQuery } from "./polling.ts";

beforeEach(() => vi.useFakeTimers());
afterEach(() => {
  vi.useRealTimers();
  Object.defineProperty(document, "visibilityState", { value: "visible", configurable: true });
});

function setVisibility(state: "visible" | "hidden") {
  Object.defineProperty(document, "visibilityState", { value: state, configurable: true });
  document.dispatchEvent(new Event("visibilitychange"));
}

/** Runs the composable in a scope of its own, as a component would. */
function polled(refetch: () => Promise<unknown>, intervalMs: number, active = ref(true)) {
  const scope = effectScope();
  scope.run(() => usePolledQuery(refetch, intervalMs, active));
  return { scope, active };
}

describe("usePolledQuery", () => {
  it("asks every interval while active, and not while inactive or after its scope ends", async () => {
    const refetch = vi.fn(() => Promise.resolve());
    const { scope, active } = polled(refetch, 1000, ref(false));
    await vi.advanceTimersByTimeAsync(3000);
    expect(refetch).not.toHaveBeenCalled();
    active.value = true;
    await nextTick();
    await vi.advanceTimersByTimeAsync(3000);
    expect(refetch).toHaveBeenCalledTimes(3);
    scope.stop();
    await vi.advanceTimersByTimeAsync(5000);
    expect(refetch).toHaveBeenCalledTimes(3);
  });

  it("never overlaps a slow answer with the next ask", async () => {
    let running = 0;
    let most = 0;
    const refetch = vi.fn(async () => {
      running++;
      most = Math.max(most, running);
      await new Promise((resolve) => setTimeout(resolve, 2500));
      running--;
    });
    polled(refetch, 1000);
    await vi.advanceTimersByTimeAsync(10_000);
    expect(most).toBe(1);
    expect(refetch.mock.calls.length).toBeGreaterThanOrEqual(2);
  });

  it("rests while the page is hidden and asks at once when it comes back", async () => {
    const refetch = vi.fn(() => Promise.resolve());
    polled(refetch, 1000);
    setVisibility("hidden");
    await vi.advanceTimersByTimeAsync(5000);
    expect(refetch).not.toHaveBeenCalled();
    setVisibility("visible");
    await vi.advanceTimersByTimeAsync(0);
    expect(refetch).toHaveBeenCalledTimes(1);
  });

  it("keeps asking after a failed answer", async () => {
    const refetch = vi.fn().mockRejectedValueOnce(new Error("offline")).mockResolvedValue(undefined);
    polled(refetch, 1000);
    await vi.advanceTimersByTimeAsync(2000);
    expect(refetch).toHaveBeenCalledTimes(2);
  });
});
