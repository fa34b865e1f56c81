import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { SlabEntity } from "../entities/index.ts";
import { createTestContext, type BrowserClient, type TestContext } from "../test-support/test-context.ts";

let ctx: TestContext;
let sawyer: BrowserClient & { account: { id: string } };
let otherSawyer: BrowserClient;
beforeAll(async () => {
  ctx = await createTestContext();
  sawyer = await ctx.signedInClient("sawyer");
  otherSawyer = await ctx.signedInClient("sawyer");
});
afterAll(async () => ctx?.close());

const logInput = {
  speciesSlug: "white-oak",
  siteTown: "Lakemont",
  siteNeighbourhood: "Harbour Hill",
  siteKind: "street",
  fellingReason: "storm",
  felledOn: "2024-03-02",
  milledOn: "2024-04-10",
  lengthMm: 3200,
  diameterMm: 760,
  notes: "Came down across Alder Row in the March windstorm.",
};

/** 12/4 × 12 in × 8 ft in millimetres: 76.2 × 304.8 × 2438.4 (1 in = 25.4 mm exactly). */
const twentyFourBoardFeet = { lengthMm: 2438, thicknessMm: 76, widthStationsMm: [305, 305, 305] };

function slabInput(overrides: Record<string, unknown> = {}) {
  return {
    speciesSlug: "white-oak",
    ...twentyFourBoardFeet,
    liveEdge: "both",
    surfacing: "rough_sawn",
    features: ["figure"],
    defects: [],
    dryingMethod: "air_then_kiln",
    kilnCompletedOn: "2025-09-01",
    heatTreated: true,
    heatTreatmentTemperatureC: 56,
    heatTreatmentMinutes: 30,
    ...overrides,
  };
}

describe("logs", () => {
  it("creates, lists, shows, changes and deletes a log of one's own", async () => {
    const created = await sawyer.post("/api/v1/yard/logs", logInput);
    expect(created.status).toBe(201);
    expect(created.body.log).toMatchObject({ speciesSlug: "white-oak", siteKind: "street", felledOn: "2024-03-02", slabCount: 0 });
    const id = created.body.log.id;
    expect((await sawyer.get("/api/v1/yard/logs")).body.logs.map((l: { id: string }) => l.id)).toContain(id);
    expect((await otherSawyer.get("/api/v1/yard/logs")).body.logs.map((l: { id: string }) => l.id)).not.toContain(id);
    const changed = await sawyer.patch(`/api/v1/yard/logs/${id}`, { siteNeighbourhood: "Old Mill" });
    expect(changed.status).toBe(200);
    expect(changed.body.log.siteNeighbourhood).toBe("Old Mill");
    expect(changed.body.log.notes).toBe(logInput.notes);
    expect((await otherSawyer.patch(`/api/v1/yard/logs/${id}`, { notes: "mine now" })).status).toBe(403);
    expect((await sawyer.delete(`/api/v1/yard/logs/${id}`)).status).toBe(204);
    expect((await sawyer.get(`/api/v1/yard/logs/${id}`)).status).toBe(404);
  });

  it("refuses an unknown species, a mill date before the felling, and a log with slabs cannot be deleted", async () => {
    const unknown = await sawyer.post("/api/v1/yard/logs", { ...logInput, speciesSlug: "unobtainium" });
    expect(unknown.status).toBe(422);
    expect(unknown.body.error.fields.speciesSlug).toBeTruthy();
    const backwards = await sawyer.post("/api/v1/yard/logs", { ...logInput, milledOn: "2023-01-01" });
    expect(backwards.status).toBe(422);
    expect(backwards.body.error.fields.milledOn).toMatch(/after/);
    const log = (await sawyer.post("/api/v1/yard/logs", logInput)).body.log;
    await sawyer.post("/api/v1/yard/slabs", slabInput({ logId: log.id, sequenceInLog: 1 }));
    const refused = await sawyer.delete(`/api/v1/yard/logs/${log.id}`);
    expect(refused.status).toBe(409);
    expect(refused.body.error.code).toBe("log_has_slabs");
  });

  it("refuses felling and milling dates in the future (a new log and a change alike), and takes today", async () => {
    const before = (await sawyer.get("/api/v1/yard/logs")).body.logs.length;
    for (const dates of [{ felledOn: "9999-12-31" }, { milledOn: "9999-12-31" }, { felledOn: "2024-03-02", milledOn: "2999-01-01" }]) {
      const res = await sawyer.post("/api/v1/yard/logs", { ...logInput, ...dates });
      expect(res.status, JSON.stringify(dates)).toBe(422);
      expect(Object.values(res.body.error.fields).join(" ")).toMatch(/cannot be in the future/);
    }
    expect((await sawyer.get("/api/v1/yard/logs")).body.logs.length).toBe(before);
    const log = (await sawyer.post("/api/v1/yard/logs", { ...logInput, felledOn: "2024-03-02" })).body.log;
    const later = await sawyer.patch(`/api/v1/yard/logs/${log.id}`, { felledOn: "9999-12-31" });
    expect(later.status).toBe(422);
    expect(later.body.error.fields.felledOn).toMatch(/future/);
    expect((await sawyer.get(`/api/v1/yard/logs/${log.id}`)).body.log.felledOn).toBe("2024-03-02");
    const today = new Date().toISOString().slice(0, 10);
    expect((await sawyer.patch(`/api/v1/yard/logs/${log.id}`, { milledOn: today })).status).toBe(200);
  });
});

