import { defineStore } from "pinia";
import { ref } from "vue";

export type UnitSystem = "metric" | "imperial";

export const UNITS_STORAGE_KEY = "grainyard.units";

/** Imperial where the trade and the tape measures are in inches (the United States), metric elsewhere. */
function guessSystem(): UnitSystem {
  const language = typeof navigator !== "undefined" ? navigator.language : "";
  return /^en-(US|LR)$/i.test(language) || /^my/i.test(language) ? "imperial" : "metric";
}

function readStored(): UnitSystem | null {
  try {
    const stored = globalThis.localStorage?.getItem(UNITS_STORAGE_KEY);
    return stored === "metric" || stored === "imperial" ? stored : null;
  } catch {
    return null;
  }
}

/** The person's choice of metric or imperial, remembered on this device. */
export const useUnitsStore = defineStore("units", () => {
  const system = ref<UnitSystem>(readStored() ?? guessSystem());

  /** Switches units and remembers the choice (even when it equals the guess). */
  function choose(next: UnitSystem) {
    system.value = next;
    try {
      globalThis.localStorage?.setItem(UNITS_STORAGE_KEY, next);
    } catch {
      // Private mode or storage full: the choice lasts for this visit only.
    }
  }

  return { system, choose };
});
