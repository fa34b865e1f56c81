import convert from "convert-units";
import Qty from "js-quantities";
import { describe, expect, it } from "vitest";
import { SlabMathError } from "./errors.ts";
import {
  boardFeetToCubicMetres,
  celsiusToFahrenheit,
  cubicMetresToBoardFeet,
  fahrenheitToCelsius,
  feetAndInchesToMillimetres,
  formatFeetAndInches,
  formatInches,
  formatMetresAsFeetAndInches,
  inchesToFraction,
  inchesToMillimetres,
  kilogramsToPounds,
  millimetresToInches,
  parseInches,
  poundsToKilograms,
} from "./units.ts";

describe("conversions cross-checked against js-quantities and convert-units", () => {
  it("mm ↔ in (js-quantities exact; convert-units to 1e-6)", () => {
    for (const inches of [1, 2.0625, 12, 36.5]) {
      expect(inchesToMillimetres(inches)).toBeCloseTo(Qty(`${inches} in`).to("mm").scalar, 9);
      expect(inchesToMillimetres(inches) / convert(inches).from("in").to("mm")).toBeCloseTo(1, 6);
    }
    expect(millimetresToInches(52.4)).toBeCloseTo(Qty("52.4 mm").to("in").scalar, 12);
  });
  it("kg ↔ lb", () => {
    for (const kg of [1, 23, 100, 456.7]) {
      expect(kilogramsToPounds(kg)).toBeCloseTo(Qty(`${kg} kg`).to("lb").scalar, 9);
      expect(kilogramsToPounds(kg) / convert(kg).from("kg").to("lb")).toBeCloseTo(1, 5);
    }
    // NIOSH load constant: 23 kg ≈ 51 lb
    expect(Math.round(kilogramsToPounds(23))).toBe(51);
    expect(poundsToKilograms(51)).toBeCloseTo(Qty("51 lb").to("kg").scalar, 9);
  });
  it("m³ ↔ board feet via ft³ (1 ft³ = 12 bf of 144 in³)", () => {
    for (const cubicMetres of [0.002359737216, 0.1, 1]) {
      expect(cubicMetresToBoardFeet(cubicMetres)).toBeCloseTo(Qty(`${cubicMetres} m^3`).to("ft^3").scalar * 12, 9);
      expect(cubicMetresToBoardFeet(cubicMetres) / (convert(cubicMetres).from("m3").to("ft3") * 12)).toBeCloseTo(1, 5);
    }
    expect(boardFeetToCubicMetres(1)).toBeCloseTo(Qty("144 in^3").to("m^3").scalar, 15);
  });
  it("°C ↔ °F", () => {
    expect(celsiusToFahrenheit(21.1)).toBeCloseTo(convert(21.1).from("C").to("F"), 9);
    expect(fahrenheitToCelsius(70)).toBeCloseTo(convert(70).from("F").to("C"), 9);
  });
});

describe("formatInches — nearest 1/16″, reduced (inch = 25.4 mm exactly)", () => {
  const cases: [number, string][] = [
    [52.4, "2 1/16″"], // 2.0630 in → 33/16 → 2 1/16
    [25.4, "1″"],
    [12.7, "1/2″"], // 8/16 reduces to 1/2
    [6.35, "1/4″"],
    [19.05, "3/4″"],
    [76.2, "3″"],
    [101.5, "4″"], // 3.9961 in rounds up to 64/16 and carries
    [0, "0″"],
    [44.45, "1 3/4″"],
    [39.6875, "1 9/16″"],
  ];
  for (const [millimetres, expected] of cases) {
    it(`${millimetres} mm → ${expected}`, () => expect(formatInches(millimetres)).toBe(expected));
  }
  // 52.4 mm = 2.06299 in; × 8 = 16.504 → 17 eighths = 2 1/8
  it("an eighth-inch denominator", () => expect(formatInches(52.4, 8)).toBe("2 1/8″"));
  it("fraction parts are reduced", () => {
    expect(inchesToFraction(2.125)).toEqual({ whole: 2, numerator: 1, denominator: 8 });
  });
  it("rejects negative lengths", () => expect(() => formatInches(-1)).toThrow(SlabMathError));
});

describe("feet and inches", () => {
  it("m → ft-in", () => {
    expect(formatFeetAndInches(2438.4)).toBe("8′ 0″"); // 96 in
    expect(formatFeetAndInches(2197.1)).toBe("7′ 2 1/2″"); // 86.5 in
    expect(formatMetresAsFeetAndInches(3.6576)).toBe("12′ 0″");
    expect(formatFeetAndInches(3657)).toBe("12′ 0″"); // 143.98 in rounds to 144 and carries into feet
  });
  it("ft-in → mm agrees with js-quantities", () => {
    expect(feetAndInchesToMillimetres(7, 2.5)).toBeCloseTo(Qty("7 ft").to("mm").scalar + Qty("2.5 in").to("mm").scalar, 9);
  });
});

describe("parseInches", () => {
  const reference = Qty("2.0625 in").to("mm").scalar;
  for (const text of ["2 1/16", "2.0625", "2-1/16", "2 1/16″", '2 1/16"', "2.0625 in", " 2 1/16 inches "]) {
    it(`"${text}" → 52.3875 mm`, () => expect(parseInches(text)).toBeCloseTo(reference, 9));
  }
  it("a bare fraction", () => expect(parseInches("1/2")).toBeCloseTo(12.7, 9));
  it("round trip with formatInches", () => expect(formatInches(parseInches("3 5/8"))).toBe("3 5/8″"));
  for (const text of ["", "two", "2 1/0", "1.5 1/2", "-2", "2/"]) {
    it(`rejects "${text}"`, () => {
      expect(() => parseInches(text)).toThrow(SlabMathError);
    });
  }
});
