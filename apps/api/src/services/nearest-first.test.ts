import { describe, expect, it } from "vitest";
import { nearestFirst, type FetchBatch, type YardDistance } from "./nearest-first.ts";

// A small deterministic generator, so a failure can be replayed.
function generator(seed: number) {
  let state = seed >>> 0;
  return () => (state = (state * 1664525 + 1013904223) >>> 0) / 2 ** 32;
}

/** An invented catalogue: yards at distances with many ties, listings in each, some not matching. */
function catalogue(seed: number) {
  const random = generator(seed);
  const yards: YardDistance[] = Array.from({ length: 5 + Math.floor(random() * 60) }, (_, i) => ({
    sawyerId: `yard-${String(i).padStart(3, "0")}`,
    distanceKm: Math.floor(random() * 25) * 3.5, // few distinct values: yards in the same town tie
  })).sort((a, b) => a.distanceKm - b.distanceKm || (a.sawyerId < b.sawyerId ? -1 : 1));
  const listings = yards.flatMap((yard) =>
    Array.from({ length: Math.floor(random() * 7) }, () => ({
      listingId: `${Math.floor(random() * 1e9)
        .toString(16)
        .padStart(8, "0")}-${yard.sawyerId}`,
      sawyerId: yard.sawyerId,
      matches: random() < 0.7,
    })),
  );
  let batches = 0;
  const fetchBatch: FetchBatch = async (asked, tie) => {
    batches += 1;
    return listings.filter(
      (l) => l.matches && (asked.includes(l.sawyerId) || (tie !== null && tie.yards.includes(l.sawyerId) && l.listingId > tie.afterId)),
    );
  };
  const distanceOf = new Map(yards.map((y) => [y.sawyerId, y.distanceKm]));
  // The order the walk must give: every matching listing by (distance, id), worked out in one go.
  const expected = listings
    .filter((l) => l.matches)
    .sort((a, b) => distanceOf.get(a.sawyerId)! - distanceOf.get(b.sawyerId)! || (a.listingId < b.listingId ? -1 : 1))
    .map((l) => l.listingId);
  return { yards, fetchBatch, expected, distanceOf, batches: () => batches };
}

describe("nearest first", () => {
  it("pages through every matching listing once, in (distance, id) order, across ties and batches (200 invented catalogues)", async () => {
    for (let seed = 1; seed <= 200; seed++) {
      const { yards, fetchBatch, expected, distanceOf } = catalogue(seed);
      const pageSize = 1 + (seed % 9);
      const seen: string[] = [];
      let after: { value: number; id: string } | null = null;
      for (;;) {
        const ids = await nearestFirst(yards, after, pageSize + 1, fetchBatch);
        const page = ids.slice(0, pageSize);
        seen.push(...page);
        if (ids.length <= pageSize) break;
        const last = page.at(-1)!;
        after = { value: distanceOf.get(last.split("-").slice(1).join("-"))!, id: last };
      }
      expect(seen, `seed ${seed}`).toEqual(expected);
    }
  });

  it("asks for few yards when the nearest ones fill the page", async () => {
    const yards = Array.from({ length: 2000 }, (_, i) => ({ sawyerId: `yard-${i}`, distanceKm: i }));
    let asked = 0;
    const ids = await nearestFirst(yards, null, 25, async (batch) => {
      asked += batch.length;
      return batch.flatMap((sawyerId) => Array.from({ length: 10 }, (_, n) => ({ listingId: `${sawyerId}-${n}`, sawyerId })));
    });
    expect(ids).toHaveLength(25);
    expect(asked).toBe(8);
  });

  it("finds nothing past the farthest yard", async () => {
    expect(await nearestFirst([{ sawyerId: "a", distanceKm: 3 }], { value: 9, id: "x" }, 5, async () => [])).toEqual([]);
  });
});
