/**
 * The catalogue's filters, and their one home: the page's URL query. The URL carries the API's
 * own words and units (millimetres, minor units, comma lists), so a link is the search itself:
 * `/browse?species=black-walnut&lengthMin=2000&ready=1` asks the API exactly that.
 *
 * - `filtersFromQuery` reads a URL query (anything a person may paste) into typed filters,
 *   leaving out what it cannot read.
 * - `queryFromFilters` writes filters back, leaving out defaults, so the URL stays short and
 *   the two are a round trip.
 * - `activeFilters` names every filter that is set, each with the query that removes it
 *   (the no-result suggestions and the chips above the results).
 */
import type { LocationQuery, LocationQueryRaw } from "vue-router";
import { catalogueSortLabels, catalogueSorts, liveEdges, setKinds, slabFeatures, yardLabels } from "@grainyard/contracts";
import type { UnitFormatter } from "../composables/useUnits.ts";
import { speciesName } from "./yard.ts";
import { minorToInput } from "@grainyard/slab-math";

export type CatalogueSort = (typeof catalogueSorts)[number];
type LiveEdgeChoice = (typeof liveEdges)[number];
type FeatureChoice = (typeof slabFeatures)[number];
export type SetChoice = (typeof setKinds)[number];
type WidthBasis = "average" | "minimum";
export type FitEdge = "keep_live_edge" | "trim_straight";

export interface CatalogueFilters {
  species: string[];
  lengthMin: number | null;
  lengthMax: number | null;
  widthMin: number | null;
  widthMax: number | null;
  widthBasis: WidthBasis;
  thicknessMin: number | null;
  thicknessMax: number | null;
  moistureMax: number | null;
  ready: boolean;
  priceMin: number | null;
  priceMax: number | null;
  liveEdge: LiveEdgeChoice[];
  features: FeatureChoice[];
  sets: SetChoice[];
  near: string | null;
  radiusKm: number | null;
  freight: boolean;
  /** "Fits my table": a number of diners, or the finished top's size (mm). */
  seats: number | null;
  fitLength: number | null;
  fitWidth: number | null;
  fitThickness: number | null;
  fitEdge: FitEdge;
  sort: CatalogueSort;
}

const emptyFilters: Readonly<CatalogueFilters> = Object.freeze({
  species: [],
  lengthMin: null,
  lengthMax: null,
  widthMin: null,
  widthMax: null,
  widthBasis: "average",
  thicknessMin: null,
  thicknessMax: null,
  moistureMax: null,
  ready: false,
  priceMin: null,
  priceMax: null,
  liveEdge: [],
  features: [],
  sets: [],
  near: null,
  radiusKm: null,
  freight: false,
  seats: null,
  fitLength: null,
  fitWidth: null,
  fitThickness: null,
  fitEdge: "keep_live_edge",
  sort: "newest",
}) as Readonly<CatalogueFilters>;

/** A fresh, editable copy of the empty filters. */
export function blankFilters(): CatalogueFilters {
  return { ...emptyFilters, species: [], liveEdge: [], features: [], sets: [] };
}

/** The query keys that belong to the search (anything else in the URL is left alone). */
export const filterKeys = [
  "species",
  "lengthMin",
  "lengthMax",
  "widthMin",
  "widthMax",
  "widthBasis",
  "thicknessMin",
  "thicknessMax",
  "moistureMax",
  "ready",
  "priceMin",
  "priceMax",
  "liveEdge",
  "features",
  "sets",
  "near",
  "radiusKm",
  "freight",
  "seats",
  "fitLength",
  "fitWidth",
  "fitThickness",
  "fitEdge",
  "sort",
] as const satisfies readonly (keyof CatalogueFilters)[];

type NumberKey = {
  [K in keyof CatalogueFilters]: CatalogueFilters[K] extends number | null ? K : never;
}[keyof CatalogueFilters];

const wholeNumberKeys = [
  "lengthMin",
  "lengthMax",
  "widthMin",
  "widthMax",
  "thicknessMin",
  "thicknessMax",
  "priceMin",
  "priceMax",
  "seats",
  "fitLength",
  "fitWidth",
  "fitThickness",
] as const satisfies readonly NumberKey[];
const decimalKeys = ["moistureMax", "radiusKm"] as const satisfies readonly NumberKey[];

function firstText(value: LocationQuery[string] | undefined): string | null {
  const first = Array.isArray(value) ? value[0] : value;
  if (typeof first !== "string") return null;
  const trimmed = first.trim();
  return trimmed === "" ? null : trimmed;
}

function readNumber(value: LocationQuery[string] | undefined, whole: boolean): number | null {
  const text = firstText(value);
  if (text === null || !/^\d+(?:\.\d+)?$/.test(text)) return null;
  const number = Number(text);
  if (!Number.isFinite(number)) return null;
  return whole && !Number.isInteger(number) ? null : number;
}

