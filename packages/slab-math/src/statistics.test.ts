import { describe, expect, it } from "vitest";
import { SlabMathError } from "./errors.ts";
import { median } from "./statistics.ts";

describe("median", () => {
  // Source: the Python standard library's statistics.median documentation
  // (https://docs.python.org/3/library/statistics.html#statistics.median):
  // median([1, 3, 5]) == 3 and, for an even count, the mean of the two middle values: median([1, 3, 5, 7]) == 4.0.
  it("matches the worked examples of Python's statistics.median", () => {
    expect(median([1, 3, 5])).toBe(3);
    expect(median([1, 3, 5, 7])).toBe(4);
  });

  it("sorts first, and gives null for no values", () => {
    expect(median([7, 1, 5, 3])).toBe(4);
    expect(median([42])).toBe(42);
    expect(median([])).toBeNull();
  });

  it("refuses what is not a finite number", () => {
    expect(() => median([1, Number.NaN])).toThrow(SlabMathError);
    expect(() => median([1, Infinity])).toThrow(SlabMathError);
  });
});
