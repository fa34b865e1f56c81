/**
 * The "nearest first" order of the catalogue without a distance per row: every listing of a yard
 * shares the yard's pickup position, so the page is found by walking the yards in order of
 * distance and asking for their matching listings, a growing batch of yards at a time.
 */

/** A yard's distance from the town a buyer searches around, km. */
export interface YardDistance {
  sawyerId: string;
  distanceKm: number;
}

/** Matching listings of some yards; from the `tie` yards only those after `afterId` (by id). */
export type FetchBatch = (
  yards: readonly string[],
  tie: { yards: readonly string[]; afterId: string } | null,
) => Promise<{ listingId: string; sawyerId: string }[]>;

const FIRST_BATCH = 8;
const GROWTH = 4;

/**
 * The ids of up to `rows` listings in (distance, id) order, after the previous page's last row.
 * `yards` must be sorted by distance. A batch never splits yards at the same distance, so once
 * the page is full every yard not yet asked is farther than every row found: sorting what was
 * found gives the exact page.
 */
export async function nearestFirst(
  yards: readonly YardDistance[],
  after: { value: number; id: string } | null,
  rows: number,
  fetchBatch: FetchBatch,
): Promise<string[]> {
  let next = after ? yards.findIndex((yard) => yard.distanceKm >= after.value) : 0;
  if (next < 0) return [];
  const found: { listingId: string; distanceKm: number }[] = [];
  for (let size = FIRST_BATCH; next < yards.length && found.length < rows; size *= GROWTH) {
    let end = Math.min(yards.length, next + size);
    while (end < yards.length && yards[end]!.distanceKm === yards[end - 1]!.distanceKm) end += 1;
    const batch = yards.slice(next, end);
    next = end;
    const tie = after ? batch.filter((yard) => yard.distanceKm === after.value) : [];
    const farther = batch.filter((yard) => !tie.includes(yard));
    const distanceOf = new Map(batch.map((yard) => [yard.sawyerId, yard.distanceKm]));
    const listings = await fetchBatch(
      farther.map((yard) => yard.sawyerId),
      tie.length ? { yards: tie.map((yard) => yard.sawyerId), afterId: after!.id } : null,
    );
    for (const listing of listings) found.push({ listingId: listing.listingId, distanceKm: distanceOf.get(listing.sawyerId)! });
  }
  found.sort((a, b) => a.distanceKm - b.distanceKm || (a.listingId < b.listingId ? -1 : a.listingId > b.listingId ? 1 : 0));
  return found.slice(0, rows).map((row) => row.listingId);
}
