/**
 * Small statistics for figures the product shows (a yard's typical first-reply time).
 */
import { SlabMathError } from "./errors.ts";

/**
 * The median: the middle value of the sorted values, or the mean of the two middle values when
 * their count is even; null for no values. Order of the input does not matter.
 */
export function median(values: readonly number[]): number | null {
  if (!Array.isArray(values)) throw new SlabMathError("missing_input", "values", "values must be a list of numbers");
  values.forEach((value, index) => {
    if (typeof value !== "number" || !Number.isFinite(value))
      throw new SlabMathError("not_finite", `values[${index}]`, `values[${index}] must be a finite number`);
  });
  if (values.length === 0) return null;
  const sorted = [...values].sort((a, b) => a - b);
  const middle = Math.floor(sorted.length / 2);
  return sorted.length % 2 === 1 ? sorted[middle]! : (sorted[middle - 1]! + sorted[middle]!) / 2;
}