function readList<T extends string>(value: LocationQuery[string] | undefined, allowed: readonly T[]): T[] {
  const text = firstText(value);
  if (text === null) return [];
  const chosen = new Set(text.split(",").map((part) => part.trim()));
  // Kept in the contract's order, so one set of choices always writes the same URL.
  return allowed.filter((item) => chosen.has(item));
}

function readFlag(value: LocationQuery[string] | undefined): boolean {
  const text = firstText(value);
  return text === "1" || text === "true";
}

/** Reads the page's URL query into filters; what cannot be read is left at its default. */
export function filtersFromQuery(query: LocationQuery): CatalogueFilters {
  const filters = blankFilters();
  const speciesText = firstText(query.species);
  if (speciesText) {
    const seen = new Set<string>();
    for (const part of speciesText.split(",")) {
      const slug = part.trim();
      if (/^[a-z][a-z0-9-]{1,60}$/.test(slug) && !seen.has(slug)) {
        seen.add(slug);
        filters.species.push(slug);
      }
    }
  }
  for (const key of wholeNumberKeys) filters[key] = readNumber(query[key], true);
  for (const key of decimalKeys) filters[key] = readNumber(query[key], false);
  filters.widthBasis = firstText(query.widthBasis) === "minimum" ? "minimum" : "average";
  filters.ready = readFlag(query.ready);
  filters.freight = readFlag(query.freight);
  filters.liveEdge = readList(query.liveEdge, liveEdges);
  filters.features = readList(query.features, slabFeatures);
  filters.sets = readList(query.sets, setKinds);
  const near = firstText(query.near);
  filters.near = near && near.length <= 120 ? near : null;
  filters.fitEdge = firstText(query.fitEdge) === "trim_straight" ? "trim_straight" : "keep_live_edge";
  const sort = firstText(query.sort);
  filters.sort = (catalogueSorts as readonly string[]).includes(sort ?? "") ? (sort as CatalogueSort) : "newest";
  return filters;
}

/** True when a fit search is asked for (diners or a top size). */
export function hasFit(filters: CatalogueFilters): boolean {
  return filters.seats !== null || filters.fitLength !== null || filters.fitWidth !== null || filters.fitThickness !== null;
}

/** Writes filters as URL query text, leaving out every default. */
export function queryFromFilters(filters: CatalogueFilters): Record<string, string> {
  const query: Record<string, string> = {};
  if (filters.species.length) query.species = filters.species.join(",");
  const numbers: NumberKey[] = [
    "lengthMin",
    "lengthMax",
    "widthMin",
    "widthMax",
    "thicknessMin",
    "thicknessMax",
    "moistureMax",
    "priceMin",
    "priceMax",
    "radiusKm",
    "seats",
    "fitLength",
    "fitWidth",
    "fitThickness",
  ];
  for (const key of numbers) {
    const value = filters[key];
    if (value !== null) query[key] = String(value);
  }
  // The basis only matters when a width is asked for; written whenever it is not the default.
  if (filters.widthBasis !== "average") query.widthBasis = filters.widthBasis;
  if (filters.ready) query.ready = "1";
  if (filters.freight) query.freight = "1";
  if (filters.liveEdge.length) query.liveEdge = liveEdges.filter((edge) => filters.liveEdge.includes(edge)).join(",");
  if (filters.features.length) query.features = slabFeatures.filter((feature) => filters.features.includes(feature)).join(",");
  if (filters.sets.length) query.sets = setKinds.filter((kind) => filters.sets.includes(kind)).join(",");
  if (filters.near) query.near = filters.near;
  if (filters.fitEdge !== "keep_live_edge") query.fitEdge = filters.fitEdge;
  if (filters.sort !== "newest") query.sort = filters.sort;
  return sortKeys(query);
}

function sortKeys(query: Record<string, string>): Record<string, string> {
  const sorted: Record<string, string> = {};
  for (const key of filterKeys) if (query[key] !== undefined) sorted[key] = query[key];
  return sorted;
}

/**
 * The page's URL with new filters: keys that are not filters (none today, but a future `ref=`)
 * are kept as they were.
 */
export function withFilters(current: LocationQuery, filters: CatalogueFilters): LocationQueryRaw {
  const kept: LocationQueryRaw = {};
  for (const [key, value] of Object.entries(current)) {
    if (!(filterKeys as readonly string[]).includes(key)) kept[key] = value;
  }
  return { ...kept, ...queryFromFilters(filters) };
}

