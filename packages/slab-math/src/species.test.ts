import { describe, expect, it } from "vitest";
import { SlabMathError } from "./errors.ts";
import { findSpeciesBySlug, species, speciesBySlug, type Species } from "./species.ts";

const REQUIRED_SLUGS = [
  "silver-maple",
  "sugar-maple",
  "red-maple",
  "northern-red-oak",
  "white-oak",
  "black-walnut",
  "american-elm",
  "english-elm",
  "honey-locust",
  "white-ash",
  "european-ash",
  "american-sycamore",
  "london-plane",
  "black-cherry",
  "hackberry",
  "black-locust",
  "norway-maple",
  "european-beech",
  "european-oak",
  "american-basswood",
  "european-lime",
  "eastern-cottonwood",
  "northern-catalpa",
  "kentucky-coffeetree",
  "red-mulberry",
  "osage-orange",
  "sweetgum",
  "yellow-poplar",
  "shagbark-hickory",
  "yellow-birch",
  "eastern-red-cedar",
];

/** True when a value of the entry was looked up (not recalled, not borrowed from a proxy). */
function lookedUp(entry: Species, value: Species["fromMemory"][number]): boolean {
  return entry.proxyForSlug === undefined && !entry.fromMemory.includes(value);
}

describe("species catalogue", () => {
  it("has at least 30 species, including every required urban species", () => {
    expect(species.length).toBeGreaterThanOrEqual(30);
    for (const slug of REQUIRED_SLUGS) expect(findSpeciesBySlug(slug), slug).toBeDefined();
  });

  it("slugs are unique and kebab-case", () => {
    const slugs = species.map((entry) => entry.slug);
    expect(new Set(slugs).size).toBe(slugs.length);
    for (const slug of slugs) expect(slug).toMatch(/^[a-z]+(-[a-z]+)*$/);
  });

  it("specific gravity at 12 % exceeds basic specific gravity (wood shrinks as it dries)", () => {
    for (const entry of species) expect(entry.specificGravity12, entry.slug).toBeGreaterThan(entry.basicSpecificGravity);
  });

  it("tangential shrinkage exceeds radial, and volumetric exceeds tangential", () => {
    for (const entry of species) {
      expect(entry.shrinkageTangentialPct, entry.slug).toBeGreaterThan(entry.shrinkageRadialPct);
      expect(entry.shrinkageVolumetricPct, entry.slug).toBeGreaterThan(entry.shrinkageTangentialPct);
      expect(entry.tangentialCoefficient, entry.slug).toBeGreaterThan(entry.radialCoefficient);
    }
  });

  it("every entry names a source for each value group", () => {
    for (const entry of species) {
      expect(entry.source.length, entry.slug).toBeGreaterThan(10);
      for (const text of Object.values(entry.sources)) expect(text.length, entry.slug).toBeGreaterThan(5);
      expect(entry.commonName.length).toBeGreaterThan(2);
      expect(entry.botanicalName).toMatch(/^[A-Z][a-z]+ /);
    }
  });

  it("speciesBySlug throws a typed error for an unknown slug", () => {
    expect(speciesBySlug("black-walnut").botanicalName).toBe("Juglans nigra");
    expect(() => speciesBySlug("unobtainium")).toThrow(SlabMathError);
    expect(() => speciesBySlug("unobtainium")).toThrow(/speciesSlug/);
  });
});

