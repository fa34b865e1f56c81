import type { DemoListing, DemoLog, DemoSale, DemoSlab } from "./lakemont-yard.ts";

/*
 * The bulk of the invented Lakemont stock: the logs each demo yard rescued, the slabs it cut from
 * them and how far they have dried, what it listed (singles, sequential and bookmatched sets, per
 * board foot or at a fixed price), and what sold, to whom and how the buyer found it. Streets,
 * parks, stories and people are made up. Dates count back from the day the seed runs, so the
 * demo's slabs are always at the same stage of drying and its orders equally recent.
 */

type Feature = DemoSlab["features"][number];
type Defect = DemoSlab["defects"][number];
type Drying = "kiln" | "air" | "drying";

interface LogSpec {
  yard: string;
  species: string;
  town: string;
  where: string;
  site: DemoLog["siteKind"];
  reason: DemoLog["fellingReason"];
  /** Months between felling and the seed's day. */
  felledMonthsAgo: number;
  lengthMm: number;
  diameterMm: number;
  notes: string;
  thicknessMm: number;
  slabCount: number;
  /** kiln: air- then kiln-dried into the 6–10 % band; air: air-dried to 12–18 %; drying: still wet, not listed. */
  drying: Drying;
  surfacing?: DemoSlab["surfacing"];
  liveEdge?: DemoSlab["liveEdge"];
  /** Features and defects by slab number (1 = the first slab cut). */
  features?: Record<number, Feature[]>;
  defects?: Record<number, Defect[]>;
  mill?: "band" | "chainsaw";
  listings?: ListingSpec[];
}

interface ListingSpec {
  slabs: number[];
  set?: DemoListing["setKind"];
  title: string;
  description: string;
  /** Dollars per board foot, or a fixed price in dollars. */
  perBf?: number;
  fixed?: number;
  status?: DemoListing["status"];
  /** Days since it went live (or was submitted). */
  daysAgo?: number;
  freight?: boolean;
  sale?: DemoSale;
}

const DAY = 86_400_000;

