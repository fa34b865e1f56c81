/**
 * Plausibility limits for slab inputs. Values outside them are typing mistakes
 * (a 40 m slab, a 2 m thick slab), not wood, and are rejected with a SlabMathError.
 * The limits are our own choice (common practice for what a band mill or a
 * chainsaw mill can produce), not a standard.
 */
export const LIMITS = Object.freeze({
  /** Longest slab accepted, mm (12 m: longer logs are not milled into furniture slabs). */
  maximumLengthMm: 12_000,
  /** Thickest slab accepted, mm (600 mm: cookies and counter blocks included). */
  maximumThicknessMm: 600,
  /** Widest slab accepted at any station, mm (3 m: the widest chainsaw-mill bars). */
  maximumWidthMm: 3_000,
  /** Most width stations accepted (one every 12 mm on a 12 m slab). */
  maximumStations: 1_000,
  /** Moisture content range accepted, % (oven-dry basis; green wood can exceed 100 %). */
  minimumMoisturePct: 0,
  maximumMoisturePct: 200,
  /** Basic specific gravity range accepted (balsa is ~0.15, lignum vitae ~1.05). */
  minimumSpecificGravity: 0.1,
  maximumSpecificGravity: 1.3,
  /** Air temperature range accepted for EMC, °C (Wood Handbook Table 4-2 spans −1.1 to 132 °C). */
  minimumTemperatureC: -30,
  maximumTemperatureC: 130,
  /** Largest volume accepted, m³ (12 m × 3 m × 0.6 m). */
  maximumVolumeM3: 21.6,
});
