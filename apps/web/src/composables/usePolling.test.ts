import { afterEach, beforeEach, describe, expect, it, vi } from "vitest";
import { effectScope } from "vue";
import { usePolling } from "./usePolling.ts";

beforeEach(() => vi.useFakeTimers());
afterEach(() => {
  vi.useRealTimers();
  Object.defineProperty(document, "visibilityState", { value: "visible", configurable: true });
});

function setVisibility(state: "visible" | "hidden") {
  Object.defineProperty(document, "visibilityState", { value: state, configurable: true });
  document.dispatchEvent(new Event("visibilitychange"));
}

describe("usePolling", () => {
  it("ticks every interval once started, and not after stop", async () => {
    const tick = vi.fn();
    const polling = usePolling(tick, 1000);
    await vi.advanceTimersByTimeAsync(3000);
    expect(tick).not.toHaveBeenCalled();
    polling.start();
    await vi.advanceTimersByTimeAsync(3000);
    expect(tick).toHaveBeenCalledTimes(3);
    polling.stop();
    await vi.advanceTimersByTimeAsync(5000);
    expect(tick).toHaveBeenCalledTimes(3);
  });

  it("never overlaps a slow tick with the next one", async () => {
    let running = 0;
    let most = 0;
    const tick = vi.fn(async () => {
      running++;
      most = Math.max(most, running);
      await new Promise((resolve) => setTimeout(resolve, 2500));
      running--;
    });
    usePolling(tick, 1000).start();
    await vi.advanceTimersByTimeAsync(10_000);
    expect(most).toBe(1);
    expect(tick.mock.calls.length).toBeGreaterThanOrEqual(2);
  });

  it("rests while the page is hidden and ticks at once when it comes back", async () => {
    const tick = vi.fn();
    usePolling(tick, 1000).start();
    setVisibility("hidden");
    await vi.advanceTimersByTimeAsync(5000);
    expect(tick).not.toHaveBeenCalled();
    setVisibility("visible");
    await vi.advanceTimersByTimeAsync(0);
    expect(tick).toHaveBeenCalledTimes(1);
  });

  it("keeps polling after a failed tick, and stops with its component's scope", async () => {
    const tick = vi.fn().mockRejectedValueOnce(new Error("offline")).mockResolvedValue(undefined);
    const scope = effectScope();
    scope.run(() => usePolling(tick, 1000).start());
    await vi.advanceTimersByTimeAsync(2000);
    expect(tick).toHaveBeenCalledTimes(2);
    scope.stop();
    await vi.advanceTimersByTimeAsync(5000);
    expect(tick).toHaveBeenCalledTimes(2);
  });
});