describe("slabs and their figures", () => {
  it("computes board feet on the server: a 12/4 × 12 in × 8 ft board is 24 bf (NHLA rule: 1 bf = 144 in³)", async () => {
    const res = await sawyer.post("/api/v1/yard/slabs", { ...slabInput(), figures: { boardFeet: 999, weightKg: 1 } });
    expect(res.status).toBe(201);
    // 2438 × 76 × 305 mm = 0.0565 m³; 24 bf = 0.0566 m³; whole-mm rounding costs under 0.3 %.
    expect(res.body.slab.figures.boardFeet).toBeCloseTo(24, 0);
    expect(Math.abs(res.body.slab.figures.boardFeet - 24) / 24).toBeLessThan(0.003);
    // The client's figures were ignored.
    const stored = await ctx.dataSource.getRepository(SlabEntity).findOneByOrFail({ id: res.body.slab.id });
    expect(stored.boardFeet).not.toBe(999);
    expect(stored.weightKg).not.toBe(1);
  });

  it("keeps measurements as entered: 2¼″ × 25″ × 96½″ stays 57.15 × 635 × 2451.1 mm and is the hand figure, 37.7 bf, priced like it", async () => {
    // Hand calculation (NHLA rule, 1 bf = 144 in³): 2.25 × 25 × 96.5 / 144 = 37.6953 bf; at $28.00/bf that is $1,055.47.
    // 1 in = 25.4 mm exactly (NIST SP 811, B.8), so the entry in millimetres is 57.15, 635 and 2451.1.
    const res = await sawyer.post("/api/v1/yard/slabs", slabInput({ thicknessMm: 57.15, lengthMm: 2451.1, widthStationsMm: [635, 635] }));
    expect(res.status).toBe(201);
    expect(res.body.slab).toMatchObject({ thicknessMm: 57.15, lengthMm: 2451.1, widthStationsMm: [635, 635] });
    expect(res.body.slab.figures.boardFeet).toBeCloseTo((2.25 * 25 * 96.5) / 144, 6);
    expect(res.body.slab.figures.boardFeet.toFixed(1)).toBe("37.7");
    // Read back from MariaDB, not only from the answer.
    const stored = await ctx.dataSource.getRepository(SlabEntity).findOneByOrFail({ id: res.body.slab.id });
    expect([stored.thicknessMm, stored.lengthMm]).toEqual([57.15, 2451.1]);
    expect((await sawyer.get(`/api/v1/yard/slabs/${res.body.slab.id}`)).body.slab.thicknessMm).toBe(57.15);
    const listing = await sawyer.post("/api/v1/yard/listings", {
      title: "Hand-checked white oak",
      slabIds: [res.body.slab.id],
      priceMode: "per_board_foot",
      rateMinor: 2_800,
    });
    expect(listing.status).toBe(201);
    expect(listing.body.listing.figures.priceMinor).toBe(105_547);
    // The slab page (slabs read through the listing's relation) answers the same numbers.
    const page = await sawyer.get(`/api/v1/catalogue/${listing.body.listing.id}`);
    expect(page.status).toBe(200);
    expect(page.body.slabs[0]).toMatchObject({ thicknessMm: 57.15, lengthMm: 2451.1 });
  });

  it("weighs white oak at 12 % MC like the Wood Handbook's density (Table 5-3a: SG 0.68 at 12 %), within 5 %", async () => {
    const res = await sawyer.post("/api/v1/yard/slabs", slabInput());
    const { figures } = res.body.slab;
    // ρ₁₂ = 1000 × 0.68 × 1.12 = 761.6 kg/m³ (FPL-GTR-190 ch. 4, density = SG × (1 + M/100) × ρ_water)
    const expectedKg = figures.volumeM3 * 761.6;
    expect(Math.abs(figures.weightKg - expectedKg) / expectedKg).toBeLessThan(0.05);
    expect(figures.weightAtMoisturePct).toBe(12);
    expect(figures.weightLowKg).toBeLessThan(figures.weightKg);
    expect(figures.weightHighKg).toBeGreaterThan(figures.weightKg);
    // About 43 kg (high end about 48 kg): above the NIOSH 23 kg load constant, never a one-person lift.
    expect(figures.heavyLift).toBe(true);
    expect(figures.handling).not.toBe("one_person");
  });

  it("refuses impossible measurements with a message on the field, and saves nothing", async () => {
    const before = await ctx.dataSource.getRepository(SlabEntity).countBy({ sawyerId: sawyer.account.id });
    const long = await sawyer.post("/api/v1/yard/slabs", slabInput({ lengthMm: 40_000 }));
    expect(long.status).toBe(422);
    expect(long.body.error.fields.lengthMm).toMatch(/at most 12000 mm/);
    const oneStation = await sawyer.post("/api/v1/yard/slabs", slabInput({ widthStationsMm: [600] }));
    expect(oneStation.status).toBe(422);
    expect(oneStation.body.error.fields.widthStationsMm).toMatch(/two or more/);
    const negative = await sawyer.post("/api/v1/yard/slabs", slabInput({ thicknessMm: -5 }));
    expect(negative.body.error.fields.thicknessMm).toBeTruthy();
    const text = await sawyer.post("/api/v1/yard/slabs", slabInput({ widthStationsMm: [600, "wide"] }));
    expect(text.status).toBe(422);
    const noHeat = await sawyer.post("/api/v1/yard/slabs", slabInput({ heatTreatmentMinutes: null }));
    expect(noHeat.body.error.fields.heatTreatmentTemperatureC).toMatch(/ISPM 15/);
    expect(await ctx.dataSource.getRepository(SlabEntity).countBy({ sawyerId: sawyer.account.id })).toBe(before);
  });

  it("keeps sequence numbers unique within a log and refuses another sawyer's log", async () => {
    const log = (await sawyer.post("/api/v1/yard/logs", logInput)).body.log;
    expect((await sawyer.post("/api/v1/yard/slabs", slabInput({ logId: log.id, sequenceInLog: 1 }))).status).toBe(201);
    const clash = await sawyer.post("/api/v1/yard/slabs", slabInput({ logId: log.id, sequenceInLog: 1 }));
    expect(clash.status).toBe(422);
    expect(clash.body.error.fields.sequenceInLog).toBeTruthy();
    expect((await otherSawyer.post("/api/v1/yard/slabs", slabInput({ logId: log.id, sequenceInLog: 2 }))).status).toBe(403);
    const detail = await sawyer.get(`/api/v1/yard/logs/${log.id}`);
    expect(detail.body.slabs.map((s: { sequenceInLog: number }) => s.sequenceInLog)).toEqual([1]);
  });

  it("recomputes figures when measurements change, and only the owner can see or change a slab", async () => {
    const slab = (await sawyer.post("/api/v1/yard/slabs", slabInput())).body.slab;
    const changed = await sawyer.patch(`/api/v1/yard/slabs/${slab.id}`, { thicknessMm: 152 });
    expect(changed.status).toBe(200);
    expect(changed.body.slab.figures.boardFeet / slab.figures.boardFeet).toBeCloseTo(2, 1);
    expect((await otherSawyer.get(`/api/v1/yard/slabs/${slab.id}`)).status).toBe(403);
    expect((await otherSawyer.patch(`/api/v1/yard/slabs/${slab.id}`, { thicknessMm: 10 })).status).toBe(403);
    expect((await otherSawyer.delete(`/api/v1/yard/slabs/${slab.id}`)).status).toBe(403);
    expect((await sawyer.delete(`/api/v1/yard/slabs/${slab.id}`)).status).toBe(204);
  });
});

