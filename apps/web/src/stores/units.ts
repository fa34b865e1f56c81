import { defineStore } from "pinia";
import { ref } from "vue";

export type UnitSystem = "metric" | "imperial";

export const UNITS_STORAGE_KEY = "grainyard.units";
/** The same choice in a cookie, so the server renders a page in the person's units. Not personal. */
const UNITS_COOKIE = "grainyard_units";

/** Imperial where the trade and the tape measures are in inches (the United States), metric elsewhere. */
function systemForLanguage(language: string): UnitSystem {
  return /^en-(US|LR)$/i.test(language) || /^my/i.test(language) ? "imperial" : "metric";
}

/**
 * The units a page is rendered in on the server: the remembered choice (the cookie's value), or a
 * guess from the browser's first language (the Accept-Language header).
 */
export function unitsForRequest(remembered: string | undefined, acceptLanguage: string | undefined): UnitSystem {
  if (remembered === "metric" || remembered === "imperial") return remembered;
  const first = (acceptLanguage ?? "").split(",")[0]?.split(";")[0]?.trim() ?? "";
  return systemForLanguage(first);
}

function guessSystem(): UnitSystem {
  return systemForLanguage(typeof navigator !== "undefined" ? navigator.language : "");
}

function readStored(): UnitSystem | null {
  try {
    const stored = globalThis.localStorage?.getItem(UNITS_STORAGE_KEY);
    return stored === "metric" || stored === "imperial" ? stored : null;
  } catch {
    return null;
  }
}

function remember(system: UnitSystem) {
  try {
    globalThis.localStorage?.setItem(UNITS_STORAGE_KEY, system);
  } catch {
    // Private mode or storage full: the choice lasts for this visit only.
  }
  if (typeof document !== "undefined") document.cookie = `${UNITS_COOKIE}=${system}; path=/; max-age=31536000; samesite=lax`;
}

/** The person's choice of metric or imperial, remembered on this device. */
export const useUnitsStore = defineStore("units", () => {
  const system = ref<UnitSystem>(readStored() ?? guessSystem());

  /** Switches units and remembers the choice (even when it equals the guess). */
  function choose(next: UnitSystem) {
    system.value = next;
    remember(next);
  }

  /**
   * After a server-rendered page has hydrated (in the units the server chose): a choice kept on
   * this device from before the cookie existed wins, and is remembered in the cookie from now on.
   */
  function adoptStoredChoice() {
    const stored = readStored();
    if (stored && stored !== system.value) choose(stored);
  }

  return { system, choose, adoptStoredChoice };
});
