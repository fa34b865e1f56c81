import Qty from "js-quantities";
import { describe, expect, it } from "vitest";
import { SlabMathError } from "./errors.ts";
import { slabGeometry } from "./geometry.ts";
import { NIOSH_LOAD_CONSTANT_KG, handlingAdvice, setWeight, slabWeight } from "./weight.ts";

describe("slabWeight", () => {
  it('white ash at 12 % MC weighs about 42 lb per ft³ (published lumber weight table, surveyorslexicon.com "Ash, White")', () => {
    const oneCubicFootInM3 = Qty("1 ft^3").to("m^3").scalar;
    const result = slabWeight({ volumeM3: oneCubicFootInM3, speciesSlug: "white-ash", moistureContentPct: 12 });
    const pounds = Qty(`${result.kg} kg`).to("lb").scalar;
    expect(Math.abs(pounds - 42) / 42).toBeLessThan(0.05);
  });

  it("1 m³ of white oak at 12 % against Wood Handbook Table 5-3a SG12 0.68: within 5 % of 1000 × 0.68 × 1.12 = 761.6 kg", () => {
    const result = slabWeight({ volumeM3: 1, speciesSlug: "white-oak", moistureContentPct: 12 });
    expect(Math.abs(result.kg - 761.6) / 761.6).toBeLessThan(0.05);
  });

  it("range is ±10 % by default (common practice for within-species spread)", () => {
    const result = slabWeight({ volumeM3: 0.1, basicSpecificGravity: 0.5, moistureContentPct: 8 });
    expect(result.lowKg / result.kg).toBeCloseTo(0.9, 12);
    expect(result.highKg / result.kg).toBeCloseTo(1.1, 12);
    const narrow = slabWeight({ volumeM3: 0.1, basicSpecificGravity: 0.5, moistureContentPct: 8, variationFraction: 0.05 });
    expect(narrow.highKg / narrow.kg).toBeCloseTo(1.05, 12);
  });

  it("a 3 in × 36 in × 9 ft black walnut slab at 8 % is well over 100 kg and needs mechanical aid", () => {
    // 0.0762 m × 0.9144 m × 2.7432 m = 0.1911 m³; walnut at 8 % ≈ 600 kg/m³ → ≈ 115 kg
    const geometry = slabGeometry({ lengthMm: 2743.2, thicknessMm: 76.2, widthStationsMm: [914.4, 914.4] });
    const result = slabWeight({ volumeM3: geometry.volumeM3, speciesSlug: "black-walnut", moistureContentPct: 8 });
    expect(result.kg).toBeGreaterThan(100);
    expect(result.heavyLift).toBe(true);
    expect(result.handling).toBe("mechanical_aid");
  });

  it("heavy-lift flag at the NIOSH lifting-equation load constant, 23 kg (51 lb), judged on the high end", () => {
    expect(NIOSH_LOAD_CONSTANT_KG).toBe(23);
    expect(Math.round(Qty("23 kg").to("lb").scalar)).toBe(51);
    // density 1000 × 0.5 × 1.0 = 500 kg/m³ at MC ≥ 30 % (green volume, no shrinkage)
    const justUnder = slabWeight({ volumeM3: 23 / 1.1 / 500 / 1.3 - 1e-6, basicSpecificGravity: 0.5, moistureContentPct: 30 });
    expect(justUnder.highKg).toBeLessThan(23);
    expect(justUnder.heavyLift).toBe(false);
    expect(justUnder.handling).toBe("one_person");
    const over = slabWeight({ volumeM3: 0.04, basicSpecificGravity: 0.5, moistureContentPct: 30 });
    // 0.04 × 650 = 26 kg
    expect(over.kg).toBeCloseTo(26, 9);
    expect(over.heavyLift).toBe(true);
    expect(over.handling).toBe("two_people");
  });

  it("handling advice bands (common practice: two lifters up to 2 × 23 kg)", () => {
    expect(handlingAdvice(23)).toBe("one_person");
    expect(handlingAdvice(23.01)).toBe("two_people");
    expect(handlingAdvice(46)).toBe("two_people");
    expect(handlingAdvice(46.01)).toBe("mechanical_aid");
  });

  it("rejects invalid input", () => {
    expect(() => slabWeight({ volumeM3: -1, speciesSlug: "white-oak", moistureContentPct: 8 })).toThrow(/volumeM3/);
    expect(() => slabWeight({ volumeM3: 0.1, speciesSlug: "nope", moistureContentPct: 8 })).toThrow(SlabMathError);
    expect(() => slabWeight({ volumeM3: 0.1, speciesSlug: "white-oak", moistureContentPct: 300 })).toThrow(/moistureContentPct/);
    expect(() => slabWeight({ volumeM3: 0.1, moistureContentPct: 8 } as never)).toThrow(/speciesSlug/);
  });
});