describe("moisture readings", () => {
  it("tracks the last reading, weighs the slab at it, projects drying and says when it is ready", async () => {
    const slab = (await sawyer.post("/api/v1/yard/slabs", slabInput({ dryingMethod: "air", kilnCompletedOn: null }))).body.slab;
    const readings = [
      { readOn: "2025-01-10", moistureContentPct: 38, method: "pin_meter" },
      { readOn: "2025-04-10", moistureContentPct: 27, method: "pin_meter" },
      { readOn: "2025-07-10", moistureContentPct: 20, method: "pinless_meter" },
    ];
    for (const reading of readings) expect((await sawyer.post(`/api/v1/yard/slabs/${slab.id}/readings`, reading)).status).toBe(201);
    const drying = await sawyer.get(`/api/v1/yard/slabs/${slab.id}`);
    expect(drying.body.readings.map((r: { moistureContentPct: number }) => r.moistureContentPct)).toEqual([38, 27, 20]);
    expect(drying.body.slab.lastMoisturePct).toBe(20);
    expect(drying.body.slab.dryingState).toBe("drying");
    expect(drying.body.projection.status).toBe("projected");
    expect(drying.body.projection.projectedDate > "2025-07-10").toBe(true);
    // Wetter wood is heavier: at 20 % the slab weighs more than at the 12 % assumed without readings.
    expect(drying.body.slab.figures.weightKg).toBeGreaterThan(slab.figures.weightKg);
    expect(drying.body.slab.figures.weightAtMoisturePct).toBe(20);

    const inBand = await sawyer.post(`/api/v1/yard/slabs/${slab.id}/readings`, {
      readOn: "2025-10-01",
      moistureContentPct: 8.5,
      method: "oven_dry",
    });
    const ready = await sawyer.get(`/api/v1/yard/slabs/${slab.id}`);
    expect(ready.body.slab.dryingState).toBe("ready");
    expect(ready.body.projection.status).toBe("ready");

    // Deleting the newest reading steps back to the one before.
    expect((await otherSawyer.delete(`/api/v1/yard/readings/${inBand.body.reading.id}`)).status).toBe(403);
    expect((await sawyer.delete(`/api/v1/yard/readings/${inBand.body.reading.id}`)).status).toBe(204);
    expect((await sawyer.get(`/api/v1/yard/slabs/${slab.id}`)).body.slab.lastMoisturePct).toBe(20);
  });

  it("says so when there are too few readings, and refuses impossible readings", async () => {
    const slab = (await sawyer.post("/api/v1/yard/slabs", slabInput())).body.slab;
    await sawyer.post(`/api/v1/yard/slabs/${slab.id}/readings`, { readOn: "2025-01-10", moistureContentPct: 30, method: "pin_meter" });
    expect((await sawyer.get(`/api/v1/yard/slabs/${slab.id}`)).body.projection.status).toBe("not_enough_readings");
    const bad = await sawyer.post(`/api/v1/yard/slabs/${slab.id}/readings`, {
      readOn: "10/01/2025",
      moistureContentPct: -4,
      method: "guess",
    });
    expect(bad.status).toBe(422);
    expect(Object.keys(bad.body.error.fields).sort()).toEqual(["method", "moistureContentPct", "readOn"]);
    const ahead = await sawyer.post(`/api/v1/yard/slabs/${slab.id}/readings`, {
      readOn: "2999-06-01",
      moistureContentPct: 12,
      method: "pin_meter",
    });
    expect(ahead.status).toBe(422);
    expect(ahead.body.error.fields.readOn).toMatch(/future/);
  });

  it("records one reading for every slab of a log at once", async () => {
    const log = (await sawyer.post("/api/v1/yard/logs", logInput)).body.log;
    for (const n of [1, 2, 3]) await sawyer.post("/api/v1/yard/slabs", slabInput({ logId: log.id, sequenceInLog: n }));
    const res = await sawyer.post(`/api/v1/yard/logs/${log.id}/readings`, {
      readOn: "2025-05-01",
      moistureContentPct: 14,
      method: "pin_meter",
    });
    expect(res.status).toBe(201);
    expect(res.body.count).toBe(3);
    const detail = await sawyer.get(`/api/v1/yard/logs/${log.id}`);
    expect(detail.body.slabs.every((s: { lastMoisturePct: number }) => s.lastMoisturePct === 14)).toBe(true);
  });
});

