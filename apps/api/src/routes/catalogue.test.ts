import { gluedTableFit, tableFit, topLengthForSeats } from "@grainyard/slab-math";
import { getDistance } from "geolib";
import sharp from "sharp";
import request from "supertest";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { createTestContext, type BrowserClient, type TestContext } from "../test-support/test-context.ts";

let ctx: TestContext;
let admin: BrowserClient;
let photo: Buffer;
const listings: Record<string, string> = {};

async function sawyerIn(town: string) {
  const sawyer = await ctx.signedInClient("sawyer");
  const res = await sawyer.patch(`/api/v1/yards/${sawyer.account.id}`, { pickupTown: town });
  if (res.status !== 200) throw new Error(JSON.stringify(res.body));
  return sawyer;
}

async function liveListing(
  sawyer: BrowserClient,
  name: string,
  slabs: Record<string, unknown>[],
  listing: Record<string, unknown>,
  readings: number[] = [],
) {
  const log = (
    await sawyer.post("/api/v1/yard/logs", {
      speciesSlug: slabs[0]!.speciesSlug,
      siteTown: "Lakemont",
      siteKind: "street",
      fellingReason: "storm",
      notes: `The ${name} tree.`,
    })
  ).body.log;
  const slabIds: string[] = [];
  for (const [index, slab] of slabs.entries()) {
    const created = await sawyer.post("/api/v1/yard/slabs", {
      logId: log.id,
      sequenceInLog: index + 1,
      liveEdge: "both",
      surfacing: "flattened",
      dryingMethod: "kiln",
      ...slab,
    });
    if (created.status !== 201) throw new Error(JSON.stringify(created.body));
    for (const [day, mc] of readings.entries())
      await sawyer.post(`/api/v1/yard/slabs/${created.body.slab.id}/readings`, {
        readOn: `2025-0${day + 1}-01`,
        moistureContentPct: mc,
        method: "pin_meter",
      });
    slabIds.push(created.body.slab.id);
  }
  const made = await sawyer.post("/api/v1/yard/listings", { title: name, slabIds, priceMode: "fixed", rateMinor: 50_000, ...listing });
  if (made.status !== 201) throw new Error(JSON.stringify(made.body));
  const id = made.body.listing.id;
  const uploaded = await sawyer.agent
    .post(`/api/v1/yard/listings/${id}/photos?altText=${encodeURIComponent(name)}`)
    .set("x-csrf-token", sawyer.csrfToken)
    .set("content-type", "image/jpeg")
    .send(photo);
  if (uploaded.status !== 201) throw new Error(JSON.stringify(uploaded.body));
  const submitted = await sawyer.post(`/api/v1/yard/listings/${id}/submit`);
  if (submitted.status !== 200) throw new Error(JSON.stringify(submitted.body));
  const approved = await admin.post(`/api/v1/admin/listings/${id}/approve`);
  if (approved.status !== 200) throw new Error(JSON.stringify(approved.body));
  listings[name] = id;
  return id;
}

const search = (query: string) => request(ctx.app).get(`/api/v1/catalogue?${query}`);
const titles = (res: request.Response) => (res.body.results as { title: string }[]).map((r) => r.title);

const slab = (
  speciesSlug: string,
  lengthMm: number,
  thicknessMm: number,
  widthStationsMm: number[],
  extra: Record<string, unknown> = {},
) => ({ speciesSlug, lengthMm, thicknessMm, widthStationsMm, ...extra });