describe("setWeight", () => {
  // A bookmatched pair and a thin offcut of white oak at 8 % MC; each slab from slabWeight (Wood Handbook densities, see above).
  const slab = (lengthMm: number, thicknessMm: number, widthMm: number) =>
    slabWeight({
      volumeM3: slabGeometry({ lengthMm, thicknessMm, widthStationsMm: [widthMm, widthMm] }).volumeM3,
      speciesSlug: "white-oak",
      moistureContentPct: 8,
    });
  const heavy = slab(2400, 76, 700);
  const light = slab(600, 25, 150);

  it("sums each end of the range over the slabs (mass is additive: low with low, high with high)", () => {
    const set = setWeight([heavy, light]);
    expect(set.totalKg).toBeCloseTo(heavy.kg + light.kg, 9);
    expect(set.totalLowKg).toBeCloseTo(heavy.lowKg + light.lowKg, 9);
    expect(set.totalHighKg).toBeCloseTo(heavy.highKg + light.highKg, 9);
    expect(set.heaviestSlabKg).toBe(heavy.kg);
    expect(set.heaviestSlabHighKg).toBe(heavy.highKg);
  });

  it("never shows a set's total below its heaviest slab: the high ends are compared, not the central total with a high end", () => {
    // The audit's card: the central total (heavy + light) is below the heaviest slab's high end
    // (1.1 × heavy) when the light slab weighs less than a tenth of the heavy one.
    expect(heavy.kg + light.kg).toBeLessThan(heavy.highKg);
    const set = setWeight([light, heavy]);
    expect(set.totalHighKg).toBeGreaterThanOrEqual(set.heaviestSlabHighKg);
    expect(set.totalKg).toBeGreaterThanOrEqual(set.heaviestSlabKg);
  });

  it("judges the lifting advice on the heaviest single slab, not on the set (slabs are lifted one at a time)", () => {
    const pair = setWeight([slab(1800, 40, 300), slab(1800, 40, 300)]);
    expect(pair.heaviestSlabHighKg).toBeLessThan(NIOSH_LOAD_CONSTANT_KG);
    expect(pair.totalHighKg).toBeGreaterThan(NIOSH_LOAD_CONSTANT_KG);
    expect(pair.handling).toBe("one_person");
    expect(pair.heavyLift).toBe(false);
    expect(setWeight([heavy]).handling).toBe("mechanical_aid");
  });

  it("is one slab's own range for a single slab, and refuses an empty set or a range that does not hold its centre", () => {
    expect(setWeight([light])).toMatchObject({ totalKg: light.kg, totalHighKg: light.highKg, heaviestSlabHighKg: light.highKg });
    expect(() => setWeight([])).toThrow(SlabMathError);
    expect(() => setWeight([{ kg: 10, lowKg: 11, highKg: 12 }])).toThrow(/lowKg/);
    expect(() => setWeight([{ kg: 10, lowKg: 9, highKg: 9.5 }])).toThrow(/highKg/);
  });
});