describe("inventory CSV", () => {
  it("exports the yard's slabs and imports rows back as new slabs with figures recomputed", async () => {
    const fresh = await ctx.signedInClient("sawyer");
    await fresh.post("/api/v1/yard/slabs", slabInput({ notes: 'Has a "tight" knot, near one end' }));
    const exported = await fresh.get("/api/v1/yard/slabs.csv");
    expect(exported.status).toBe(200);
    expect(exported.headers["content-type"]).toMatch(/text\/csv/);
    const text = exported.text;
    expect(text.split("\n")[0]).toContain("width_stations_mm");
    expect(text).toContain('"Has a ""tight"" knot, near one end"');
    const imported = await fresh.agent
      .post("/api/v1/yard/slabs/import")
      .set("x-csrf-token", fresh.csrfToken)
      .set("content-type", "text/csv")
      .send(text);
    expect(imported.status).toBe(201);
    expect(imported.body.created).toBe(1);
    const slabs = (await fresh.get("/api/v1/yard/slabs")).body.slabs;
    expect(slabs).toHaveLength(2);
    expect(slabs[0].figures.boardFeet).toBeCloseTo(slabs[1].figures.boardFeet, 6);
  });

  it("reports every bad row and field and saves nothing", async () => {
    const fresh = await ctx.signedInClient("sawyer");
    const csv = [
      "species,length_mm,thickness_mm,width_stations_mm,live_edge,surfacing,drying_method,features",
      "black-walnut,2400,60,610;590;570,both,flattened,kiln,crotch",
      "unobtainium,2400,60,610;590,both,flattened,kiln,",
      "black-walnut,40000,60,610,one,sanded,air,",
      "red-maple,2100,55,500;480,none,rough_sawn,air,glitter",
    ].join("\n");
    const res = await fresh.agent
      .post("/api/v1/yard/slabs/import")
      .set("x-csrf-token", fresh.csrfToken)
      .set("content-type", "text/csv")
      .send(csv);
    expect(res.status).toBe(422);
    expect(res.body.error.code).toBe("csv_rows_invalid");
    expect(res.body.error.message).toMatch(/nothing was saved/);
    const rows = res.body.error.rows as { row: number; field: string }[];
    expect(rows).toEqual(
      expect.arrayContaining([
        expect.objectContaining({ row: 3, field: "species" }),
        expect.objectContaining({ row: 4, field: "length_mm" }),
        expect.objectContaining({ row: 4, field: "width_stations_mm" }),
        expect.objectContaining({ row: 5, field: "features" }),
      ]),
    );
    expect(rows.some((r) => r.row === 2)).toBe(false);
    expect((await fresh.get("/api/v1/yard/slabs")).body.slabs).toHaveLength(0);
    const header = await fresh.agent
      .post("/api/v1/yard/slabs/import")
      .set("x-csrf-token", fresh.csrfToken)
      .set("content-type", "text/csv")
      .send("name,colour\noak,brown\n");
    expect(header.status).toBe(422);
    expect(header.body.error.code).toBe("csv_columns_missing");
  });
});
