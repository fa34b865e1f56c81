import { getDistance } from "geolib";
import { describe, expect, it } from "vitest";
import { EARTH_MEAN_RADIUS_KM, greatCircleKm } from "./geodesy.ts";

const nashvilleAirport = { latitude: 36.12, longitude: -86.67 };
const losAngelesAirport = { latitude: 33.94, longitude: -118.4 };

describe("great-circle distance", () => {
  it('matches the haversine worked example BNA → LAX (Rosetta Code, "Haversine formula": 2886.444 km at R = 6371.0 km)', () => {
    // Scaled to the IUGG mean radius we use (distance is proportional to the radius).
    expect(greatCircleKm(nashvilleAirport, losAngelesAirport)).toBeCloseTo(2886.444442838 * (EARTH_MEAN_RADIUS_KM / 6371.0), 6);
  });

  it("agrees with geolib (reference library, law of cosines on a 6 378 137 m sphere) once the radii are matched", () => {
    const pairs = [
      [
        { latitude: 44.618, longitude: -85.402 },
        { latitude: 44.742, longitude: -85.377 },
      ], // a short hop between two demo towns
      [
        { latitude: 41.88, longitude: -87.63 },
        { latitude: 43.65, longitude: -79.38 },
      ],
      [
        { latitude: 49.28, longitude: -123.12 },
        { latitude: 25.76, longitude: -80.19 },
      ],
    ] as const;
    for (const [a, b] of pairs) {
      const geolibKm = (getDistance(a, b, 0.001) / 1000) * (EARTH_MEAN_RADIUS_KM / 6378.137);
      expect(Math.abs(greatCircleKm(a, b) - geolibKm)).toBeLessThan(0.001);
    }
  });

  it("is zero from a place to itself, the same both ways, and refuses impossible positions", () => {
    expect(greatCircleKm(nashvilleAirport, nashvilleAirport)).toBe(0);
    expect(greatCircleKm(losAngelesAirport, nashvilleAirport)).toBe(greatCircleKm(nashvilleAirport, losAngelesAirport));
    expect(() => greatCircleKm({ latitude: 91, longitude: 0 }, nashvilleAirport)).toThrow(/latitude/);
    expect(() => greatCircleKm(nashvilleAirport, { latitude: 0, longitude: Number.NaN })).toThrow(/longitude/);
  });
});
