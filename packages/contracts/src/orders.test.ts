import { describe, expect, it } from "vitest";
import { orderSlabSnapshotSchema } from "./orders.ts";

/** One slab of an order exactly as the API stored it before the snapshot had a schema of its own. */
const storedSnapshot = {
  id: "5d0c5a8e-1f2b-4c4e-9a57-3b1f0f2a9c11",
  logId: "0b6f3a2d-77e1-4d0b-8c9e-2f4d1e6a5b30",
  sequenceInLog: 3,
  speciesSlug: "black-walnut",
  lengthMm: 2200,
  thicknessMm: 55,
  widthStationsMm: [640, 620],
  liveEdge: "both",
  surfacing: "flattened",
  features: ["crotch"],
  defects: [],
  dryingMethod: "kiln",
  kilnCompletedOn: "2026-02-10",
  heatTreated: true,
  heatTreatmentTemperatureC: 60,
  heatTreatmentMinutes: 45,
  notes: "From the hospital expansion on Alder Row.",
  figures: {
    areaM2: 1.386,
    volumeM3: 0.07623,
    boardFeet: 32.3,
    averageWidthMm: 630,
    minWidthMm: 620,
    maxWidthMm: 640,
    weightKg: 48.1,
    weightLowKg: 44.2,
    weightHighKg: 52.9,
    weightAtMoisturePct: 8,
    heavyLift: true,
    handling: "two_people",
  },
  lastMoisturePct: 8,
  lastReadOn: "2026-03-01",
  dryingState: "ready",
  listingId: "9a1e7c44-2b3d-4f5a-8e6f-7a8b9c0d1e2f",
  createdAt: "2026-01-12T09:30:00.000Z",
};

describe("the order's slab snapshot", () => {
  it("reads a snapshot as the API stored it before the schema (old orders keep reading)", () => {
    expect(orderSlabSnapshotSchema.parse(storedSnapshot)).toEqual(storedSnapshot);
  });

  it("refuses a snapshot without its figures", () => {
    const { figures: _figures, ...withoutFigures } = storedSnapshot;
    expect(orderSlabSnapshotSchema.safeParse(withoutFigures).success).toBe(false);
  });
});
