import { describe, expect, it } from "vitest";
import { countOf, pluralWord } from "./plurals.ts";

// English plural rules (CLDR, as Intl.PluralRules carries them): "one" for exactly 1, "other" otherwise.
describe("counts in words", () => {
  it("takes the singular for one and the plural for none, many and fractions", () => {
    expect(countOf(0, "slab", "slabs")).toBe("0 slabs");
    expect(countOf(1, "slab", "slabs")).toBe("1 slab");
    expect(countOf(2, "slab", "slabs")).toBe("2 slabs");
    expect(countOf(1.5, "day", "days")).toBe("1.5 days");
    expect(countOf(1200, "slab", "slabs")).toBe("1,200 slabs");
  });

  it("picks whole phrases, verbs included", () => {
    expect(pluralWord(1, "listing waits", "listings wait")).toBe("listing waits");
    expect(pluralWord(3, "listing waits", "listings wait")).toBe("listings wait");
    expect(pluralWord(1, "slab was", "slabs were")).toBe("slab was");
  });
});
