/**
 * Species catalogue: wood common in urban trees of North America and Europe.
 *
 * Sources, per value group (see each entry's `sources`):
 * - Specific gravity (basic = oven-dry mass / green volume; and at 12 % MC):
 *   Wood Handbook FPL-GTR-190 (2010) Table 5-3a.
 * - Shrinkage green → oven-dry, radial / tangential / volumetric, %: Table 4-3.
 * - Dimensional change coefficients (per % MC, 6–14 % MC): Table 13-5.
 * - European species are mostly not in the handbook: shrinkage from Hoadley (1998),
 *   "Chemical and physical properties of wood", in The Structural Conservation of Panel
 *   Paintings (Getty Conservation Institute), Table 1 (genus averages); where no published
 *   coefficient exists it is derived as shrinkage ÷ fibre saturation point (common practice).
 * - A value listed in an entry's `fromMemory` was recalled without a source at hand (for the
 *   North American species, recalled from the named handbook table but not re-checked); such
 *   values are not used as expected values in the tests.
 */
import { SlabMathError } from "./errors.ts";
import { FIBRE_SATURATION_POINT_PCT } from "./wood-physics.ts";

/** Names of the numeric values of a {@link Species}. */
export type SpeciesValueName =
  | "basicSpecificGravity"
  | "specificGravity12"
  | "shrinkageRadialPct"
  | "shrinkageTangentialPct"
  | "shrinkageVolumetricPct"
  | "radialCoefficient"
  | "tangentialCoefficient";

/** Where each group of values came from. */
export interface SpeciesSources {
  specificGravity: string;
  shrinkage: string;
  coefficients: string;
}

/** One catalogue entry. */
export interface Species {
  /** URL-safe identifier, kebab-case. */
  slug: string;
  commonName: string;
  /** Other common names (trade names, British names). */
  otherNames: readonly string[];
  botanicalName: string;
  kind: "hardwood" | "softwood";
  /** Where the tree is a common urban tree (native or widely planted). */
  regions: readonly ("north_america" | "europe")[];
  /** Oven-dry mass over green volume. */
  basicSpecificGravity: number;
  /** Oven-dry mass over volume at 12 % MC. */
  specificGravity12: number;
  /** Shrinkage from green to oven-dry, % of green dimension. */
  shrinkageRadialPct: number;
  shrinkageTangentialPct: number;
  shrinkageVolumetricPct: number;
  /** Dimensional change coefficients, fraction per % MC (Wood Handbook Table 13-5 where published). */
  radialCoefficient: number;
  tangentialCoefficient: number;
  /** One-line summary of the sources (the tables named in `sources`). */
  source: string;
  sources: SpeciesSources;
  /** Values recalled without a source at hand (left out of tests). */
  fromMemory: readonly SpeciesValueName[];
  /** When all values are borrowed from a closely related species, its slug. */
  proxyForSlug?: string;
}

const SPECIFIC_GRAVITY_TABLE = "Wood Handbook FPL-GTR-190 Table 5-3a";
const SHRINKAGE_TABLE = "Wood Handbook FPL-GTR-190 Table 4-3";
const COEFFICIENT_TABLE = "Wood Handbook FPL-GTR-190 Table 13-5";
const DERIVED_COEFFICIENTS = "derived from shrinkage ÷ FSP, common practice";
const HOADLEY_TABLE = "Hoadley 1998, The Structural Conservation of Panel Paintings (Getty), Table 1, genus average";
const FROM_MEMORY = "from memory";

type Row = [
  slug: string,
  commonName: string,
  otherNames: readonly string[],
  botanicalName: string,
  kind: "hardwood" | "softwood",
  regions: readonly ("north_america" | "europe")[],
  basicSpecificGravity: number,
  specificGravity12: number,
  radial: number,
  tangential: number,
  volumetric: number,
  radialCoefficient: number | null,
  tangentialCoefficient: number | null,
  sources: SpeciesSources,
  fromMemory: readonly SpeciesValueName[],
];

const NA: readonly ("north_america" | "europe")[] = ["north_america"];
const EU: readonly ("north_america" | "europe")[] = ["europe"];
const BOTH: readonly ("north_america" | "europe")[] = ["north_america", "europe"];

/** North American species: all three handbook tables. */
const handbook: SpeciesSources = {
  specificGravity: SPECIFIC_GRAVITY_TABLE,
  shrinkage: SHRINKAGE_TABLE,
  coefficients: COEFFICIENT_TABLE,
};

const SG = "basicSpecificGravity" as const;
const SG12 = "specificGravity12" as const;
const SHRINK = ["shrinkageRadialPct", "shrinkageTangentialPct", "shrinkageVolumetricPct"] as const;