beforeAll(async () => {
  ctx = await createTestContext();
  admin = await ctx.signedInClient("admin");
  photo = await sharp({ create: { width: 800, height: 600, channels: 3, background: "#7b4a2a" } })
    .jpeg()
    .toBuffer();
  const lakemont = await sawyerIn("Lakemont"); // invented demo town
  const northshore = await sawyerIn("Northshore"); // invented demo town, about 14 km north
  const toronto = await sawyerIn("Toronto"); // far away (GeoNames)
  await liveListing(
    lakemont,
    "walnut dining",
    [slab("black-walnut", 2600, 57, [1000, 960, 940], { features: ["crotch", "figure"] })],
    { rateMinor: 240_000, freight: true },
    [30, 18, 9],
  );
  await liveListing(
    lakemont,
    "maple bench",
    [slab("silver-maple", 1500, 76, [420, 380, 300], { liveEdge: "one", features: ["spalting"] })],
    { rateMinor: 45_000 },
    [25, 20, 16],
  );
  await liveListing(
    northshore,
    "oak pair",
    [slab("white-oak", 2400, 51, [520, 500]), slab("white-oak", 2400, 51, [515, 505])],
    { setKind: "bookmatched", rateMinor: 180_000, freight: true },
    [12, 10, 8],
  );
  await liveListing(toronto, "elm shelf", [slab("american-elm", 1200, 38, [300, 290], { liveEdge: "none" })], {
    priceMode: "per_board_foot",
    rateMinor: 900,
  });
  await liveListing(
    toronto,
    "cherry top",
    [slab("black-cherry", 2000, 45, [700, 690, 680], { features: ["figure"] })],
    { rateMinor: 120_000 },
    [9, 8, 7],
  );
  // A draft that must never show.
  const draftSlab = (
    await lakemont.post("/api/v1/yard/slabs", {
      ...slab("black-walnut", 2600, 57, [950, 900]),
      liveEdge: "both",
      surfacing: "flattened",
      dryingMethod: "kiln",
    })
  ).body.slab;
  await lakemont.post("/api/v1/yard/listings", { title: "hidden draft", slabIds: [draftSlab.id], priceMode: "fixed", rateMinor: 1000 });
}, 120_000);
afterAll(async () => ctx?.close());

