/**
 * Distance over the Earth's surface, for "how far is this yard from me": the great circle on a
 * sphere of the IUGG mean radius, as the crow flies (roads are longer).
 */
import { SlabMathError } from "./errors.ts";

/** The Earth's mean radius, km (IUGG: R₁ = 6 371 008.8 m). */
export const EARTH_MEAN_RADIUS_KM = 6371.0088;

/** A position in decimal degrees (WGS 84). */
export interface Position {
  latitude: number;
  longitude: number;
}

function checkPosition(position: Position, field: string): void {
  const { latitude, longitude } = position ?? ({} as Position);
  if (!Number.isFinite(latitude) || latitude < -90 || latitude > 90) {
    throw new SlabMathError("out_of_range", `${field}.latitude`, `${field}.latitude must be between -90 and 90 degrees`);
  }
  if (!Number.isFinite(longitude) || longitude < -180 || longitude > 180) {
    throw new SlabMathError("out_of_range", `${field}.longitude`, `${field}.longitude must be between -180 and 180 degrees`);
  }
}

/** Great-circle distance between two positions, km (the haversine formula on the mean radius). */
export function greatCircleKm(from: Position, to: Position): number {
  checkPosition(from, "from");
  checkPosition(to, "to");
  const radians = Math.PI / 180;
  const halfLatitude = ((to.latitude - from.latitude) * radians) / 2;
  const halfLongitude = ((to.longitude - from.longitude) * radians) / 2;
  const a =
    Math.sin(halfLatitude) ** 2 + Math.cos(from.latitude * radians) * Math.cos(to.latitude * radians) * Math.sin(halfLongitude) ** 2;
  return EARTH_MEAN_RADIUS_KM * 2 * Math.asin(Math.min(1, Math.sqrt(a)));
}
