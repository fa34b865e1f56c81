import { computed } from "vue";
import { storeToRefs } from "pinia";
import {
  MILLIMETRES_PER_FOOT,
  SlabMathError,
  formatFeetAndInches,
  formatInches,
  kilogramsToPounds,
  parseInches,
} from "@grainyard/slab-math";
import { useUnitsStore, type UnitSystem } from "../stores/units.ts";

const whole = new Intl.NumberFormat("en", { maximumFractionDigits: 0 });
const oneDecimal = new Intl.NumberFormat("en", { minimumFractionDigits: 1, maximumFractionDigits: 1 });
const twoDecimals = new Intl.NumberFormat("en", { minimumFractionDigits: 2, maximumFractionDigits: 2 });
const threeDecimals = new Intl.NumberFormat("en", { minimumFractionDigits: 3, maximumFractionDigits: 3 });
/** Millimetres kept to six decimals: exact for what people type, free of binary noise (2.25 × 25.4). */
const asEntered = (mm: number) => Math.round(mm * 1_000_000) / 1_000_000;

export type ParsedLength = { ok: true; mm: number } | { ok: false; message: string } | { ok: "empty" };

/** Pure formatting for one unit system (the composable below binds it to the person's choice). */
export function unitFormatter(system: UnitSystem) {
  const imperial = system === "imperial";

  /** A measured length: "612 mm" or "24 1/8″" (nearest 1/16″, via slab-math). */
  function length(mm: number): string {
    return imperial ? formatInches(mm) : `${whole.format(mm)} mm`;
  }

  /** A long length (a slab or log): "2,440 mm" or "8′ 0″". */
  function longLength(mm: number): string {
    return imperial ? formatFeetAndInches(mm) : `${whole.format(mm)} mm`;
  }

  /** Length × average width × thickness, in one line. */
  function dimensions(lengthMm: number, widthMm: number, thicknessMm: number): string {
    if (imperial) return `${formatFeetAndInches(lengthMm)} × ${formatInches(widthMm)} × ${formatInches(thicknessMm)}`;
    return `${whole.format(lengthMm)} × ${whole.format(widthMm)} × ${whole.format(thicknessMm)} mm`;
  }

  function weight(kg: number): string {
    return imperial ? `${whole.format(kilogramsToPounds(kg))} lb` : `${whole.format(kg)} kg`;
  }

  /** "101–124 kg" or "223–273 lb". */
  function weightRange(lowKg: number, highKg: number): string {
    if (imperial) return `${whole.format(kilogramsToPounds(lowKg))}–${whole.format(kilogramsToPounds(highKg))} lb`;
    return `${whole.format(lowKg)}–${whole.format(highKg)} kg`;
  }

  function boardFeet(bf: number): string {
    return `${oneDecimal.format(bf)} bf`;
  }

  function cubicMetres(m3: number): string {
    return `${threeDecimals.format(m3)} m³`;
  }

  /** Volume in the person's units, always with board feet (the trade's unit). */
  function volume(m3: number, bf: number): string {
    return imperial ? boardFeet(bf) : `${cubicMetres(m3)} · ${boardFeet(bf)}`;
  }

  /** Face area: "1.49 m²" or "16.0 ft²". */
  function area(m2: number): string {
    if (!imperial) return `${twoDecimals.format(m2)} m²`;
    const squareFeet = (m2 * 1e6) / (MILLIMETRES_PER_FOOT * MILLIMETRES_PER_FOOT);
    return `${oneDecimal.format(squareFeet)} ft²`;
  }

  const lengthUnit = imperial ? "in" : "mm";

  /** What a person types into a length field, for a stored millimetre value. */
  function lengthToInput(mm: number | null | undefined): string {
    if (mm == null) return "";
    return imperial ? formatInches(mm).replace("″", "") : String(mm);
  }

  /**
   * Reads a typed length in the person's units as whole millimetres, or with `exact` (a slab's
   * measurements, which the API stores as entered) to six decimals: 2 1/4″ is 57.15 mm, not 57, so
   * board feet and price match a hand calculation.
   * Metric: "612" or "612.5"; imperial: "24", "24 1/8", "24-1/8", "24.125" (slab-math parseInches).
   */
  function parseLength(text: string, label = "length", options: { exact?: boolean } = {}): ParsedLength {
    const toMm = options.exact ? asEntered : Math.round;
    const trimmed = text.trim();
    if (trimmed === "") return { ok: "empty" };
    if (imperial) {
      try {
        return { ok: true, mm: toMm(parseInches(trimmed, label)) };
      } catch (error) {
        if (error instanceof SlabMathError) return { ok: false, message: `Type the ${label} in inches, like 24 1/8 or 24.125.` };
        throw error;
      }
    }
    const value = Number(trimmed.replace(",", "."));
    if (!Number.isFinite(value) || !/^\d+(?:[.,]\d+)?$/.test(trimmed)) {
      return { ok: false, message: `Type the ${label} in millimetres, like 612.` };
    }
    return { ok: true, mm: toMm(value) };
  }

  return {
    system,
    imperial,
    lengthUnit,
    length,
    longLength,
    dimensions,
    weight,
    weightRange,
    boardFeet,
    cubicMetres,
    volume,
    area,
    lengthToInput,
    parseLength,
  };
}

export type UnitFormatter = ReturnType<typeof unitFormatter>;

/** Lengths, weights and volumes in the person's chosen units, and the switch between them. */
export function useUnits() {
  const store = useUnitsStore();
  const { system } = storeToRefs(store);
  const format = computed(() => unitFormatter(system.value));
  return {
    system,
    choose: store.choose,
    format,
  };
}

/** Rewrites a typed length when the person switches units (an unreadable entry is left alone). */
export function convertLengthText(text: string, from: UnitSystem, to: UnitSystem): string {
  if (from === to) return text;
  const parsed = unitFormatter(from).parseLength(text, "length", { exact: true });
  return parsed.ok === true ? unitFormatter(to).lengthToInput(parsed.mm) : text;
}