/** European species: SG from memory, shrinkage from Hoadley, coefficients derived. */
const european: SpeciesSources = {
  specificGravity: FROM_MEMORY,
  shrinkage: `${HOADLEY_TABLE} (radial, tangential); volumetric from memory`,
  coefficients: DERIVED_COEFFICIENTS,
};
const EUROPEAN_MEMORY: readonly SpeciesValueName[] = [SG, SG12, "shrinkageVolumetricPct"];

// prettier-ignore
const ROWS: readonly Row[] = [
  // slug, common name, other names, botanical, kind, regions, Gb, G12, R%, T%, V%, CR, CT, sources, from memory
  ['silver-maple', 'Silver maple', ['soft maple'], 'Acer saccharinum', 'hardwood', NA, 0.44, 0.47, 3.0, 7.2, 12.0, 0.00102, 0.00252, handbook, [SG, SG12, ...SHRINK]],
  ['sugar-maple', 'Sugar maple', ['hard maple', 'rock maple'], 'Acer saccharum', 'hardwood', NA, 0.56, 0.63, 4.8, 9.9, 14.7, 0.00165, 0.00353, handbook, [SG, ...SHRINK]],
  ['red-maple', 'Red maple', ['soft maple'], 'Acer rubrum', 'hardwood', NA, 0.49, 0.54, 4.0, 8.2, 12.6, 0.00137, 0.00289, handbook, [SG, ...SHRINK]],
  ['norway-maple', 'Norway maple', [], 'Acer platanoides', 'hardwood', BOTH, 0.52, 0.59, 4.2, 8.8, 12.8, null, null, { ...european, shrinkage: `${HOADLEY_TABLE} (Acer; radial, tangential); volumetric from memory` }, EUROPEAN_MEMORY],
  ['northern-red-oak', 'Northern red oak', ['red oak'], 'Quercus rubra', 'hardwood', NA, 0.56, 0.63, 4.0, 8.6, 13.7, 0.00158, 0.00369, { ...handbook, coefficients: `${COEFFICIENT_TABLE} (red oak, commercial)` }, [SG, ...SHRINK]],
  ['white-oak', 'White oak', [], 'Quercus alba', 'hardwood', NA, 0.60, 0.68, 5.6, 10.5, 16.3, 0.00180, 0.00365, { ...handbook, coefficients: `${COEFFICIENT_TABLE} (white oak, commercial)` }, [SG]],
  ['european-oak', 'European oak', ['English oak', 'sessile oak'], 'Quercus robur, Q. petraea', 'hardwood', EU, 0.56, 0.63, 5.2, 10.2, 15.0, null, null, { ...european, shrinkage: `${HOADLEY_TABLE} (Quercus, white oak group; radial, tangential); volumetric from memory` }, EUROPEAN_MEMORY],
  ['black-walnut', 'Black walnut', ['American walnut'], 'Juglans nigra', 'hardwood', NA, 0.51, 0.55, 5.5, 7.8, 12.8, 0.00190, 0.00274, handbook, [SG, SG12]],
  ['american-elm', 'American elm', ['white elm'], 'Ulmus americana', 'hardwood', NA, 0.46, 0.50, 4.2, 9.5, 14.6, 0.00144, 0.00338, handbook, [SG]],
  ['english-elm', 'English elm', ['field elm'], 'Ulmus procera (U. minor)', 'hardwood', EU, 0.45, 0.52, 5.2, 9.1, 14.0, null, null, { ...european, shrinkage: `${HOADLEY_TABLE} (Ulmus; radial, tangential); volumetric from memory` }, EUROPEAN_MEMORY],
  ['honey-locust', 'Honey locust', ['honeylocust'], 'Gleditsia triacanthos', 'hardwood', NA, 0.60, 0.66, 4.2, 6.6, 10.8, 0.00144, 0.00230, { ...handbook, specificGravity: `${SPECIFIC_GRAVITY_TABLE} (green); 12 % value not tabulated, derived from the green value with the Wood Handbook ch. 4 equation` }, [SG, ...SHRINK]],
  ['black-locust', 'Black locust', ['false acacia', 'robinia'], 'Robinia pseudoacacia', 'hardwood', BOTH, 0.66, 0.69, 4.6, 7.2, 10.2, 0.00158, 0.00252, handbook, [SG, ...SHRINK]],
  ['white-ash', 'White ash', ['American ash'], 'Fraxinus americana', 'hardwood', NA, 0.55, 0.60, 4.9, 7.8, 13.3, 0.00169, 0.00274, handbook, [SG]],
  ['european-ash', 'European ash', ['common ash'], 'Fraxinus excelsior', 'hardwood', EU, 0.55, 0.62, 5.2, 8.3, 13.2, null, null, { ...european, shrinkage: `${HOADLEY_TABLE} (Fraxinus; radial, tangential); volumetric from memory` }, EUROPEAN_MEMORY],
  ['american-sycamore', 'American sycamore', ['buttonwood', 'American plane'], 'Platanus occidentalis', 'hardwood', NA, 0.46, 0.49, 5.0, 8.4, 14.1, 0.00172, 0.00296, handbook, [SG, SG12]],
  ['black-cherry', 'Black cherry', ['American cherry'], 'Prunus serotina', 'hardwood', NA, 0.47, 0.50, 3.7, 7.1, 11.5, 0.00126, 0.00248, handbook, [SG]],
  ['hackberry', 'Hackberry', ['common hackberry'], 'Celtis occidentalis', 'hardwood', NA, 0.49, 0.53, 4.8, 8.9, 13.8, 0.00165, 0.00315, handbook, [SG]],
  ['european-beech', 'European beech', ['common beech'], 'Fagus sylvatica', 'hardwood', EU, 0.56, 0.64, 5.8, 11.8, 17.5, null, null, { ...european, shrinkage: `${HOADLEY_TABLE} (Fagus; radial, tangential); volumetric from memory` }, EUROPEAN_MEMORY],
  ['american-beech', 'American beech', [], 'Fagus grandifolia', 'hardwood', NA, 0.56, 0.64, 5.5, 11.9, 17.2, 0.00190, 0.00431, handbook, [SG]],
  ['american-basswood', 'American basswood', ['American linden'], 'Tilia americana', 'hardwood', NA, 0.32, 0.37, 6.6, 9.3, 15.8, 0.00230, 0.00330, handbook, [SG]],
  ['european-lime', 'European lime', ['linden', 'small-leaved lime'], 'Tilia cordata, T. × europaea', 'hardwood', EU, 0.42, 0.49, 6.8, 9.5, 15.0, null, null, { ...european, shrinkage: `${HOADLEY_TABLE} (Tilia; radial, tangential); volumetric from memory` }, EUROPEAN_MEMORY],
  ['eastern-cottonwood', 'Eastern cottonwood', ['cottonwood'], 'Populus deltoides', 'hardwood', NA, 0.37, 0.40, 3.9, 9.2, 13.9, 0.00133, 0.00327, handbook, [SG, SG12]],
  ['northern-catalpa', 'Northern catalpa', ['catalpa'], 'Catalpa speciosa', 'hardwood', NA, 0.38, 0.41, 2.5, 4.9, 7.3, 0.00085, 0.00169, { specificGravity: FROM_MEMORY, shrinkage: FROM_MEMORY, coefficients: `${COEFFICIENT_TABLE} (catalpa, northern)` }, [SG, SG12, ...SHRINK]],
  ['kentucky-coffeetree', 'Kentucky coffeetree', ['coffeetree'], 'Gymnocladus dioicus', 'hardwood', NA, 0.53, 0.60, 4.6, 7.0, 11.2, null, null, { specificGravity: FROM_MEMORY, shrinkage: FROM_MEMORY, coefficients: DERIVED_COEFFICIENTS }, [SG, SG12, ...SHRINK]],
  ['red-mulberry', 'Mulberry', ['red mulberry', 'white mulberry'], 'Morus rubra, M. alba', 'hardwood', BOTH, 0.59, 0.66, 3.5, 5.5, 9.0, null, null, { specificGravity: FROM_MEMORY, shrinkage: FROM_MEMORY, coefficients: DERIVED_COEFFICIENTS }, [SG, SG12, ...SHRINK]],
  ['osage-orange', 'Osage orange', ['hedge apple', 'bois d’arc'], 'Maclura pomifera', 'hardwood', NA, 0.76, 0.84, 3.8, 5.7, 9.2, null, null, { specificGravity: FROM_MEMORY, shrinkage: FROM_MEMORY, coefficients: DERIVED_COEFFICIENTS }, [SG, SG12, ...SHRINK]],
  ['sweetgum', 'Sweetgum', ['American sweetgum', 'red gum'], 'Liquidambar styraciflua', 'hardwood', NA, 0.46, 0.52, 5.3, 10.2, 15.8, 0.00183, 0.00365, handbook, [SG, SG12]],
  ['yellow-poplar', 'Yellow-poplar', ['tulip-tree', 'tulipwood', 'tulip poplar'], 'Liriodendron tulipifera', 'hardwood', NA, 0.40, 0.42, 4.6, 8.2, 12.7, 0.00158, 0.00289, { ...handbook, coefficients: `${COEFFICIENT_TABLE} (from memory)` }, [SG, SG12, 'radialCoefficient', 'tangentialCoefficient']],
  ['shagbark-hickory', 'Shagbark hickory', ['hickory'], 'Carya ovata', 'hardwood', NA, 0.64, 0.72, 7.0, 10.5, 16.7, 0.00259, 0.00411, { ...handbook, coefficients: `${COEFFICIENT_TABLE} (hickory, true)` }, [SG, ...SHRINK, 'radialCoefficient']],
  ['yellow-birch', 'Yellow birch', ['birch'], 'Betula alleghaniensis', 'hardwood', NA, 0.55, 0.62, 7.3, 9.5, 16.8, 0.00256, 0.00338, handbook, [SG]],
  ['eastern-red-cedar', 'Eastern red cedar', ['eastern redcedar', 'aromatic cedar'], 'Juniperus virginiana', 'softwood', NA, 0.44, 0.47, 3.1, 4.7, 7.8, null, null, { ...handbook, coefficients: DERIVED_COEFFICIENTS }, [SG, SG12]],
];

