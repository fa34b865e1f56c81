import { describe, expect, it } from "vitest";
import type { Order, OrderSlabSnapshot } from "@grainyard/contracts";
import { snapshotSlabs, worstHandling } from "./orders.ts";

const slab = (over: Partial<OrderSlabSnapshot> & { handling?: OrderSlabSnapshot["figures"]["handling"] }): OrderSlabSnapshot => ({
  id: over.id ?? "slab-1",
  logId: null,
  sequenceInLog: over.sequenceInLog ?? null,
  speciesSlug: over.speciesSlug ?? "black-walnut",
  lengthMm: 2200,
  thicknessMm: 55,
  widthStationsMm: [640, 620],
  liveEdge: "both",
  surfacing: "flattened",
  features: [],
  defects: [],
  dryingMethod: "kiln",
  kilnCompletedOn: null,
  heatTreated: false,
  heatTreatmentTemperatureC: null,
  heatTreatmentMinutes: null,
  notes: "",
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
    handling: over.handling ?? "two_people",
  },
  lastMoisturePct: 8,
  lastReadOn: null,
  dryingState: "ready",
  listingId: null,
  createdAt: "2026-01-12T09:30:00.000Z",
});

describe("snapshotSlabs", () => {
  it("reads the order's typed snapshot: the slab's size, figures and species name", () => {
    const order = { slabs: [slab({ sequenceInLog: 3 }), slab({ id: "slab-2", speciesSlug: "", handling: "mechanical_aid" })] } as Pick<
      Order,
      "slabs"
    >;
    const slabs = snapshotSlabs(order);
    expect(slabs[0]).toMatchObject({
      id: "slab-1",
      sequenceInLog: 3,
      lengthMm: 2200,
      averageWidthMm: 630,
      boardFeet: 32.3,
      weightHighKg: 52.9,
    });
    expect(slabs[0]!.species).toBe("Black walnut");
    expect(slabs[1]!.species).toBe("Slab");
    expect(worstHandling(slabs)).toBe("mechanical_aid");
  });
});
