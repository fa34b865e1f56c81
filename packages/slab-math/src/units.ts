/**
 * Unit conversions for display. The definitions are exact by international agreement
 * (International Yard and Pound Agreement, 1959): 1 in = 25.4 mm, 1 lb = 0.45359237 kg.
 * 1 board foot = 144 in³ (NHLA rules) = 0.002359737216 m³.
 */
import { SlabMathError, requireNumberInRange } from "./errors.ts";

/** Millimetres in one inch (exact). */
export const MILLIMETRES_PER_INCH = 25.4;
/** Millimetres in one foot (exact). */
export const MILLIMETRES_PER_FOOT = 304.8;
/** Kilograms in one avoirdupois pound (exact). */
export const KILOGRAMS_PER_POUND = 0.45359237;
/** Cubic inches in one board foot (NHLA: 1 in × 12 in × 12 in). */
export const CUBIC_INCHES_PER_BOARD_FOOT = 144;
/** Cubic metres in one board foot: 144 × 0.0254³ (exact). */
export const CUBIC_METRES_PER_BOARD_FOOT = 144 * 0.0254 ** 3;

const LARGE = 1e12;

/** mm → inches. */
export function millimetresToInches(millimetres: number): number {
  return requireNumberInRange(millimetres, "millimetres", -LARGE, LARGE, "mm") / MILLIMETRES_PER_INCH;
}

/** inches → mm. */
export function inchesToMillimetres(inches: number): number {
  return requireNumberInRange(inches, "inches", -LARGE, LARGE, "in") * MILLIMETRES_PER_INCH;
}

/** kg → lb. */
export function kilogramsToPounds(kilograms: number): number {
  return requireNumberInRange(kilograms, "kilograms", -LARGE, LARGE, "kg") / KILOGRAMS_PER_POUND;
}

/** lb → kg. */
export function poundsToKilograms(pounds: number): number {
  return requireNumberInRange(pounds, "pounds", -LARGE, LARGE, "lb") * KILOGRAMS_PER_POUND;
}

/** m³ → board feet (144 in³ each). */
export function cubicMetresToBoardFeet(cubicMetres: number): number {
  return requireNumberInRange(cubicMetres, "cubicMetres", -LARGE, LARGE, "m³") / CUBIC_METRES_PER_BOARD_FOOT;
}

/** board feet → m³. */
export function boardFeetToCubicMetres(boardFeet: number): number {
  return requireNumberInRange(boardFeet, "boardFeet", -LARGE, LARGE, "bf") * CUBIC_METRES_PER_BOARD_FOOT;
}

/** °C → °F. */
export function celsiusToFahrenheit(celsius: number): number {
  return requireNumberInRange(celsius, "celsius", -273.15, LARGE, "°C") * 1.8 + 32;
}

/** °F → °C. */
export function fahrenheitToCelsius(fahrenheit: number): number {
  return (requireNumberInRange(fahrenheit, "fahrenheit", -459.67, LARGE, "°F") - 32) / 1.8;
}

/** An amount of inches split into whole inches and a reduced fraction. */
export interface InchFraction {
  /** Whole inches. */
  whole: number;
  /** Numerator of the reduced fraction (0 when the value is whole). */
  numerator: number;
  /** Denominator of the reduced fraction (1 when the value is whole). */
  denominator: number;
}

function greatestCommonDivisor(a: number, b: number): number {
  while (b !== 0) {
    const remainder = a % b;
    a = b;
    b = remainder;
  }
  return a;
}

/**
 * Rounds a length in inches to the nearest 1/denominator inch (half-up) and reduces
 * the fraction: 2.0625 → { whole: 2, numerator: 1, denominator: 16 }; 2.5 → 2 1/2.
 */
export function inchesToFraction(inches: number, denominator = 16): InchFraction {
  requireNumberInRange(inches, "inches", 0, LARGE, "in");
  if (!Number.isInteger(denominator) || denominator < 1 || denominator > 1024) {
    throw new SlabMathError("out_of_range", "denominator", `denominator must be a whole number from 1 to 1024, got ${denominator}`);
  }
  // Tiny epsilon so that values such as 52.4 mm (2.06299… in) round the way a tape measure reads.
  const units = Math.floor(inches * denominator + 0.5 + 1e-9);
  const whole = Math.floor(units / denominator);
  const rest = units - whole * denominator;
  if (rest === 0) return { whole, numerator: 0, denominator: 1 };
  const divisor = greatestCommonDivisor(rest, denominator);
  return { whole, numerator: rest / divisor, denominator: denominator / divisor };
}