const LONDON_PLANE_SOURCE = "assumed equal to American sycamore (same genus, Platanus): no published values found";

function rowToSpecies(row: Row): Species {
  const [
    slug,
    commonName,
    otherNames,
    botanicalName,
    kind,
    regions,
    basic,
    twelve,
    radial,
    tangential,
    volumetric,
    cr,
    ct,
    sources,
    fromMemory,
  ] = row;
  // Where the handbook publishes no coefficient: shrinkage (green → oven-dry) spread evenly over
  // the moisture range below fibre saturation, C ≈ S / (100 · FSP) per % MC (common practice).
  const radialCoefficient = cr ?? Math.round((radial / 100 / FIBRE_SATURATION_POINT_PCT) * 1e5) / 1e5;
  const tangentialCoefficient = ct ?? Math.round((tangential / 100 / FIBRE_SATURATION_POINT_PCT) * 1e5) / 1e5;
  return Object.freeze({
    slug,
    commonName,
    otherNames,
    botanicalName,
    kind,
    regions,
    basicSpecificGravity: basic,
    specificGravity12: twelve,
    shrinkageRadialPct: radial,
    shrinkageTangentialPct: tangential,
    shrinkageVolumetricPct: volumetric,
    radialCoefficient,
    tangentialCoefficient,
    source: `SG: ${sources.specificGravity}; shrinkage: ${sources.shrinkage}; coefficients: ${sources.coefficients}`,
    sources,
    fromMemory,
  });
}