/** A small deterministic generator (mulberry32), so the demo is the same on every machine. */
function random(seed: number): () => number {
  let state = seed >>> 0;
  return () => {
    state = (state + 0x6d2b79f5) >>> 0;
    let t = state;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

const round = (value: number, step: number) => Math.round(value / step) * step;
const dateOf = (ms: number) => new Date(ms).toISOString().slice(0, 10);

/** Moisture readings from milling to now, as the slab's drying state says (pin meter, % MC). */
function readingsFor(drying: Drying, milledMs: number, nowMs: number, thicknessMm: number, rand: () => number) {
  const span = nowMs - milledMs;
  const green = round(58 + rand() * 20, 0.5);
  const at = (share: number) => dateOf(milledMs + span * share);
  if (drying === "drying")
    return {
      readings: [
        [dateOf(milledMs + 7 * DAY), green],
        [at(0.5), round(38 + rand() * 8, 0.5)],
        [dateOf(nowMs - 6 * DAY), round(24 + rand() * 10, 0.5)],
      ] as [string, number][],
      kilnOn: null,
    };
  if (drying === "air")
    return {
      readings: [
        [dateOf(milledMs + 7 * DAY), green],
        [at(0.3), round(31 + rand() * 6, 0.5)],
        [at(0.62), round(19 + rand() * 4, 0.5)],
        [dateOf(nowMs - 12 * DAY), round(12 + rand() * 5.5, 0.5)],
      ] as [string, number][],
      kilnOn: null,
    };
  // Air-dried first (about a year per inch, less for thin stock), then a kiln run to finish.
  const airMonths = Math.min((span / DAY / 30) * 0.8, Math.max(5, (thicknessMm / 25.4) * 7));
  const kilnMs = milledMs + airMonths * 30 * DAY;
  const kilnOn = dateOf(kilnMs);
  return {
    readings: [
      [dateOf(milledMs + 7 * DAY), green],
      [dateOf(milledMs + (kilnMs - milledMs) * 0.35), round(31 + rand() * 6, 0.5)],
      [dateOf(milledMs + (kilnMs - milledMs) * 0.8), round(17 + rand() * 4, 0.5)],
      [kilnOn, round(6.5 + rand() * 2, 0.5)],
    ] as [string, number][],
    kilnOn,
  };
}

/**
 * Slabs through a round log: each slab's width from where it lies across the log (the centre
 * slabs widest), a little wider at the butt end, with the wander of a real tree.
 */
function cutSlabs(spec: LogSpec, index: number, milledMs: number, nowMs: number): DemoSlab[] {
  const rand = random(index * 104_729 + spec.diameterMm);
  const kerf = spec.mill === "chainsaw" ? 9 : 3;
  const pitch = spec.thicknessMm + kerf;
  const radius = spec.diameterMm / 2;
  const slabs: DemoSlab[] = [];
  for (let sequence = 1; sequence <= spec.slabCount; sequence++) {
    const offset = Math.abs((sequence - (spec.slabCount + 1) / 2) * pitch) + spec.thicknessMm / 2;
    // The narrower (outer) face of the slab decides its usable width; bark takes a little more.
    const width = 2 * Math.sqrt(Math.max(radius * radius - offset * offset, (radius * 0.45) ** 2)) * 0.93;
    const stations = 4 + (rand() < 0.4 ? 1 : 0);
    const widthStationsMm = Array.from({ length: stations }, (_, i) => {
      const taper = 1.05 - (0.08 * i) / (stations - 1);
      return round(width * taper * (0.97 + rand() * 0.06), 5);
    });
    const drying = readingsFor(spec.drying, milledMs, nowMs, spec.thicknessMm, rand);
    const kiln = spec.drying === "kiln";
    slabs.push({
      sequence,
      lengthMm: round(spec.lengthMm - 100 - rand() * 120, 10),
      thicknessMm: spec.thicknessMm,
      widthStationsMm,
      liveEdge: spec.liveEdge ?? "both",
      surfacing: spec.surfacing ?? (kiln ? "flattened" : "rough_sawn"),
      features: spec.features?.[sequence] ?? [],
      defects: spec.defects?.[sequence] ?? [],
      dryingMethod: kiln ? "air_then_kiln" : "air",
      kilnCompletedOn: drying.kilnOn,
      readings: drying.readings,
    });
  }
  return slabs;
}

function buildLogs(specs: LogSpec[], now: Date): DemoLog[] {
  const nowMs = now.getTime();
  return specs.map((spec, index) => {
    const felledMs = nowMs - spec.felledMonthsAgo * 30.4 * DAY;
    const milledMs = felledMs + (9 + (index % 4) * 6) * DAY;
    return {
      yardEmail: spec.yard,
      speciesSlug: spec.species,
      siteTown: spec.town,
      siteNeighbourhood: spec.where,
      siteKind: spec.site,
      fellingReason: spec.reason,
      felledOn: dateOf(felledMs),
      milledOn: dateOf(milledMs),
      lengthMm: spec.lengthMm,
      diameterMm: spec.diameterMm,
      notes: spec.notes,
      mill: spec.mill ?? "band",
      slabs: cutSlabs(spec, index, milledMs, nowMs),
      listings: (spec.listings ?? []).map((listing, n) => ({
        title: listing.title,
        description: listing.description,
        setKind: listing.set ?? (listing.slabs.length > 1 ? "sequential" : "single"),
        slabs: listing.slabs,
        priceMode: listing.perBf !== undefined ? "per_board_foot" : "fixed",
        rateMinor: Math.round((listing.perBf ?? listing.fixed ?? 0) * 100),
        status: listing.status ?? "live",
        daysAgo: listing.daysAgo ?? 6 + ((index * 7 + n * 5) % 70),
        freight: listing.freight ?? true,
        sale: listing.sale,
      })),
    };
  });
}

// ---- The yards ----------------------------------------------------------------------------------

const RIDGEBACK = "yard@ridgeback-timber.test";
const COBBLE = "hello@cobblelane-slabs.test";
const NORTHSHORE = "kiln@northshore-coop.test";
const HERON = "mill@heronpoint-mill.test";
const CEDAR = "woodlot@cedarhollow.test";
const ASHGROVE = "barn@ashgrove-slabs.test";
const QUARRY = "crew@quarryridge-trees.test";
const MILLBROOK = "office@millbrook-kiln.test";
const HARBOUR = "dock@oldharbour-sawyers.test";
const TAMARACK = "hello@tamarack-lane.test";

// The demo's buyers (Northshore sells nothing here: the payouts walk-through starts it from zero).
const FERNHILL = "shop@fernhill-furniture.test";
const BRANDTS = "ana.theo@lakemont-home.test";
const CALLOWAY = "studio@calloway-interiors.test";
const HOLLOWPINE = "sam@hollowpine-guitars.test";
const FENNIMORE = "bea.fennimore@lakemont-home.test";
const LAKEVIEW = "corin@lakeview-fitout.test";
const WENDELS = "wendel.family@lakemont-home.test";

const SPECS: LogSpec[] = [
  // Ridgeback Urban Timber: two people, a band mill, Lakemont's street trees.
  {
    yard: RIDGEBACK,
    species: "white-oak",
    town: "Lakemont",
    where: "Courthouse Square",
    site: "park",
    reason: "hazard",
    felledMonthsAgo: 34,
    lengthMm: 3200,
    diameterMm: 960,
    notes: "A square oak with a hollow at the base, taken down before it dropped a limb on the farmers' market. The upper log was sound.",
    thicknessMm: 64,
    slabCount: 6,
    drying: "kiln",
    features: { 3: ["figure"], 4: ["figure"] },
    defects: { 1: ["checks"], 6: ["checks"] },
    listings: [
      {
        slabs: [6],
        title: "White oak outer slab with end checks",
        description: "The last slab of the log: bark edge, end checks stabilised. Shelves or a hall bench.",
        fixed: 290,
      },
      {
        slabs: [3, 4],
        set: "bookmatched",
        title: "Courthouse white oak, bookmatched pair for a 10-seat table",
        description: "The two centre slabs, opened like a book: ray fleck near the pith, flattened, kiln-finished.",
        fixed: 4_200,
        sale: {
          buyer: CALLOWAY,
          handover: "freight",
          daysAgo: 58,
          end: "completed",
          review: {
            rating: 5,
            matched: { yes: true, comment: "Widths were within a few millimetres of the listing." },
            handover: { yes: true, comment: "Crated, strapped and on the day promised." },
            body: "My client's boardroom table. The figure across the two leaves lines up perfectly.",
            answer: "Thank you, Ines. Send us a photo when the table is finished; we'd love to see it.",
            daysAfter: 2,
          },
        },
      },
      {
        slabs: [2],
        title: "White oak dining slab with ray fleck",
        description: "Flattened both faces, one small end check stabilised.",
        perBf: 17,
      },
      {
        slabs: [5],
        title: "White oak slab from Courthouse Square",
        description: "Live edge both sides; good for a desk or a narrow table.",
        perBf: 16,
        sale: {
          buyer: FERNHILL,
          handover: "pickup",
          daysAgo: 41,
          end: "completed",
          review: { rating: 5, matched: { yes: true }, handover: { yes: true, comment: "Helped load it onto our trailer." }, daysAfter: 1 },
        },
      },
      { slabs: [1], title: "Narrow white oak bench slab", description: "The outer slab: narrower, with checks at one end.", fixed: 380 },
    ],
  },
  {
    yard: RIDGEBACK,
    species: "black-cherry",
    town: "Lakemont",
    where: "Orchard Terrace",
    site: "private_yard",
    reason: "disease",
    felledMonthsAgo: 22,
    lengthMm: 2300,
    diameterMm: 560,
    notes: "A backyard cherry with black knot in its crown. The owners kept two slabs for a mantel; we dried the rest.",
    thicknessMm: 51,
    slabCount: 4,
    drying: "kiln",
    surfacing: "sanded",
    listings: [
      {
        slabs: [2, 3],
        title: "Black cherry sequential pair, sanded",
        description: "Neighbouring slabs for a glued-up coffee table or two matching shelves.",
        perBf: 15,
        sale: {
          buyer: BRANDTS,
          handover: "pickup",
          daysAgo: 33,
          end: "completed",
          review: {
            rating: 4,
            matched: { yes: true },
            handover: { yes: true },
            body: "Beautiful colour already. We only wish we'd asked for one more slab.",
            daysAfter: 3,
          },
        },
      },
      { slabs: [1], title: "Cherry shelf slab, one live edge", description: "Sanded, small and light: a shelf or a box lid.", fixed: 165 },
      { slabs: [4], title: "Cherry slab for a side table", description: "Sanded to 120 grit; colour will deepen with light.", perBf: 15 },
    ],
  },
  {
    yard: RIDGEBACK,
    species: "silver-maple",
    town: "Lakemont",
    where: "Millrace Street",
    site: "street",
    reason: "storm",
    felledMonthsAgo: 7,
    lengthMm: 2900,
    diameterMm: 880,
    notes: "Lost in the spring ice storm. Stickered in the yard; we read them every month.",
    thicknessMm: 57,
    slabCount: 5,
    drying: "drying",
  },
  // Cobble Lane Slabworks: chainsaw mill, slabs cut where the city crews drop the trees.
  {
    yard: COBBLE,
    species: "honey-locust",
    town: "East Lakemont",
    where: "Depot Street median",
    site: "street",
    reason: "construction",
    felledMonthsAgo: 26,
    lengthMm: 2600,
    diameterMm: 720,
    notes: "Removed for the new bus lane. Milled on the median that same afternoon.",
    thicknessMm: 60,
    slabCount: 5,
    drying: "kiln",
    mill: "chainsaw",
    defects: { 1: ["checks"] },
    listings: [
      {
        slabs: [1],
        title: "Honey locust bench slab, chainsaw cut",
        description: "Outer slab with small end checks; flattened on one face.",
        fixed: 260,
        daysAgo: 4,
      },
      {
        slabs: [3],
        title: "Honey locust dining slab, red heartwood",
        description: "Centre cut, flattened and kiln-finished; the sapwood edge is bright yellow.",
        perBf: 14,
        sale: {
          buyer: LAKEVIEW,
          handover: "freight",
          daysAgo: 47,
          end: "completed",
          completedBy: "automatic",
          review: {
            rating: 4,
            matched: { yes: true },
            handover: { yes: false, comment: "The freight window moved twice; the slab itself arrived fine." },
            body: "Now the counter of a café on Lantern Quay.",
            answer: "Sorry about the freight shuffle — we've changed carriers since.",
            daysAfter: 5,
          },
        },
      },
      {
        slabs: [2, 4],
        title: "Honey locust pair for a bench and a shelf",
        description: "Two slabs from either side of the centre.",
        perBf: 13,
      },
      {
        slabs: [5],
        title: "Honey locust outside slab",
        description: "Narrow, bark on both edges, stabilised end checks at one end.",
        fixed: 260,
      },
    ],
  },
  {
    yard: COBBLE,
    species: "american-elm",
    town: "East Lakemont",
    where: "Tanner's Common",
    site: "park",
    reason: "disease",
    felledMonthsAgo: 30,
    lengthMm: 2800,
    diameterMm: 990,
    notes: "One of the last common elms; Dutch elm disease got it. Interlocked grain, so it dried flat.",
    thicknessMm: 70,
    slabCount: 5,
    drying: "kiln",
    mill: "chainsaw",
    features: { 3: ["figure"] },
    listings: [
      {
        slabs: [3],
        title: "Wide American elm slab, wavy grain",
        description: "A metre across at the butt end; chainsaw-milled, then flattened.",
        perBf: 12,
        sale: {
          buyer: WENDELS,
          handover: "pickup",
          daysAgo: 24,
          end: "completed",
          review: {
            rating: 5,
            matched: { yes: true, comment: "Exactly the moisture the listing said: 7.5 % on our meter." },
            handover: { yes: true },
            body: "Our kitchen island top. Dana walked us through sealing the ends.",
            daysAfter: 2,
          },
        },
      },
      { slabs: [2], title: "Elm slab from Tanner's Common", description: "Flattened; wavy, interlocked grain.", perBf: 12 },
      { slabs: [4], title: "Elm slab for a desk", description: "Flattened, straight sawn edge on one side.", perBf: 11 },
      { slabs: [1, 5], title: "Two narrow elm bench slabs", description: "The outer cuts, both with bark.", fixed: 540 },
    ],
  },
  {
    yard: COBBLE,
    species: "northern-red-oak",
    town: "Lakemont",
    where: "Lighthouse Road",
    site: "street",
    reason: "pests",
    felledMonthsAgo: 14,
    lengthMm: 2400,
    diameterMm: 780,
    notes: "Oak wilt. Milled and air-dried under cover; not through a kiln yet.",
    thicknessMm: 52,
    slabCount: 3,
    drying: "air",
    mill: "chainsaw",
    listings: [
      {
        slabs: [3],
        title: "Red oak slab, air-dried, for a workbench top",
        description: "Air-dried only and rough from the chainsaw mill: a shop top, not a dining table yet.",
        perBf: 7,
      },
      {
        slabs: [1, 2],
        title: "Air-dried red oak pair, rough sawn",
        description: "Air-dried only: finish drying indoors before a fine build.",
        perBf: 8,
      },
    ],
  },
  // Northshore Kiln Co-op: a shared kiln and a heated store (sells nothing here: see above).
  {
    yard: NORTHSHORE,
    species: "sugar-maple",
    town: "Northshore",
    where: "Birchwood school yard",
    site: "construction",
    reason: "construction",
    felledMonthsAgo: 28,
    lengthMm: 2500,
    diameterMm: 700,
    notes: "Made way for the school's new gym. Hard maple, pale and dense.",
    thicknessMm: 51,
    slabCount: 5,
    drying: "kiln",
    features: { 2: ["figure"], 3: ["figure"] },
    listings: [
      {
        slabs: [2, 3],
        set: "bookmatched",
        title: "Curly sugar maple, bookmatched pair",
        description: "Light curl across both leaves.",
        fixed: 1_650,
      },
      { slabs: [4], title: "Sugar maple slab, school yard tree", description: "Flattened, kiln-finished.", perBf: 11 },
      { slabs: [1], title: "Small sugar maple slab for a cutting board run", description: "Narrow outer cut.", fixed: 120 },
      { slabs: [5], title: "Sugar maple shelf slab", description: "One face flattened, bark left on.", fixed: 150 },
    ],
  },
  {
    yard: NORTHSHORE,
    species: "american-sycamore",
    town: "Northshore",
    where: "Harbour Mill Park",
    site: "park",
    reason: "storm",
    felledMonthsAgo: 20,
    lengthMm: 2700,
    diameterMm: 1060,
    notes: "Blown over in the September gale. Lacey ray fleck near the pith.",
    thicknessMm: 64,
    slabCount: 4,
    drying: "kiln",
    listings: [
      {
        slabs: [1],
        title: "Sycamore outer slab with bark edge",
        description: "Narrower outer cut; good for a console or a long shelf.",
        fixed: 340,
        daysAgo: 2,
      },
      { slabs: [2], title: "Wide sycamore slab with lace figure", description: "Over a metre wide; flattened.", perBf: 9 },
      { slabs: [3], title: "Sycamore dining slab", description: "Flattened, kiln-finished, freight or pickup.", perBf: 9 },
    ],
  },
  {
    yard: NORTHSHORE,
    species: "black-walnut",
    town: "Northshore",
    where: "Lindqvist farm lane",
    site: "private_yard",
    reason: "hazard",
    felledMonthsAgo: 5,
    lengthMm: 2400,
    diameterMm: 640,
    notes: "Leaning over the lane. Stickered in the co-op's shed; into the kiln next autumn.",
    thicknessMm: 57,
    slabCount: 4,
    drying: "drying",
  },
  // Heron Point Mill: a portable band mill that follows the county park crews.
  {
    yard: HERON,
    species: "red-maple",
    town: "Heron Point",
    where: "Heron Point county park",
    site: "park",
    reason: "storm",
    felledMonthsAgo: 25,
    lengthMm: 2800,
    diameterMm: 820,
    notes: "Storm-split trunk at the boat launch; spalting had started in the split.",
    thicknessMm: 54,
    slabCount: 5,
    drying: "kiln",
    features: { 2: ["spalting"], 3: ["spalting"], 4: ["spalting"] },
    listings: [
      {
        slabs: [2, 3],
        set: "bookmatched",
        title: "Spalted red maple, bookmatched pair",
        description: "Zone lines mirrored across the two leaves; stabilised and flattened.",
        fixed: 1_480,
        sale: {
          buyer: CALLOWAY,
          handover: "freight",
          daysAgo: 36,
          end: "completed",
          review: {
            rating: 5,
            matched: { yes: true },
            handover: { yes: true },
            body: "Even better in person. Packed like it was going overseas.",
            answer: "Glad it arrived safe — the spalting on that log was special.",
            daysAfter: 1,
          },
        },
      },
      { slabs: [4], title: "Spalted red maple slab", description: "Flattened; zone lines throughout.", perBf: 13 },
      { slabs: [1], title: "Red maple bench slab", description: "Outer cut with a little spalting at one end.", fixed: 290 },
      { slabs: [5], title: "Red maple slab, plain", description: "Pale and clean, flattened.", perBf: 9 },
    ],
  },
  {
    yard: HERON,
    species: "white-ash",
    town: "Heron Point",
    where: "Ridge trail",
    site: "park",
    reason: "pests",
    felledMonthsAgo: 38,
    lengthMm: 3000,
    diameterMm: 740,
    notes: "Emerald ash borer. Sawn before the beetles reached the wood; strong, straight grain.",
    thicknessMm: 51,
    slabCount: 5,
    drying: "kiln",
    listings: [
      {
        slabs: [2, 3, 4],
        title: "White ash sequential trio for a long table",
        description: "Three neighbouring slabs, flattened.",
        perBf: 10,
      },
      {
        slabs: [1],
        title: "Ash slab for a floating shelf",
        description: "Flattened, one live edge.",
        fixed: 190,
        sale: {
          buyer: FENNIMORE,
          handover: "pickup",
          daysAgo: 19,
          end: "completed",
          review: {
            rating: 4,
            matched: { yes: true },
            handover: { yes: true },
            body: "My first slab. Light enough to carry alone.",
            daysAfter: 2,
          },
        },
      },
      { slabs: [5], title: "Ash slab, bark on", description: "Rough surface left as milled on the underside.", fixed: 210 },
    ],
  },
  {
    yard: HERON,
    species: "black-locust",
    town: "Heron Point",
    where: "Marina parking",
    site: "construction",
    reason: "construction",
    felledMonthsAgo: 18,
    lengthMm: 2000,
    diameterMm: 520,
    notes: "Hard as iron and rot-resistant: good for an outdoor bench.",
    thicknessMm: 64,
    slabCount: 3,
    drying: "air",
    listings: [
      { slabs: [2], title: "Black locust outdoor bench slab", description: "Air-dried; rot-resistant for a garden bench.", fixed: 340 },
      { slabs: [1, 3], title: "Black locust pair for steps", description: "Air-dried, rough sawn.", fixed: 420 },
    ],
  },
  {
    yard: HERON,
    species: "london-plane",
    town: "Heron Point",
    where: "Promenade planters",
    site: "street",
    reason: "construction",
    felledMonthsAgo: 4,
    lengthMm: 2600,
    diameterMm: 900,
    notes: "Planters rebuilt along the promenade. Wet as a sponge; drying under cover.",
    thicknessMm: 60,
    slabCount: 4,
    drying: "drying",
  },
  // Cedar Hollow Woodlot: a farm woodlot with a solar kiln.
  {
    yard: CEDAR,
    species: "black-walnut",
    town: "Cedar Hollow",
    where: "Solberg farm fence row",
    site: "private_yard",
    reason: "storm",
    felledMonthsAgo: 40,
    lengthMm: 2500,
    diameterMm: 700,
    notes: "The old fence-row walnut, blown down in the derecho. Dried two summers in the solar kiln.",
    thicknessMm: 57,
    slabCount: 5,
    drying: "kiln",
    liveEdge: "both",
    features: { 1: ["crotch"], 2: ["crotch", "figure"], 3: ["figure"] },
    defects: { 2: ["voids_filled"], 4: ["butterfly_keys"] },
    listings: [
      {
        slabs: [2, 3],
        set: "bookmatched",
        title: "Walnut crotch bookmatch from the fence row",
        description: "Feathered crotch figure mirrored across the pair; a filled void in one leaf.",
        fixed: 3_100,
      },
      {
        slabs: [4],
        title: "Walnut slab with butterfly keys",
        description: "Two walnut keys across a check near the end; flattened.",
        perBf: 26,
        sale: {
          buyer: FERNHILL,
          handover: "pickup",
          daysAgo: 12,
          end: "handed_over",
        },
      },
      { slabs: [1], title: "Walnut crotch end slab", description: "Short and wild: a console or a wall piece.", fixed: 650 },
      { slabs: [5], title: "Walnut slab, creamy sapwood edge", description: "Flattened; sapwood left on one edge.", perBf: 24 },
    ],
  },
  {
    yard: CEDAR,
    species: "shagbark-hickory",
    town: "Cedar Hollow",
    where: "North woodlot",
    site: "other",
    reason: "hazard",
    felledMonthsAgo: 27,
    lengthMm: 2400,
    diameterMm: 600,
    notes: "Dead standing, cut before it fell on the woodlot track.",
    thicknessMm: 51,
    slabCount: 4,
    drying: "kiln",
    listings: [
      {
        slabs: [2],
        title: "Hickory slab for a workbench top",
        description: "Tough and heavy; flattened.",
        perBf: 10,
        sale: {
          buyer: HOLLOWPINE,
          handover: "pickup",
          daysAgo: 29,
          end: "completed",
          review: {
            rating: 5,
            matched: { yes: true },
            handover: { yes: true, comment: "Greta had it on the forklift when we arrived." },
            body: "Now a second bench in the guitar shop. Dead flat and dry.",
            daysAfter: 4,
          },
        },
      },
      { slabs: [3], title: "Hickory slab, live edges", description: "Flattened both faces.", perBf: 10 },
      { slabs: [1, 4], title: "Two hickory shelf slabs", description: "Outer cuts for shelves or stair treads.", fixed: 360 },
    ],
  },
  {
    yard: CEDAR,
    species: "eastern-red-cedar",
    town: "Cedar Hollow",
    where: "Windbreak by the road",
    site: "private_yard",
    reason: "other",
    felledMonthsAgo: 16,
    lengthMm: 1900,
    diameterMm: 420,
    notes: "Thinned from the farm's windbreak. Smells like a cedar chest when you plane it.",
    thicknessMm: 44,
    slabCount: 4,
    drying: "kiln",
    surfacing: "sanded",
    listings: [
      {
        slabs: [2, 3],
        title: "Aromatic red cedar pair for a chest lid",
        description: "Sanded; purple-red heart, cream sapwood.",
        fixed: 320,
      },
      { slabs: [1], title: "Red cedar slab for a shelf", description: "Sanded, bark on both edges.", fixed: 120 },
      { slabs: [4], title: "Red cedar small slab", description: "Sanded; a box or a sign.", fixed: 95 },
    ],
  },
  // Ashgrove Slab Barn: a barn full of ash and elm from the borer years.
  {
    yard: ASHGROVE,
    species: "white-ash",
    town: "Ashgrove",
    where: "Station Road",
    site: "street",
    reason: "pests",
    felledMonthsAgo: 46,
    lengthMm: 3300,
    diameterMm: 860,
    notes: "One of forty street ashes the town took down in a single winter of the borer.",
    thicknessMm: 57,
    slabCount: 6,
    drying: "kiln",
    features: { 3: ["figure"] },
    listings: [
      {
        slabs: [1],
        title: "White ash slab with a wide sapwood edge",
        description: "Outer slab, almost all pale sapwood; flattened.",
        perBf: 8,
      },
      {
        slabs: [3],
        title: "Long white ash slab for a harvest table",
        description: "Over three metres; flattened, kiln-finished.",
        perBf: 9,
        sale: {
          buyer: BRANDTS,
          handover: "freight",
          daysAgo: 52,
          end: "completed",
          review: {
            rating: 3,
            matched: { yes: false, comment: "A check at one end ran further than the photos showed; we lost 15 cm." },
            handover: { yes: true },
            body: "Still a good table, and Wendell refunded part of the freight.",
            answer: "You're right — we missed that check. We now photograph both ends of every slab.",
            daysAfter: 3,
          },
        },
      },
      { slabs: [2], title: "White ash slab from Station Road", description: "Flattened; straight, pale grain.", perBf: 9 },
      { slabs: [4], title: "Ash slab for a desk top", description: "Flattened, kiln-finished.", perBf: 9 },
      { slabs: [5, 6], title: "Ash sequential pair for shelving", description: "Two outer slabs, matching grain.", perBf: 8 },
    ],
  },
  {
    yard: ASHGROVE,
    species: "american-elm",
    town: "Ashgrove",
    where: "Old creamery lot",
    site: "construction",
    reason: "construction",
    felledMonthsAgo: 31,
    lengthMm: 2600,
    diameterMm: 1100,
    notes: "A huge elm behind the old creamery; the lot is flats now. We kept the whole log together.",
    thicknessMm: 76,
    slabCount: 5,
    drying: "kiln",
    defects: { 2: ["cracks", "butterfly_keys"], 3: ["butterfly_keys"] },
    listings: [
      {
        slabs: [1],
        title: "Elm outer slab, thick",
        description: "Three inches thick with bark on one side: a bench seat with character.",
        fixed: 520,
      },
      {
        slabs: [5],
        title: "Elm slab for a console table",
        description: "Narrower outer cut, flattened both faces.",
        perBf: 10,
        daysAgo: 1,
      },
      {
        slabs: [3],
        title: "Huge elm slab with walnut keys",
        description: "Over a metre wide; a long crack stitched with walnut butterfly keys.",
        fixed: 2_400,
        sale: {
          buyer: LAKEVIEW,
          handover: "freight",
          daysAgo: 70,
          end: "completed",
          review: {
            rating: 2,
            matched: { yes: true },
            handover: { yes: false, comment: "Arrived two weeks late." },
            body: "Call me on 555-0148 if you want to hear the whole story of this delivery.",
            daysAfter: 6,
            reportedBySawyer: "The review asks people to phone a number instead of saying what happened.",
          },
        },
      },
      { slabs: [2], title: "Elm slab with a keyed crack", description: "Stabilised crack, walnut keys, flattened.", perBf: 11 },
      { slabs: [4], title: "Wide elm slab, creamery log", description: "Flattened, kiln-finished.", perBf: 11 },
    ],
  },
  {
    yard: ASHGROVE,
    species: "hackberry",
    town: "Ashgrove",
    where: "Schoolhouse Lane",
    site: "street",
    reason: "disease",
    felledMonthsAgo: 21,
    lengthMm: 2300,
    diameterMm: 640,
    notes: "Hackberry stains if it dries slowly; we got it stickered within a day.",
    thicknessMm: 51,
    slabCount: 4,
    drying: "kiln",
    listings: [
      { slabs: [2], title: "Pale hackberry slab", description: "Flattened, creamy grey, no staining.", perBf: 8 },
      { slabs: [3], title: "Hackberry slab for a coffee table", description: "Flattened, kiln-finished.", perBf: 8 },
      { slabs: [1, 4], title: "Hackberry pair of outer slabs", description: "Both with bark; shelves or a bench.", fixed: 300 },
    ],
  },
  // Quarry Ridge Tree & Timber: an arborist crew that mills its own removals.
  {
    yard: QUARRY,
    species: "osage-orange",
    town: "Quarry Ridge",
    where: "Hedgerow at the quarry gate",
    site: "other",
    reason: "construction",
    felledMonthsAgo: 29,
    lengthMm: 1800,
    diameterMm: 480,
    notes: "An old hedge apple from the quarry's boundary row. Turns from yellow to russet with light.",
    thicknessMm: 51,
    slabCount: 4,
    drying: "kiln",
    listings: [
      {
        slabs: [2],
        title: "Osage orange slab, bright yellow",
        description: "Flattened; it ambers with time.",
        perBf: 22,
        sale: {
          buyer: HOLLOWPINE,
          handover: "pickup",
          daysAgo: 44,
          end: "completed",
          review: {
            rating: 5,
            matched: { yes: true },
            handover: { yes: true },
            body: "For bridges and fretboard binding. Wonderful stuff.",
            answer: "Thanks Sam — save us the offcuts, we want to see a guitar.",
            daysAfter: 2,
          },
        },
      },
      { slabs: [3], title: "Osage orange slab for a small table", description: "Flattened; very hard, very heavy.", perBf: 22 },
      { slabs: [1, 4], title: "Osage orange outer pair", description: "Small slabs for boxes and handles.", fixed: 180 },
    ],
  },
  {
    yard: QUARRY,
    species: "norway-maple",
    town: "Quarry Ridge",
    where: "Ridge Avenue",
    site: "street",
    reason: "hazard",
    felledMonthsAgo: 23,
    lengthMm: 2700,
    diameterMm: 760,
    notes: "Girdling roots were lifting the sidewalk. Even, pale wood.",
    thicknessMm: 51,
    slabCount: 5,
    drying: "kiln",
    listings: [
      {
        slabs: [3],
        title: "Norway maple dining slab",
        description: "Flattened, kiln-finished; pale and even.",
        perBf: 10,
        sale: { buyer: FENNIMORE, handover: "pickup", daysAgo: 4, end: "ready_for_pickup" },
      },
      { slabs: [2, 4], title: "Norway maple pair for a glued top", description: "Neighbouring slabs, flattened.", perBf: 10 },
      { slabs: [1], title: "Norway maple shelf slab", description: "Narrow outer cut.", fixed: 140 },
      {
        slabs: [5],
        title: "Norway maple slab, one live edge",
        description: "Sawn straight on one side.",
        perBf: 9,
        status: "in_review",
        daysAgo: 3,
      },
    ],
  },
  {
    yard: QUARRY,
    species: "northern-catalpa",
    town: "Quarry Ridge",
    where: "Church hall garden",
    site: "private_yard",
    reason: "hazard",
    felledMonthsAgo: 9,
    lengthMm: 2200,
    diameterMm: 700,
    notes: "Hollowing at the base. Light, stable, smells faintly of coffee when cut.",
    thicknessMm: 57,
    slabCount: 4,
    drying: "drying",
  },
  // Millbrook Kiln Works: the region's biggest kiln; dries for the other yards too.
  {
    yard: MILLBROOK,
    species: "black-walnut",
    town: "Millbrook",
    where: "Mill pond",
    site: "park",
    reason: "storm",
    felledMonthsAgo: 32,
    lengthMm: 3100,
    diameterMm: 820,
    notes: "The mill pond walnut, uprooted in the spring flood. Long, clear and dark.",
    thicknessMm: 57,
    slabCount: 6,
    drying: "kiln",
    surfacing: "sanded",
    features: { 3: ["figure"], 4: ["figure"] },
    listings: [
      {
        slabs: [3, 4],
        set: "bookmatched",
        title: "Mill pond walnut, bookmatched for a 3 m table",
        description: "Long, clear leaves with a little curl; sanded to 120.",
        fixed: 5_200,
      },
      {
        slabs: [2],
        title: "Long walnut slab, mill pond log",
        description: "Sanded; a sapwood stripe on one edge.",
        perBf: 28,
        sale: {
          buyer: WENDELS,
          handover: "freight",
          daysAgo: 63,
          end: "completed",
          review: {
            rating: 5,
            matched: { yes: true },
            handover: { yes: true, comment: "Delivered into the garage with two people." },
            body: "The best purchase of our renovation.",
            answer: "Enjoy it! Oil it twice a year for the first couple of years.",
            daysAfter: 3,
          },
        },
      },
      {
        slabs: [5],
        title: "Walnut slab for a desk",
        description: "Sanded, kiln-finished.",
        perBf: 27,
        sale: { buyer: FERNHILL, handover: "pickup", daysAgo: 16, end: "cancelled", cancelReason: "Our client changed the design to oak." },
      },
      { slabs: [1, 6], title: "Walnut outer slabs, pair", description: "Narrow with bark; shelves or a bench.", perBf: 22 },
    ],
  },
  {
    yard: MILLBROOK,
    species: "northern-red-oak",
    town: "Millbrook",
    where: "Fairgrounds",
    site: "park",
    reason: "disease",
    felledMonthsAgo: 36,
    lengthMm: 3000,
    diameterMm: 1000,
    notes: "Oak wilt took three of the fairground oaks; this was the biggest.",
    thicknessMm: 64,
    slabCount: 6,
    drying: "kiln",
    defects: { 1: ["checks"], 6: ["checks"] },
    listings: [
      { slabs: [3, 4], title: "Red oak sequential pair, fairground oak", description: "Two centre slabs for a glued top.", perBf: 11 },
      {
        slabs: [2],
        title: "Red oak slab for a conference table",
        description: "Flattened, kiln-finished.",
        perBf: 11,
        sale: {
          buyer: LAKEVIEW,
          handover: "freight",
          daysAgo: 28,
          end: "completed",
          review: {
            rating: 4,
            matched: { yes: true },
            handover: { yes: true },
            body: "Straightforward, well dried, fair price.",
            daysAfter: 4,
          },
        },
      },
      { slabs: [5], title: "Red oak slab, fairground log", description: "Flattened both faces.", perBf: 10 },
      { slabs: [1], title: "Red oak end slab with checks", description: "Checks stabilised; a rustic bench.", fixed: 240 },
      { slabs: [6], title: "Red oak bench slab", description: "Outer cut, bark on both edges.", fixed: 260 },
    ],
  },
  {
    yard: MILLBROOK,
    species: "sweetgum",
    town: "Millbrook",
    where: "Library lawn",
    site: "park",
    reason: "hazard",
    felledMonthsAgo: 19,
    lengthMm: 2400,
    diameterMm: 660,
    notes: "Dropped gumballs on the library steps for sixty years. Dark streaks in the heart.",
    thicknessMm: 51,
    slabCount: 4,
    drying: "kiln",
    listings: [
      { slabs: [2], title: "Sweetgum slab with dark streaks", description: "Flattened; the streaks show best oiled.", perBf: 9 },
      { slabs: [3], title: "Sweetgum slab for a side table", description: "Flattened, kiln-finished.", perBf: 9 },
      {
        slabs: [1, 4],
        title: "Sweetgum pair of shelf slabs",
        description: "Outer cuts, bark on.",
        fixed: 220,
        status: "in_review",
        daysAgo: 2,
      },
    ],
  },
  {
    yard: MILLBROOK,
    species: "white-oak",
    town: "Millbrook",
    where: "Covered bridge road",
    site: "street",
    reason: "construction",
    felledMonthsAgo: 13,
    lengthMm: 2800,
    diameterMm: 780,
    notes: "Cleared for the bridge repairs. Air-dried under the kiln shed roof; goes in the kiln next.",
    thicknessMm: 51,
    slabCount: 4,
    drying: "air",
    listings: [
      { slabs: [1], title: "Air-dried white oak shelf slab", description: "Outer slab, air-dried to the mid teens.", fixed: 210 },
      { slabs: [2, 3], title: "Air-dried white oak pair", description: "Air-dried to the mid teens; finish indoors.", perBf: 11 },
    ],
  },
  // Old Harbour Sawyers: a shared workshop in the old harbour sheds.
  {
    yard: HARBOUR,
    species: "american-sycamore",
    town: "Lakemont",
    where: "Harbour sheds",
    site: "construction",
    reason: "construction",
    felledMonthsAgo: 24,
    lengthMm: 2900,
    diameterMm: 940,
    notes: "Grew against the net shed for a century; came down when the shed was restored.",
    thicknessMm: 57,
    slabCount: 5,
    drying: "kiln",
    listings: [
      {
        slabs: [3],
        title: "Harbour sycamore slab with lace fleck",
        description: "Flattened; ray fleck near the pith.",
        perBf: 9,
        sale: {
          buyer: CALLOWAY,
          handover: "freight",
          daysAgo: 9,
          end: "shipped",
        },
      },
      { slabs: [2, 4], title: "Sycamore pair from the harbour sheds", description: "Flattened, kiln-finished.", perBf: 9 },
      { slabs: [1], title: "Sycamore shelf slab, harbour log", description: "Outer cut.", fixed: 150 },
      { slabs: [5], title: "Sycamore slab, mottled bark edge", description: "Flattened both faces.", fixed: 210 },
    ],
  },
  {
    yard: HARBOUR,
    species: "kentucky-coffeetree",
    town: "Lakemont",
    where: "Ferry Street",
    site: "street",
    reason: "storm",
    felledMonthsAgo: 26,
    lengthMm: 2500,
    diameterMm: 620,
    notes: "A rare street coffeetree, split by lightning. Reddish-brown heart with a wide sapwood band.",
    thicknessMm: 51,
    slabCount: 4,
    drying: "kiln",
    listings: [
      {
        slabs: [2],
        title: "Kentucky coffeetree slab",
        description: "Flattened; open grain like ash, colour like walnut-light.",
        perBf: 13,
        sale: {
          buyer: FENNIMORE,
          handover: "pickup",
          daysAgo: 38,
          end: "completed",
        },
      },
      { slabs: [3], title: "Coffeetree slab for a bench", description: "Flattened, kiln-finished.", perBf: 13 },
      { slabs: [1, 4], title: "Coffeetree outer pair", description: "Narrow slabs with bark.", fixed: 260 },
    ],
  },
  {
    yard: HARBOUR,
    species: "red-mulberry",
    town: "Lakemont",
    where: "Allotment gardens",
    site: "private_yard",
    reason: "other",
    felledMonthsAgo: 15,
    lengthMm: 1700,
    diameterMm: 440,
    notes: "Cleared for new raised beds. Golden when cut, browning with age.",
    thicknessMm: 44,
    slabCount: 3,
    drying: "kiln",
    surfacing: "sanded",
    listings: [
      { slabs: [2], title: "Mulberry slab, golden heart", description: "Sanded; small and bright.", fixed: 180 },
      { slabs: [1, 3], title: "Mulberry pair for boxes", description: "Sanded outer cuts.", fixed: 150, status: "draft" },
    ],
  },
  // Tamarack Lane Slabs: a backyard mill, mostly fruit and nut trees.
  {
    yard: TAMARACK,
    species: "black-cherry",
    town: "East Lakemont",
    where: "Tamarack Lane orchard",
    site: "private_yard",
    reason: "disease",
    felledMonthsAgo: 30,
    lengthMm: 2100,
    diameterMm: 520,
    notes: "An old orchard cherry, hollow at one end. Deep red heart.",
    thicknessMm: 44,
    slabCount: 5,
    drying: "kiln",
    surfacing: "sanded",
    liveEdge: "both",
    defects: { 3: ["voids_filled"] },
    listings: [
      {
        slabs: [2, 3],
        set: "bookmatched",
        title: "Orchard cherry bookmatch for a coffee table",
        description: "Sanded; a filled void near one end of the second leaf.",
        fixed: 780,
        sale: {
          buyer: BRANDTS,
          handover: "pickup",
          daysAgo: 21,
          end: "completed",
          review: {
            rating: 5,
            matched: { yes: true, comment: "The filled void is exactly where the photo showed." },
            handover: { yes: true },
            body: "Fenwick showed us the stump it came from.",
            daysAfter: 1,
          },
        },
      },
      { slabs: [4], title: "Cherry slab from the orchard", description: "Sanded, kiln-finished.", perBf: 14 },
      { slabs: [1], title: "Small cherry slab, bark on", description: "Sanded outer cut.", fixed: 110 },
      { slabs: [5], title: "Cherry shelf slab", description: "Sanded; one straight edge.", fixed: 125 },
    ],
  },
  {
    yard: TAMARACK,
    species: "black-walnut",
    town: "East Lakemont",
    where: "Miller's hedge",
    site: "private_yard",
    reason: "hazard",
    felledMonthsAgo: 17,
    lengthMm: 2000,
    diameterMm: 500,
    notes: "A hedge walnut leaning over the neighbour's garage.",
    thicknessMm: 44,
    slabCount: 4,
    drying: "air",
    listings: [
      {
        slabs: [4],
        title: "Small walnut slab with sapwood, air-dried",
        description: "Rough sawn; the creamy sapwood edge contrasts with the dark heart.",
        fixed: 120,
      },
      { slabs: [2, 3], title: "Air-dried walnut pair, rough", description: "Air-dried only; rough sawn.", perBf: 18 },
      { slabs: [1], title: "Walnut offcut slab, air-dried", description: "Small; for boxes or a cutting board.", fixed: 95 },
    ],
  },
  {
    yard: TAMARACK,
    species: "silver-maple",
    town: "East Lakemont",
    where: "Lane's end",
    site: "street",
    reason: "storm",
    felledMonthsAgo: 20,
    lengthMm: 2400,
    diameterMm: 760,
    notes: "Silver maple spalts fast; we caught it at its best.",
    thicknessMm: 51,
    slabCount: 4,
    drying: "kiln",
    features: { 2: ["spalting"], 3: ["spalting"] },
    listings: [
      {
        slabs: [1],
        title: "Silver maple outer slab, light spalting",
        description: "Flattened; a few spalt lines near the bark.",
        fixed: 180,
        daysAgo: 3,
      },
      { slabs: [2], title: "Spalted silver maple coffee table slab", description: "Flattened and stabilised.", perBf: 12 },
      { slabs: [3], title: "Spalted silver maple bench slab", description: "Flattened.", perBf: 12 },
    ],
  },
];

/** Every demo log of the new stock, with its slabs, readings and listings (dates from `now`). */
export function lakemontStock(now: Date): DemoLog[] {
  return buildLogs(SPECS, now);
}