function fractionText(fraction: InchFraction): string {
  if (fraction.numerator === 0) return String(fraction.whole);
  const part = `${fraction.numerator}/${fraction.denominator}`;
  return fraction.whole === 0 ? part : `${fraction.whole} ${part}`;
}

/**
 * Formats a length given in mm as inches with a reduced fraction to the nearest
 * 1/16″ (or 1/denominator″): formatInches(52.4) → "2 1/16″", formatInches(12.7) → "1/2″".
 * Uses the double prime (″, U+2033) as the inch mark.
 */
export function formatInches(millimetres: number, denominator = 16): string {
  requireNumberInRange(millimetres, "millimetres", 0, LARGE, "mm");
  return `${fractionText(inchesToFraction(millimetres / MILLIMETRES_PER_INCH, denominator))}″`;
}

/**
 * Splits a length in mm into feet and inches, the inches rounded to 1/denominator″
 * (carrying into the next foot when they round up to 12).
 */
export function millimetresToFeetAndInches(millimetres: number, denominator = 16): { feet: number; inches: InchFraction } {
  requireNumberInRange(millimetres, "millimetres", 0, LARGE, "mm");
  const totalInches = millimetres / MILLIMETRES_PER_INCH;
  const rounded = inchesToFraction(totalInches, denominator);
  const feet = Math.floor(rounded.whole / 12);
  return { feet, inches: { ...rounded, whole: rounded.whole - feet * 12 } };
}

/** Formats mm as feet and inches: formatFeetAndInches(2438.4) → "8′ 0″", 2197.1 → "7′ 2 1/2″". */
export function formatFeetAndInches(millimetres: number, denominator = 16): string {
  const { feet, inches } = millimetresToFeetAndInches(millimetres, denominator);
  return `${feet}′ ${fractionText(inches)}″`;
}

/** Formats metres as feet and inches (convenience for m → ft-in). */
export function formatMetresAsFeetAndInches(metres: number, denominator = 16): string {
  return formatFeetAndInches(requireNumberInRange(metres, "metres", 0, LARGE / 1000, "m") * 1000, denominator);
}

/** Converts feet and inches to mm (e.g. 7 ft 2.5 in → 2197.1 mm). */
export function feetAndInchesToMillimetres(feet: number, inches = 0): number {
  requireNumberInRange(feet, "feet", 0, LARGE, "ft");
  requireNumberInRange(inches, "inches", 0, LARGE, "in");
  return feet * MILLIMETRES_PER_FOOT + inches * MILLIMETRES_PER_INCH;
}

// "2", "2.0625", "2 1/16", "2-1/16", "1/2", optional trailing inch mark (″, ", in, inch, inches).
const INCH_PATTERN =
  /^\s*(?:(\d+(?:\.\d+)?|\.\d+)(?:(?:\s+|\s*-\s*)(\d+)\s*\/\s*(\d+))?|(\d+)\s*\/\s*(\d+))\s*(?:″|"|''|in(?:ch(?:es)?)?\.?)?\s*$/i;

/**
 * Parses a length in inches as a person types it and returns mm:
 * "2 1/16" → 52.3875, "2.0625" → 52.3875, "2-1/16″" → 52.3875, "1/2" → 12.7.
 * Throws SlabMathError('invalid_format') for anything else.
 */
export function parseInches(text: string, field = "inches"): number {
  if (typeof text !== "string") {
    throw new SlabMathError("invalid_format", field, `${field} must be text such as 2 1/16 or 2.0625`);
  }
  const match = INCH_PATTERN.exec(text);
  if (!match) {
    throw new SlabMathError("invalid_format", field, `${field} "${text}" is not a length in inches such as 2 1/16 or 2.0625`);
  }
  let inches: number;
  if (match[4] !== undefined) {
    inches = fractionValue(Number(match[4]), Number(match[5]), field, text);
  } else {
    inches = Number(match[1]);
    if (match[2] !== undefined) {
      if (match[1]!.includes(".")) {
        throw new SlabMathError("invalid_format", field, `${field} "${text}" mixes a decimal and a fraction`);
      }
      inches += fractionValue(Number(match[2]), Number(match[3]), field, text);
    }
  }
  return inches * MILLIMETRES_PER_INCH;
}

function fractionValue(numerator: number, denominator: number, field: string, text: string): number {
  if (denominator === 0) {
    throw new SlabMathError("invalid_format", field, `${field} "${text}" has a zero denominator`);
  }
  return numerator / denominator;
}
