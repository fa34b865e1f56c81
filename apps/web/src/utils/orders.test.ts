import { describe, expect, it } from "vitest";
import type { Order, OrderSlabSnapshot } from "@grainyard/contracts";
import { pickupFacts, snapshotSlabs, worstHandling } from "./orders.ts";

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

describe("pickup facts, worded for the one reading them", () => {
  const base = {
    chosenPickupWindow: null,
    pickupWindows: [] as Order["pickupWindows"],
    pickupTimeZone: "America/Detroit",
    pickupAddress: null,
    parties: { buyerName: "Ana and Theo Brandt", yardName: null, pickupTown: "Lakemont" },
  };
  const windows = [{ startsAt: "2026-12-05T14:00:00.000Z", endsAt: "2026-12-05T16:00:00.000Z" }];

  it("tells the buyer to choose, never that someone waits for 'the buyer'", () => {
    const facts = pickupFacts({ ...base, viewerIs: "buyer", pickupWindows: windows });
    expect(facts.when).toBe("Choose one of the sawyer's times above.");
    expect(Object.values(facts).join(" ")).not.toMatch(/the buyer/i);
    expect(pickupFacts({ ...base, viewerIs: "buyer" }).when).toMatch(/The sawyer will propose times soon/);
  });

  it("tells the sawyer what they do and what they wait for, in the second person", () => {
    const facts = pickupFacts({ ...base, viewerIs: "sawyer" });
    expect(facts).toEqual({
      yard: "Your yard",
      where: "You give the address with the pickup times.",
      when: "Propose pickup times above.",
    });
    expect(pickupFacts({ ...base, viewerIs: "sawyer", pickupWindows: windows }).when).toBe(
      "Waiting for the buyer to choose one of your times.",
    );
  });

  it("gives a booked time in the yard's time zone, named, whatever the reader's clock", () => {
    // 14:00–16:00 UTC on 5 December is 9–11 am in US Eastern time (UTC−5 in winter, IANA tz database).
    for (const viewerIs of ["buyer", "sawyer", "other"] as const)
      expect(pickupFacts({ ...base, viewerIs, pickupWindows: windows, chosenPickupWindow: windows[0]! }).when).toBe(
        "Sat 5 Dec, 9–11 am, yard time (America/Detroit)",
      );
  });

  it("speaks of both in the third person to anyone else", () => {
    expect(pickupFacts({ ...base, viewerIs: "other", pickupWindows: windows }).when).toBe("The buyer has not chosen a time yet.");
    expect(pickupFacts({ ...base, viewerIs: "other" }).when).toBe("The sawyer has not proposed times yet.");
  });
});