/** The API's query for one page of results. */
export function searchQuery(filters: CatalogueFilters, cursor: string | null, limit: number): Record<string, string> {
  const query = queryFromFilters(filters);
  // Sorting by distance without a town is refused by the API; fall back quietly.
  if (query.sort === "nearest" && !query.near) delete query.sort;
  // radiusKm needs a town too.
  if (query.radiusKm && !query.near) delete query.radiusKm;
  if (cursor) query.cursor = cursor;
  query.limit = String(limit);
  return query;
}

export interface ActiveFilter {
  /** The query keys it stands for (the API's field names, to match error messages). */
  keys: (keyof CatalogueFilters)[];
  label: string;
  /** The filters with this one taken off. */
  without: CatalogueFilters;
}

function rangeLabel(name: string, low: number | null, high: number | null, show: (value: number) => string): string {
  if (low !== null && high !== null) return `${name} ${show(low)} – ${show(high)}`;
  if (low !== null) return `${name} from ${show(low)}`;
  return `${name} up to ${show(high ?? 0)}`;
}

/**
 * Every filter that is set, in plain words, each with the filters that remain without it.
 * `placeName` is the town's name from the API's answer (the URL holds its id).
 */
export function activeFilters(filters: CatalogueFilters, format: UnitFormatter, placeName: string | null = null): ActiveFilter[] {
  const active: ActiveFilter[] = [];
  const take = (keys: (keyof CatalogueFilters)[], label: string) => {
    const without = {
      ...filters,
      species: [...filters.species],
      liveEdge: [...filters.liveEdge],
      features: [...filters.features],
      sets: [...filters.sets],
    };
    for (const key of keys) (without as Record<string, unknown>)[key] = structuredCloneDefault(key);
    active.push({ keys, label, without });
  };

  if (filters.species.length) {
    const names = filters.species.map(speciesName);
    take(["species"], names.length <= 2 ? names.join(" or ") : `${names.length} species`);
  }
  if (filters.lengthMin !== null || filters.lengthMax !== null) {
    take(["lengthMin", "lengthMax"], rangeLabel("Length", filters.lengthMin, filters.lengthMax, format.longLength));
  }
  if (filters.widthMin !== null || filters.widthMax !== null) {
    const name = filters.widthBasis === "minimum" ? "Narrowest width" : "Width";
    take(["widthMin", "widthMax", "widthBasis"], rangeLabel(name, filters.widthMin, filters.widthMax, format.length));
  }
  if (filters.thicknessMin !== null || filters.thicknessMax !== null) {
    take(["thicknessMin", "thicknessMax"], rangeLabel("Thickness", filters.thicknessMin, filters.thicknessMax, format.length));
  }
  if (filters.moistureMax !== null) take(["moistureMax"], `Moisture up to ${filters.moistureMax} %`);
  if (filters.ready) take(["ready"], "Ready to work only");
  if (filters.priceMin !== null || filters.priceMax !== null) {
    take(["priceMin", "priceMax"], rangeLabel("Price", filters.priceMin, filters.priceMax, minorToInput));
  }
  if (filters.liveEdge.length) take(["liveEdge"], filters.liveEdge.map((edge) => yardLabels.liveEdge[edge]).join(" or "));
  if (filters.features.length)
    take(["features"], `With ${filters.features.map((feature) => yardLabels.feature[feature].toLowerCase()).join(" and ")}`);
  if (filters.sets.length) take(["sets"], filters.sets.map((kind) => setLabels[kind]).join(" or "));
  if (filters.near) {
    const town = placeName ?? filters.near;
    take(
      ["near", "radiusKm", ...(filters.sort === "nearest" ? (["sort"] as const) : [])],
      filters.radiusKm !== null ? `Within ${filters.radiusKm} km of ${town}` : `Near ${town}`,
    );
  } else if (filters.radiusKm !== null) {
    take(["radiusKm"], `Within ${filters.radiusKm} km`);
  }
  if (filters.freight) take(["freight"], "Ships by freight");
  if (hasFit(filters)) {
    const label =
      filters.seats !== null
        ? `Table for ${filters.seats}`
        : `Top ${[filters.fitLength, filters.fitWidth, filters.fitThickness].map((mm) => (mm === null ? "any" : format.length(mm))).join(" × ")}`;
    take(
      ["seats", "fitLength", "fitWidth", "fitThickness", "fitEdge"],
      filters.fitEdge === "trim_straight" ? `${label}, edges trimmed` : label,
    );
  }
  return active;
}

function structuredCloneDefault(key: keyof CatalogueFilters): unknown {
  const value = emptyFilters[key];
  return Array.isArray(value) ? [] : value;
}

/** Plain names of the set kinds, for badges and chips. */
export const setLabels: Record<SetChoice, string> = {
  single: "Single slab",
  sequential: "Sequential set",
  bookmatched: "Bookmatched pair",
};

export const sortOptions = catalogueSorts.map((value) => ({ value, label: catalogueSortLabels[value] }));
