/**
 * Typed errors and input checks shared by every function in the package.
 *
 * Every public function validates its input and throws a {@link SlabMathError}
 * (never returns NaN) so that the web app can show the message next to the
 * field the sawyer is typing into, and the API can answer 400 with `field`.
 */

/** Machine-readable reason for a {@link SlabMathError}. */
export type SlabMathErrorCode =
  | "not_a_number"
  | "not_finite"
  | "negative"
  | "out_of_range"
  | "not_integer"
  | "too_few_stations"
  | "unknown_species"
  | "invalid_date"
  | "invalid_format"
  | "fees_exceed_subtotal"
  | "missing_input";

/** Error thrown on invalid input. `field` names the offending input (dotted path). */
export class SlabMathError extends Error {
  readonly code: SlabMathErrorCode;
  readonly field: string;

  constructor(code: SlabMathErrorCode, field: string, message: string) {
    super(message);
    this.name = "SlabMathError";
    this.code = code;
    this.field = field;
  }
}

/**
 * Checks that `value` is a finite number within [minimum, maximum] and returns it.
 * `unit` is only used in the message ("length must be at most 12000 mm").
 */
export function requireNumberInRange(value: unknown, field: string, minimum: number, maximum: number, unit = ""): number {
  if (typeof value !== "number" || Number.isNaN(value)) {
    throw new SlabMathError("not_a_number", field, `${field} must be a number, got ${describe(value)}`);
  }
  if (!Number.isFinite(value)) {
    throw new SlabMathError("not_finite", field, `${field} must be a finite number, got ${value}`);
  }
  const suffix = unit ? ` ${unit}` : "";
  if (value < 0 && minimum >= 0) {
    throw new SlabMathError("negative", field, `${field} must not be negative, got ${value}${suffix}`);
  }
  if (value < minimum || value > maximum) {
    throw new SlabMathError("out_of_range", field, `${field} must be between ${minimum} and ${maximum}${suffix}, got ${value}${suffix}`);
  }
  return value;
}

/** Like {@link requireNumberInRange} but the value must also be strictly greater than zero. */
export function requirePositive(value: unknown, field: string, maximum: number, unit = ""): number {
  const checked = requireNumberInRange(value, field, 0, maximum, unit);
  if (checked === 0) {
    throw new SlabMathError("out_of_range", field, `${field} must be greater than 0${unit ? ` ${unit}` : ""}`);
  }
  return checked;
}

/** Checks that `value` is a non-negative safe integer (money in minor units, basis points). */
export function requireNonNegativeInteger(value: unknown, field: string, maximum = Number.MAX_SAFE_INTEGER): number {
  if (typeof value !== "number" || Number.isNaN(value)) {
    throw new SlabMathError("not_a_number", field, `${field} must be a number, got ${describe(value)}`);
  }
  if (!Number.isFinite(value)) {
    throw new SlabMathError("not_finite", field, `${field} must be a finite number, got ${value}`);
  }
  if (!Number.isInteger(value)) {
    throw new SlabMathError("not_integer", field, `${field} must be a whole number of minor units, got ${value}`);
  }
  if (value < 0) {
    throw new SlabMathError("negative", field, `${field} must not be negative, got ${value}`);
  }
  if (value > maximum) {
    throw new SlabMathError("out_of_range", field, `${field} must be at most ${maximum}, got ${value}`);
  }
  return value;
}

function describe(value: unknown): string {
  if (typeof value === "number") return String(value);
  if (typeof value === "string") return `the text "${value}"`;
  if (value === null) return "null";
  return typeof value;
}