function buildCatalogue(): readonly Species[] {
  const list = ROWS.map(rowToSpecies);
  const sycamore = list.find((entry) => entry.slug === "american-sycamore")!;
  const londonPlaneSources = {
    specificGravity: LONDON_PLANE_SOURCE,
    shrinkage: LONDON_PLANE_SOURCE,
    coefficients: LONDON_PLANE_SOURCE,
  };
  list.push(
    Object.freeze({
      ...sycamore,
      slug: "london-plane",
      commonName: "London plane",
      otherNames: ["plane", "lacewood (quartersawn)"],
      botanicalName: "Platanus × hispanica (P. × acerifolia)",
      regions: BOTH,
      source: `SG, shrinkage and coefficients: ${LONDON_PLANE_SOURCE}`,
      sources: londonPlaneSources,
      fromMemory: [],
      proxyForSlug: "american-sycamore",
    }),
  );
  list.sort((a, b) => a.commonName.localeCompare(b.commonName, "en"));
  return Object.freeze(list);
}

/** The species catalogue, sorted by common name. */
export const species: readonly Species[] = buildCatalogue();

const BY_SLUG: ReadonlyMap<string, Species> = new Map(species.map((entry) => [entry.slug, entry]));

/** Looks a species up by slug; undefined when unknown. */
export function findSpeciesBySlug(slug: string): Species | undefined {
  return BY_SLUG.get(slug);
}

/**
 * Looks a species up by slug.
 * @throws SlabMathError('unknown_species') when the slug is not in the catalogue.
 */
export function speciesBySlug(slug: string, field = "speciesSlug"): Species {
  const found = typeof slug === "string" ? BY_SLUG.get(slug) : undefined;
  if (!found) {
    throw new SlabMathError("unknown_species", field, `${field} "${String(slug)}" is not in the species catalogue`);
  }
  return found;
}