describe("catalogue search", () => {
  it("shows live listings only, newest first, with a photo and the yard's town", async () => {
    const res = await search("");
    expect(res.status).toBe(200);
    expect(res.body.total).toBe(5);
    expect(titles(res)).toEqual(["cherry top", "elm shelf", "oak pair", "maple bench", "walnut dining"]);
    const walnut = res.body.results.find((r: { title: string }) => r.title === "walnut dining");
    expect(walnut).toMatchObject({
      town: "Lakemont",
      speciesSlug: "black-walnut",
      features: ["crotch", "figure"],
      photoAlt: "walnut dining",
      ready: true,
      moisturePct: 9,
    });
    expect(walnut.photoUrl).toMatch(/\/api\/v1\/photos\/.+\/small\.webp$/);
    expect((await request(ctx.app).get(walnut.photoUrl)).status).toBe(200);
  });

  it("filters by species, sizes, moisture, readiness, price, edge, features, sets and freight", async () => {
    expect(titles(await search("species=black-walnut,white-oak"))).toEqual(["oak pair", "walnut dining"]);
    expect(titles(await search("lengthMin=2000&lengthMax=2500"))).toEqual(["cherry top", "oak pair"]);
    // Average width of the maple bench is about 370 mm, its narrowest point 300 mm.
    expect(titles(await search("widthMin=350&widthMax=400"))).toEqual(["maple bench"]);
    expect(titles(await search("widthMin=350&widthMax=400&widthBasis=minimum"))).toEqual([]);
    expect(titles(await search("thicknessMin=50&thicknessMax=60"))).toEqual(["oak pair", "walnut dining"]);
    expect(titles(await search("moistureMax=10"))).toEqual(["cherry top", "oak pair", "walnut dining"]);
    expect(titles(await search("ready=1"))).toEqual(["cherry top", "oak pair", "walnut dining"]);
    expect(titles(await search("priceMin=100000&priceMax=200000"))).toEqual(["cherry top", "oak pair"]);
    expect(titles(await search("liveEdge=one,none"))).toEqual(["elm shelf", "maple bench"]);
    expect(titles(await search("features=figure"))).toEqual(["cherry top", "walnut dining"]);
    expect(titles(await search("features=figure,crotch"))).toEqual(["walnut dining"]);
    expect(titles(await search("sets=bookmatched"))).toEqual(["oak pair"]);
    expect(titles(await search("freight=1"))).toEqual(["oak pair", "walnut dining"]);
    expect((await search("species=black-walnut&freight=1&ready=1")).body.total).toBe(1);
  });

  it("searches around a town by great-circle distance, matching geolib within 0.1 km", async () => {
    const res = await search("near=Lakemont&radiusKm=50&sort=nearest");
    expect(res.status).toBe(200);
    expect(titles(res)).toEqual(expect.arrayContaining(["walnut dining", "maple bench", "oak pair"]));
    expect(titles(res)).toHaveLength(3);
    expect(res.body.near.name).toBe("Lakemont");
    const [first, , last] = res.body.results as { distanceKm: number; town: string }[];
    expect(first!.distanceKm).toBeCloseTo(0, 1);
    expect(last!.town).toBe("Northshore");
    // Cross-check with the reference library (geolib's haversine).
    const places = (await request(ctx.app).get("/api/v1/places?query=Northshore")).body.places;
    const expected = getDistance({ latitude: res.body.near.latitude, longitude: res.body.near.longitude }, places[0], 1) / 1000;
    expect(Math.abs(last!.distanceKm - expected)).toBeLessThan(0.1);
    const everywhere = await search("near=Lakemont&sort=nearest");
    expect(titles(everywhere).slice(-2).sort()).toEqual(["cherry top", "elm shelf"]);
    expect(everywhere.body.results.at(-1).distanceKm).toBeGreaterThan(400);
  });

  it("sorts by price, price per board foot and size", async () => {
    const low = (await search("sort=price_low")).body.results.map((r: { priceMinor: number }) => r.priceMinor);
    expect(low).toEqual([...low].sort((a, b) => a - b));
    const high = (await search("sort=price_high")).body.results.map((r: { priceMinor: number }) => r.priceMinor);
    expect(high).toEqual([...high].sort((a, b) => b - a));
    const perFoot = (await search("sort=price_per_board_foot")).body.results.map(
      (r: { pricePerBoardFootMinor: number }) => r.pricePerBoardFootMinor,
    );
    expect(perFoot).toEqual([...perFoot].sort((a, b) => a - b));
    const largest = (await search("sort=largest")).body.results.map((r: { boardFeet: number }) => r.boardFeet);
    expect(largest).toEqual([...largest].sort((a, b) => b - a));
  });

  it("pages with a signed cursor: every listing once, in order, for every sort", async () => {
    // Nearest first: listings of one yard share a distance, so the id breaks the tie across pages.
    for (const sort of ["newest", "price_low", "price_high", "price_per_board_foot", "largest", "nearest"]) {
      const town = sort === "nearest" ? "near=Lakemont&" : "";
      const all = titles(await search(`${town}sort=${sort}&limit=60`));
      const seen: string[] = [];
      let cursor: string | null = null;
      do {
        const res: request.Response = await search(`${town}sort=${sort}&limit=2${cursor ? `&cursor=${encodeURIComponent(cursor)}` : ""}`);
        expect(res.status).toBe(200);
        expect(res.body.total).toBe(5);
        seen.push(...titles(res));
        cursor = res.body.nextCursor;
      } while (cursor);
      expect(seen, sort).toEqual(all);
    }
  });

  it("answers bad input with 422 and a clear message", async () => {
    const cases: [string, string][] = [
      ["lengthMin=-5", "lengthMin"],
      ["lengthMin=3000&lengthMax=2000", "lengthMin"],
      ["species=unobtainium", "species"],
      ["species=DROP TABLE", "species"],
      ["features=glitter", "features"],
      ["sort=random", "sort"],
      ["sort=nearest", "sort"],
      ["radiusKm=20", "radiusKm"],
      ["priceMax=lots", "priceMax"],
    ];
    for (const [query, field] of cases) {
      const res = await search(query);
      expect(res.status, query).toBe(422);
      expect(
        Object.keys(res.body.error.fields).some((key) => key === field || key.startsWith(`${field}.`)),
        query,
      ).toBe(true);
    }
    const town = await search("near=Atlantis-under-the-sea");
    expect(town.status).toBe(422);
    expect(town.body.error.code).toBe("unknown_place");
    // No letters of any script: not a town's name (an emoji used to match some far-away place).
    for (const near of ["🌲", "🌲🏙️", "1234", "!!", "  ·  "]) {
      const res = await search(`near=${encodeURIComponent(near)}`);
      expect(res.status, near).toBe(422);
      expect(res.body.error.fields.near, near).toMatch(/town's name/);
    }
    expect((await search("near=")).status).toBe(200);
    const first = await search("limit=2");
    const cursor = first.body.nextCursor as string;
    const [payload] = cursor.split(".");
    const forged = `${Buffer.from(JSON.stringify(["newest", "2000-01-01T00:00:00.000Z", "x"])).toString("base64url")}.${cursor.split(".")[1]}`;
    for (const bad of [`${payload}.AAAAAAAAAAAAAAAAAAAAAA`, forged, "nonsense", `${cursor}x`]) {
      const res = await search(`limit=2&cursor=${encodeURIComponent(bad)}`);
      expect(res.status, bad).toBe(422);
      expect(res.body.error.code).toBe("bad_cursor");
    }
    expect((await search(`sort=price_low&limit=2&cursor=${encodeURIComponent(cursor)}`)).body.error.code).toBe("bad_cursor");
  });

  it("drops a withdrawn listing and follows new readings of a live one", async () => {
    const sawyer = await sawyerIn("Cedar Hollow");
    const id = await liveListing(sawyer, "ash board", [slab("white-ash", 1800, 32, [260, 250])], { rateMinor: 8_000 }, [20, 15, 12]);
    expect(titles(await search("species=white-ash"))).toEqual(["ash board"]);
    expect((await search("species=white-ash&ready=1")).body.total).toBe(0);
    const detail = await request(ctx.app).get(`/api/v1/catalogue/${id}`);
    await sawyer.post(`/api/v1/yard/slabs/${detail.body.slabs[0].id}/readings`, {
      readOn: "2025-09-01",
      moistureContentPct: 8,
      method: "oven_dry",
    });
    expect(titles(await search("species=white-ash&ready=1"))).toEqual(["ash board"]);
    await sawyer.post(`/api/v1/yard/listings/${id}/withdraw`);
    expect((await search("species=white-ash")).body.total).toBe(0);
  });

  it("answers a repeated search with an entity tag: unchanged → 304 without a body, changed → the new page", async () => {
    const sawyer = await sawyerIn("Cedar Hollow");
    await liveListing(sawyer, "cherry offcut", [slab("black-cherry", 1500, 38, [300, 290])], { rateMinor: 7_000 });
    const first = await search("species=black-cherry");
    const tag = first.headers.etag as string;
    expect(tag).toMatch(/^W\/"/);
    const again = await request(ctx.app).get("/api/v1/catalogue?species=black-cherry").set("if-none-match", tag);
    expect(again.status).toBe(304);
    expect(again.text).toBe("");
    await liveListing(sawyer, "second cherry", [slab("black-cherry", 1600, 38, [310, 300])], { rateMinor: 7_000 });
    const changed = await request(ctx.app).get("/api/v1/catalogue?species=black-cherry").set("if-none-match", tag);
    expect(changed.status).toBe(200);
    expect(changed.body.total).toBe(first.body.total + 1);
  });
});

describe("live slabs per species", () => {
  const countOf = async (slug: string) => {
    const res = await request(ctx.app).get("/api/v1/species-counts");
    expect(res.status).toBe(200);
    return (res.body.species as { slug: string; liveSlabs: number }[]).find((entry) => entry.slug === slug)?.liveSlabs ?? 0;
  };

  it("counts every live slab of a species (a set's slabs each), and follows a withdrawal at once", async () => {
    const sawyer = await sawyerIn("Cedar Hollow");
    expect(await countOf("london-plane")).toBe(0);
    await liveListing(sawyer, "plane pair", [slab("london-plane", 2100, 45, [520, 500]), slab("london-plane", 2100, 45, [515, 505])], {
      setKind: "bookmatched",
    });
    const single = await liveListing(sawyer, "plane single", [slab("london-plane", 1900, 45, [480, 470])], {});
    expect(await countOf("london-plane")).toBe(3);
    // Withdrawn: the kept counts are dropped with the catalogue's other answers.
    await sawyer.post(`/api/v1/yard/listings/${single}/withdraw`);
    expect(await countOf("london-plane")).toBe(2);
  });
});

describe("fits my table", () => {
  it("finds what seats eight (2 × 4 diners at 600 mm each: a 2400 × 900 × 38 mm top, common practice) with the spare margin", async () => {
    expect(topLengthForSeats(8)).toBe(2400);
    const res = await search("seats=8");
    expect(res.status).toBe(200);
    expect(titles(res)).toEqual(["walnut dining"]);
    expect(res.body.fitTop).toEqual({ lengthMm: 2400, widthMm: 900, thicknessMm: 38, seats: 8 });
    // 2600 mm less 2 × 50 mm end trim = 2500 usable; 57 mm less 6 mm flattening = 51 mm.
    expect(res.body.results[0].fit).toMatchObject({ spareLengthMm: 100, spareThicknessMm: 13 });
    expect(res.body.results[0].fit.spareWidthMm).toBeGreaterThan(0);
  });

  it("agrees with slab-math's fit check for every listing and several tops (glued widths for sets)", async () => {
    const all = (await search("limit=60")).body.results as { listingId: string; title: string }[];
    const tops = [
      { lengthMm: 2000, widthMm: 900, thicknessMm: 40 },
      { lengthMm: 1100, widthMm: 280, thicknessMm: 30 },
      { lengthMm: 2300, widthMm: 1000, thicknessMm: 45 },
      { lengthMm: 1400, widthMm: 300, thicknessMm: 60 },
    ];
    for (const top of tops) {
      const found = new Set(
        titles(await search(`fitLength=${top.lengthMm}&fitWidth=${top.widthMm}&fitThickness=${top.thicknessMm}&limit=60`)),
      );
      for (const card of all) {
        const detail = (await request(ctx.app).get(`/api/v1/catalogue/${card.listingId}`)).body;
        const slabs = detail.slabs.map((s: { lengthMm: number; thicknessMm: number; widthStationsMm: number[] }) => ({
          lengthMm: s.lengthMm,
          thicknessMm: s.thicknessMm,
          widthStationsMm: s.widthStationsMm,
        }));
        const expected = slabs.length === 1 ? tableFit(slabs[0], top) : gluedTableFit(slabs, top);
        expect(found.has(card.title), `${card.title} for ${JSON.stringify(top)}`).toBe(expected.fits);
      }
    }
  });

  it("refuses a fit search with both diners and a length, or impossible sizes", async () => {
    expect((await search("seats=8&fitLength=2000")).status).toBe(422);
    expect((await search("seats=1")).status).toBe(422);
    expect((await search("fitWidth=-3")).status).toBe(422);
  });
});

describe("slab page", () => {
  it("shows a live listing to anyone, with the log's story, the readings and the yard", async () => {
    const res = await request(ctx.app).get(`/api/v1/catalogue/${listings["oak pair"]}`);
    expect(res.status).toBe(200);
    expect(res.body.listing).toMatchObject({ title: "oak pair", setKind: "bookmatched", status: "live" });
    expect(res.body.listing.figures.platformFeeMinor).toBeUndefined();
    expect(res.body.slabs).toHaveLength(2);
    expect(res.body.slabs[0].readings.map((r: { moistureContentPct: number }) => r.moistureContentPct)).toEqual([12, 10, 8]);
    expect(res.body.log.notes).toBe("The oak pair tree.");
    expect(res.body.yard.town).toBe("Northshore");
    expect(res.body.listing.photos).toHaveLength(1);
  });

  it("hides a listing that is not live, except from its sawyer and admins", async () => {
    const sawyer = await ctx.signedInClient("sawyer");
    const made = (
      await sawyer.post("/api/v1/yard/slabs", {
        ...slab("black-walnut", 2000, 50, [500, 500]),
        liveEdge: "both",
        surfacing: "flattened",
        dryingMethod: "kiln",
      })
    ).body.slab;
    const draft = (
      await sawyer.post("/api/v1/yard/listings", { title: "Not yet", slabIds: [made.id], priceMode: "fixed", rateMinor: 9000 })
    ).body.listing;
    expect((await request(ctx.app).get(`/api/v1/catalogue/${draft.id}`)).status).toBe(404);
    expect((await sawyer.get(`/api/v1/catalogue/${draft.id}`)).status).toBe(200);
    expect((await admin.get(`/api/v1/catalogue/${draft.id}`)).status).toBe(200);
  });
});

describe("places", () => {
  it("finds towns by the start of their name, the demo region's first", async () => {
    const res = await request(ctx.app).get("/api/v1/places?query=lakem");
    expect(res.status).toBe(200);
    expect(res.body.places[0]).toMatchObject({ id: "demo:lakemont", name: "Lakemont" });
    const toronto = (await request(ctx.app).get("/api/v1/places?query=Toronto")).body.places[0];
    // GeoNames: Toronto, Ontario, about 43.70° N, 79.42° W.
    expect(toronto.country).toBe("CA");
    expect(toronto.latitude).toBeCloseTo(43.7, 0);
    expect(toronto.longitude).toBeCloseTo(-79.4, 0);
    expect((await request(ctx.app).get("/api/v1/places?query=")).status).toBe(422);
  });
});

describe("a set's weights", () => {
  it("names the whole set's weight and its heaviest slab's apart, from slab-math, so the total is never below the heaviest slab", async () => {
    const sawyer = await sawyerIn("Lakemont");
    // A long, wide slab with an offcut under a tenth of its weight: the central total is below the big slab's high end.
    const id = await liveListing(
      sawyer,
      "walnut with offcut",
      [slab("black-walnut", 2400, 76, [700, 700]), slab("black-walnut", 600, 25, [150, 150])],
      { setKind: "sequential" },
    );
    const card = (await search("sets=sequential").expect(200)).body.results.find((c: { listingId: string }) => c.listingId === id);
    const detail = (await request(ctx.app).get(`/api/v1/catalogue/${id}`).expect(200)).body;
    const slabs = detail.slabs.map((s: { figures: { weightKg: number; weightHighKg: number } }) => s.figures);
    const sum = (values: number[]) => values.reduce((a, b) => a + b, 0);
    expect(card.weightKg).toBeCloseTo(sum(slabs.map((s: { weightKg: number }) => s.weightKg)), 6);
    expect(card.totalWeightHighKg).toBeCloseTo(sum(slabs.map((s: { weightHighKg: number }) => s.weightHighKg)), 6);
    expect(card.heaviestSlabHighKg).toBeCloseTo(Math.max(...slabs.map((s: { weightHighKg: number }) => s.weightHighKg)), 6);
    expect(card.weightKg).toBeLessThan(card.heaviestSlabHighKg); // the case the audit saw on a card
    expect(card.totalWeightHighKg).toBeGreaterThanOrEqual(card.heaviestSlabHighKg);
    // The slab page's figures are the same set total.
    expect(detail.listing.figures.weightHighKg).toBeCloseTo(card.totalWeightHighKg, 6);
    expect(detail.listing.figures.weightKg).toBeCloseTo(card.weightKg, 6);
  });
});