describe("catalogue values against the sources they name", () => {
  // Wood Handbook FPL-GTR-190 Table 13-5, dimensional change coefficients C_R, C_T
  // (transcribed from the handbook page for this test).
  const table135: Record<string, [number, number]> = {
    "silver-maple": [0.00102, 0.00252],
    "sugar-maple": [0.00165, 0.00353],
    "red-maple": [0.00137, 0.00289],
    "northern-red-oak": [0.00158, 0.00369], // "Red oak, commercial"
    "white-oak": [0.0018, 0.00365], // "White oak, commercial"
    "black-walnut": [0.0019, 0.00274],
    "american-elm": [0.00144, 0.00338],
    "honey-locust": [0.00144, 0.0023],
    "black-locust": [0.00158, 0.00252],
    "white-ash": [0.00169, 0.00274],
    "american-sycamore": [0.00172, 0.00296],
    "black-cherry": [0.00126, 0.00248],
    hackberry: [0.00165, 0.00315],
    "american-beech": [0.0019, 0.00431],
    "american-basswood": [0.0023, 0.0033],
    "eastern-cottonwood": [0.00133, 0.00327],
    "northern-catalpa": [0.00085, 0.00169],
    sweetgum: [0.00183, 0.00365],
    "yellow-birch": [0.00256, 0.00338],
  };
  for (const [slug, [radial, tangential]] of Object.entries(table135)) {
    it(`Table 13-5: ${slug} C_R ${radial}, C_T ${tangential}`, () => {
      const entry = speciesBySlug(slug);
      expect(entry.radialCoefficient).toBe(radial);
      expect(entry.tangentialCoefficient).toBe(tangential);
      expect(entry.sources.coefficients).toContain("Table 13-5");
    });
  }
  it("hickory, true: C_T 0.00411 (Wood Handbook, as reproduced in flooring stability tables)", () => {
    expect(speciesBySlug("shagbark-hickory").tangentialCoefficient).toBe(0.00411);
  });

  // Wood Handbook FPL-GTR-190 Table 4-3, shrinkage green → oven-dry, % (radial, tangential, volumetric).
  const table43: Record<string, [number, number, number]> = {
    "white-ash": [4.9, 7.8, 13.3],
    "american-basswood": [6.6, 9.3, 15.8],
    "american-beech": [5.5, 11.9, 17.2],
    "yellow-birch": [7.3, 9.5, 16.8],
    "black-cherry": [3.7, 7.1, 11.5],
    "eastern-cottonwood": [3.9, 9.2, 13.9],
    "american-elm": [4.2, 9.5, 14.6],
    hackberry: [4.8, 8.9, 13.8],
    "white-oak": [5.6, 10.5, 16.3],
    sweetgum: [5.3, 10.2, 15.8],
    "american-sycamore": [5.0, 8.4, 14.1],
    "black-walnut": [5.5, 7.8, 12.8],
    "yellow-poplar": [4.6, 8.2, 12.7],
    "eastern-red-cedar": [3.1, 4.7, 7.8],
  };
  for (const [slug, [radial, tangential, volumetric]] of Object.entries(table43)) {
    it(`Table 4-3: ${slug} ${radial} / ${tangential} / ${volumetric} %`, () => {
      const entry = speciesBySlug(slug);
      expect([entry.shrinkageRadialPct, entry.shrinkageTangentialPct, entry.shrinkageVolumetricPct]).toEqual([
        radial,
        tangential,
        volumetric,
      ]);
    });
  }

  // Hoadley 1998 (The Structural Conservation of Panel Paintings, Getty), Table 1: genus averages,
  // tangential / radial shrinkage green → oven-dry, %.
  const hoadley: Record<string, [number, number]> = {
    "european-beech": [11.8, 5.8], // Fagus
    "european-ash": [8.3, 5.2], // Fraxinus
    "english-elm": [9.1, 5.2], // Ulmus
    "european-lime": [9.5, 6.8], // Tilia
    "european-oak": [10.2, 5.2], // Quercus, white oak
    "norway-maple": [8.8, 4.2], // Acer
  };
  for (const [slug, [tangential, radial]] of Object.entries(hoadley)) {
    it(`Hoadley 1998 Table 1: ${slug} tangential ${tangential} %, radial ${radial} %`, () => {
      const entry = speciesBySlug(slug);
      expect(entry.shrinkageTangentialPct).toBe(tangential);
      expect(entry.shrinkageRadialPct).toBe(radial);
    });
  }

  it("handbook coefficients (Table 13-5) agree with handbook shrinkage (Table 4-3) ÷ 30 % within 25 %", () => {
    // Two tables from independent measurements: the coefficient should be close to total shrinkage
    // spread over the range below fibre saturation (the common-practice derivation).
    let checked = 0;
    for (const entry of species) {
      const both = ["radialCoefficient", "tangentialCoefficient", "shrinkageRadialPct", "shrinkageTangentialPct"] as const;
      if (!both.every((value) => lookedUp(entry, value)) || !entry.sources.coefficients.includes("Table 13-5")) continue;
      if (!entry.sources.shrinkage.includes("Table 4-3")) continue;
      expect(entry.tangentialCoefficient / (entry.shrinkageTangentialPct / 3000), entry.slug).toBeGreaterThan(0.75);
      expect(entry.tangentialCoefficient / (entry.shrinkageTangentialPct / 3000), entry.slug).toBeLessThan(1.25);
      expect(entry.radialCoefficient / (entry.shrinkageRadialPct / 3000), entry.slug).toBeGreaterThan(0.75);
      expect(entry.radialCoefficient / (entry.shrinkageRadialPct / 3000), entry.slug).toBeLessThan(1.25);
      checked++;
    }
    expect(checked).toBeGreaterThanOrEqual(10);
  });

  it("derived coefficients are shrinkage ÷ 30 % (common practice) and say so", () => {
    for (const entry of species.filter((candidate) => candidate.sources.coefficients.startsWith("derived"))) {
      expect(entry.tangentialCoefficient).toBeCloseTo(entry.shrinkageTangentialPct / 3000, 5);
      expect(entry.radialCoefficient).toBeCloseTo(entry.shrinkageRadialPct / 3000, 5);
    }
  });

  it("London plane is marked as a proxy of American sycamore", () => {
    const plane = speciesBySlug("london-plane");
    expect(plane.proxyForSlug).toBe("american-sycamore");
    expect(plane.source).toMatch(/American sycamore/);
  });
});
