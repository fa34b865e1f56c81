import sharp from "sharp";

/**
 * Demo photos of slabs, painted pixel by pixel at seed time so the seed needs no photo files: the
 * slab's real outline (from its width stations) seen from above on stickers in a yard, with the
 * grain a flat-sawn slab shows — growth rings cut by the saw plane (cathedral arches where the
 * log tapers, straighter stripes near the pith), earlywood and latewood, pores, sapwood towards
 * the live edge and a bark line on it — in the species' colours, plus what the listing says:
 * spalting, figure, crotch feathering, end checks, butterfly keys, filled voids, saw marks on a
 * rough-sawn face.
 *
 * Speed: the ring pattern of each species is painted once per run into a small texture in slab
 * coordinates (`woodTexture`, a fraction of a second), and each photo samples it (shifted,
 * mirrored for a bookmatched leaf) and adds what belongs to that slab: its outline, bark, sapwood
 * and defects. Noise comes from a few small tileable fields, also made once.
 */

interface SlabPhotoSlab {
  lengthMm: number;
  widthStationsMm: number[];
  liveEdge: "both" | "one" | "none";
  surfacing: "rough_sawn" | "flattened" | "sanded";
  features: readonly string[];
  defects: readonly string[];
}

export interface SlabPhotoInput {
  speciesSlug: string;
  slabs: SlabPhotoSlab[];
  setKind: "single" | "sequential" | "bookmatched";
  /** Varies the grain, the angle and the yard behind it. */
  seed: number;
  /** Chainsaw-milled rough faces show arcs instead of the band saw's straight marks. */
  mill?: "band" | "chainsaw";
}

type Rgb = readonly [number, number, number];
interface Palette {
  heart: Rgb;
  sap: Rgb;
  /** The latewood (or pore band) colour the rings are drawn in. */
  line: Rgb;
  bark: Rgb;
  /** 0–1: how strongly the rings show (ring-porous woods high). */
  contrast: number;
  /** Ring spacing in mm (fast-grown city trees run wide). */
  ringMm: number;
  /** Ring-porous: a band of open pores at the start of each ring. */
  ringPorous: boolean;
  /** Flecks of ray tissue (oaks, sycamores). */
  rays: number;
}

const hex = (value: string): Rgb => [parseInt(value.slice(1, 3), 16), parseInt(value.slice(3, 5), 16), parseInt(value.slice(5, 7), 16)];
const palette = (
  heart: string,
  sap: string,
  line: string,
  bark: string,
  contrast: number,
  ringMm: number,
  ringPorous: boolean,
  rays = 0,
) => ({
  heart: hex(heart),
  sap: hex(sap),
  line: hex(line),
  bark: hex(bark),
  contrast,
  ringMm,
  ringPorous,
  rays,
});

/** Colours of freshly surfaced wood, by species (approximate, from the look of each wood). */
const PALETTES: Record<string, Palette> = {
  "silver-maple": palette("#c4a27c", "#e9dcc2", "#a98660", "#6e6358", 0.35, 9, false),
  "red-maple": palette("#bf9670", "#e6d3b3", "#9f7a55", "#5f5852", 0.35, 7, false),
  "sugar-maple": palette("#caa27a", "#eee1c8", "#b08863", "#5d5045", 0.3, 5, false),
  "norway-maple": palette("#d1b38e", "#eadcc0", "#b4946f", "#4f4741", 0.3, 6, false),
  "northern-red-oak": palette("#c08a63", "#dcc39e", "#8f5e3e", "#4b3e35", 0.75, 6, true, 0.25),
  "white-oak": palette("#aa845a", "#d8c39f", "#7a5a38", "#6b625a", 0.7, 4, true, 0.5),
  "black-walnut": palette("#5e3e2a", "#d8c2a0", "#3e2618", "#3a3029", 0.55, 6, false),
  "american-elm": palette("#a97b55", "#dac6a6", "#7d5436", "#58493d", 0.65, 7, true),
  "honey-locust": palette("#b5683f", "#e3cb98", "#864526", "#3f3630", 0.7, 8, true),
  "white-ash": palette("#c4a883", "#ece0c7", "#9a7d59", "#635b50", 0.8, 6, true),
  "american-sycamore": palette("#c39a78", "#e0c9a8", "#a67c5b", "#b5ab98", 0.3, 7, false, 0.8),
  "london-plane": palette("#c29373", "#dfc6a4", "#a07053", "#a8a190", 0.3, 7, false, 0.8),
  "black-cherry": palette("#9c5b3b", "#d9c19c", "#7c412b", "#3b302c", 0.4, 4, false),
  hackberry: palette("#d8c9a6", "#e7dcc2", "#b7a27c", "#8a857c", 0.55, 7, true),
  "kentucky-coffeetree": palette("#93603f", "#dcc49c", "#6c4129", "#4a4039", 0.7, 7, true),
  "osage-orange": palette("#d59b33", "#ecd79c", "#a8701c", "#6b5237", 0.6, 4, true),
  "northern-catalpa": palette("#b69871", "#d8c7a5", "#8f7250", "#695f54", 0.6, 10, true),
  "red-mulberry": palette("#b9852f", "#e0cd98", "#8a5e1d", "#5f5040", 0.65, 6, true),
  "eastern-red-cedar": palette("#a9503c", "#e7d3ad", "#843829", "#6b4a3b", 0.4, 4, false),
  "black-locust": palette("#b29a4d", "#e2d39c", "#84702f", "#4a4136", 0.7, 5, true),
  "shagbark-hickory": palette("#a97a52", "#e3cfab", "#7e5636", "#7a7268", 0.65, 6, true),
  sweetgum: palette("#ae8c6d", "#dccab0", "#86664c", "#4d443c", 0.3, 6, false),
};
const FALLBACK = palette("#bf9a72", "#e4d1b0", "#96724f", "#5a4e44", 0.5, 6, false);

// ---- Noise: small tileable fields, made once and sampled bilinearly ----------------------------

const FIELD = 256;
/** A seeded pseudo-random generator (mulberry32). */
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

/** Fractal value noise on a FIELD × FIELD torus, 0–1 (a few octaves summed and normalised). */
function fractalField(seed: number, baseCells: number, octaves: number): Float32Array {
  const rand = random(seed);
  const field = new Float32Array(FIELD * FIELD);
  let amplitude = 1;
  let total = 0;
  for (let octave = 0, cells = baseCells; octave < octaves; octave++, cells *= 2) {
    const lattice = Float32Array.from({ length: cells * cells }, rand);
    for (let y = 0; y < FIELD; y++) {
      const fy = (y / FIELD) * cells;
      const y0 = Math.floor(fy);
      const ty = fy - y0;
      const sy = ty * ty * (3 - 2 * ty);
      for (let x = 0; x < FIELD; x++) {
        const fx = (x / FIELD) * cells;
        const x0 = Math.floor(fx);
        const tx = fx - x0;
        const sx = tx * tx * (3 - 2 * tx);
        const a = lattice[(y0 % cells) * cells + (x0 % cells)]!;
        const b = lattice[(y0 % cells) * cells + ((x0 + 1) % cells)]!;
        const c = lattice[((y0 + 1) % cells) * cells + (x0 % cells)]!;
        const d = lattice[((y0 + 1) % cells) * cells + ((x0 + 1) % cells)]!;
        field[y * FIELD + x]! += amplitude * (a + (b - a) * sx + (c - a) * sy + (a - b - c + d) * sx * sy);
      }
    }
    total += amplitude;
    amplitude *= 0.5;
  }
  for (let i = 0; i < field.length; i++) field[i] = field[i]! / total;
  return field;
}

let fields: { warp: Float32Array; fine: Float32Array; blotch: Float32Array } | null = null;
/** The noise fields (made on first use: about 30 ms). */
function noiseFields() {
  fields ??= { warp: fractalField(11, 4, 4), fine: fractalField(23, 32, 2), blotch: fractalField(37, 3, 5) };
  return fields;
}

/** A bilinear sample of a field at (x, y) in field cells; the field repeats. */
function sample(field: Float32Array, x: number, y: number): number {
  const fx = x - Math.floor(x / FIELD) * FIELD;
  const fy = y - Math.floor(y / FIELD) * FIELD;
  const x0 = fx | 0;
  const y0 = fy | 0;
  const tx = fx - x0;
  const ty = fy - y0;
  const x1 = (x0 + 1) & (FIELD - 1);
  const y1 = (y0 + 1) & (FIELD - 1);
  const a = field[y0 * FIELD + x0]!;
  const b = field[y0 * FIELD + x1]!;
  const c = field[y1 * FIELD + x0]!;
  const d = field[y1 * FIELD + x1]!;
  return a + (b - a) * tx + (c - a) * ty + (a - b - c + d) * tx * ty;
}

const smoothstep = (edge0: number, edge1: number, x: number) => {
  const t = Math.min(1, Math.max(0, (x - edge0) / (edge1 - edge0)));
  return t * t * (3 - 2 * t);
};
const mix = (a: number, b: number, t: number) => a + (b - a) * t;

// ---- The species' grain, painted once: ring lines and light in slab coordinates ----------------

/** Texels per mm of the grain textures (a photo shows about 0.3 px per mm of a long slab). */
const TEXTURE_SCALE = 0.4;
const TEXTURE_LENGTH_MM = 3200;
const TEXTURE_HALF_WIDTH_MM = 620;
/** Rings are drawn wider than life so they read at photo scale (a 6 mm ring would be 2 px). */
const RING_EXAGGERATION = 3.2;
/** The saw cut's mean distance from the pith in the texture, mm. */
const PITH_OFFSET_MM = 30;

interface WoodTexture {
  width: number;
  height: number;
  /** How much of the ring-line colour each texel takes (0–1). */
  line: Float32Array;
  /** Brightness of each texel (pores, streaks, blotches), around 1. */
  light: Float32Array;
}

const textures = new Map<string, WoodTexture>();

/** The grain of a species as a flat-sawn slab shows it, pith along the middle (cached per run). */
function woodTexture(speciesSlug: string, colours: Palette): WoodTexture {
  const cached = textures.get(speciesSlug);
  if (cached) return cached;
  const { warp, fine, blotch } = noiseFields();
  const width = Math.round(TEXTURE_LENGTH_MM * TEXTURE_SCALE);
  const height = Math.round(2 * TEXTURE_HALF_WIDTH_MM * TEXTURE_SCALE);
  const line = new Float32Array(width * height);
  const light = new Float32Array(width * height);
  const seed = [...speciesSlug].reduce((sum, c) => sum + c.charCodeAt(0), 0) % 97;
  const ringMm = colours.ringMm * RING_EXAGGERATION;
  for (let y = 0; y < height; y++) {
    const v = y / TEXTURE_SCALE - TEXTURE_HALF_WIDTH_MM;
    for (let x = 0; x < width; x++) {
      const u = x / TEXTURE_SCALE;
      // The saw plane cuts the rings, cylinders round a pith that wanders (no log is straight):
      // where the cut rises and falls against them, the rings open into arches and ovals.
      // (Noise scales: the warp field's features are 64 units, the fine field's 8, the blotch field's 85.)
      const depth =
        PITH_OFFSET_MM + (sample(warp, u * 0.08 + seed, 2.5 + seed) - 0.5) * 120 + (sample(warp, u * 0.3, v * 0.3 + seed) - 0.5) * 26;
      const off = v + (sample(warp, u * 0.04 + 40, seed) - 0.5) * 110;
      const radius = Math.sqrt(off * off + depth * depth) + (sample(warp, u * 1.0, v * 2.0 + seed) - 0.5) * 8;
      const years = radius / ringMm;
      // Wider and narrower years (wet summers and dry ones, a street tree crowded or freed), each its own shade.
      const phase = years + (sample(fine, years * 8 + seed, 3.5) - 0.5) * 0.7;
      const f = phase - Math.floor(phase);
      const year = Math.floor(phase);
      const weight = colours.ringPorous
        ? Math.max(smoothstep(0.22, 0.03, f), smoothstep(0.4, 0.88, f) * 0.5)
        : smoothstep(0.5, 0.9, f) * (1 - smoothstep(0.9, 1, f) * 0.6);
      const i = y * width + x;
      line[i] = weight * colours.contrast * (0.45 + sample(fine, year * 8 + 0.5, 60.5) * 0.9);
      // Pores and fibres: long thin streaks along the length; broad streaks of lighter and darker wood.
      let bright = 1 + (sample(fine, u * 0.05 + seed, v * 3) - 0.5) * (colours.ringPorous ? 0.14 : 0.07);
      bright *= 1 + (sample(blotch, u * 0.03 + seed, v * 0.3) - 0.5) * 0.32;
      bright *= 1 - smoothstep(0.6, 0.78, sample(blotch, u * 0.02 + 60, v * 0.6 + seed)) * 0.16;
      // Rays: short flecks, strongest near the pith where the cut runs along them.
      if (colours.rays > 0) {
        const fleck = sample(fine, u * 0.6 + seed, v * 4 + 7);
        if (fleck > 0.8) bright *= 1 - (fleck - 0.8) * 1.5 * colours.rays * (0.3 + (1 - smoothstep(20, 200, Math.abs(off))));
      }
      light[i] = bright;
    }
  }
  const texture = { width, height, line, light };
  textures.set(speciesSlug, texture);
  return texture;
}

/** A bilinear sample of a texture channel at slab coordinates (mm); along the length it mirrors at the ends (no seam). */
function textureAt(texture: WoodTexture, channel: Float32Array, u: number, v: number): number {
  const period = 2 * (texture.width - 1);
  let x = u * TEXTURE_SCALE;
  x -= Math.floor(x / period) * period;
  if (x > texture.width - 1) x = period - x;
  const y = Math.min(texture.height - 1.001, Math.max(0, (v + TEXTURE_HALF_WIDTH_MM) * TEXTURE_SCALE));
  const x0 = Math.min(texture.width - 2, x | 0);
  const y0 = y | 0;
  const tx = x - x0;
  const ty = y - y0;
  const row0 = y0 * texture.width;
  const row1 = row0 + texture.width;
  const a = channel[row0 + x0]!;
  const b = channel[row0 + x0 + 1]!;
  const c = channel[row1 + x0]!;
  const d = channel[row1 + x0 + 1]!;
  return a + (b - a) * tx + (c - a) * ty + (a - b - c + d) * tx * ty;
}

// ---- One slab in the picture -------------------------------------------------------------------

interface PlacedSlab {
  slab: SlabPhotoSlab;
  /** The centre line's left end in the picture (px), and px per mm. */
  originX: number;
  originY: number;
  scale: number;
  /** Where this slab's grain comes from in the species texture: a shift along and across, and a mirror. */
  textureShiftU: number;
  textureShiftV: number;
  mirrored: boolean;
  /** Per millimetre of length: the distance from the centre line to each edge, the bark's depth and the sapwood's. */
  upper: Float32Array;
  lower: Float32Array;
  bark: Float32Array;
  sapwood: Float32Array;
  checks: { fromEnd: "left" | "right"; acrossMm: number; lengthMm: number; widthMm: number }[];
  keys: { alongMm: number; acrossMm: number }[];
  voids: { alongMm: number; acrossMm: number; radiusMm: number }[];
  noiseSeed: number;
  figure: boolean;
  crotch: boolean;
  spalting: boolean;
}

function placeSlabs(input: SlabPhotoInput, width: number, height: number, rand: () => number): PlacedSlab[] {
  const { slabs } = input;
  const { warp } = noiseFields();
  const longest = Math.max(...slabs.map((s) => s.lengthMm));
  const gapMm = 70;
  const totalWidth = slabs.reduce((sum, s) => sum + Math.max(...s.widthStationsMm), 0) + gapMm * (slabs.length - 1);
  const scale = Math.min((width * 0.88) / longest, (height * 0.78) / totalWidth);
  let top = height / 2 - (totalWidth * scale) / 2;
  const shiftU = rand() * TEXTURE_LENGTH_MM;
  const shiftV = (rand() - 0.5) * 80;
  const noiseSeed = Math.floor(rand() * 200);
  return slabs.map((slab, index) => {
    const widest = Math.max(...slab.widthStationsMm);
    const originY = top + (widest * scale) / 2;
    top += (widest + gapMm) * scale;
    const length = Math.ceil(slab.lengthMm) + 1;
    const upper = new Float32Array(length);
    const lower = new Float32Array(length);
    const bark = new Float32Array(length);
    const sapwood = new Float32Array(length);
    const stations = slab.widthStationsMm;
    const upperLive = slab.liveEdge !== "none";
    const lowerLive = slab.liveEdge === "both";
    // A bookmatched pair shares one face's grain (the second mirrored); sequential slabs are neighbours a cut apart.
    const seed = noiseSeed + (input.setKind === "bookmatched" ? 0 : index * 13);
    for (let u = 0; u < length; u++) {
      const position = (u / slab.lengthMm) * (stations.length - 1);
      const low = Math.min(stations.length - 2, Math.floor(position));
      const half = mix(stations[low]!, stations[low + 1]!, Math.min(1, position - low)) / 2;
      // A live edge wanders (bark ridges, old branch stubs); a sawn edge is straight.
      const wander = (offset: number) =>
        (sample(warp, u * 0.04 + seed, offset) - 0.5) * half * 0.16 + (sample(warp, u * 0.35, seed + offset) - 0.5) * 14;
      upper[u] = half + (upperLive ? wander(3.5) : 0);
      lower[u] = half - (lowerLive ? wander(97.5) : 0);
      bark[u] = 18 + sample(warp, u * 0.5 + seed, 12.5) * 26;
      sapwood[u] = 26 + sample(warp, u * 0.1 + seed, 40.5) * 50;
    }
    const checks: PlacedSlab["checks"] = slab.defects.includes("checks")
      ? [0, 1, 2].map(() => ({
          fromEnd: rand() < 0.5 ? ("left" as const) : ("right" as const),
          acrossMm: (rand() - 0.5) * widest * 0.6,
          lengthMm: slab.lengthMm * (0.04 + rand() * 0.07),
          widthMm: 3 + rand() * 3,
        }))
      : slab.defects.includes("cracks")
        ? [
            {
              fromEnd: "left" as const,
              acrossMm: (rand() - 0.5) * widest * 0.3,
              lengthMm: slab.lengthMm * (0.15 + rand() * 0.1),
              widthMm: 6,
            },
          ]
        : [];
    const keys: PlacedSlab["keys"] = [];
    if (slab.defects.includes("butterfly_keys")) {
      if (!checks.length)
        checks.push({ fromEnd: "left", acrossMm: (rand() - 0.5) * widest * 0.2, lengthMm: slab.lengthMm * 0.16, widthMm: 4 });
      const crack = checks[0]!;
      const along = (share: number) => (crack.fromEnd === "left" ? crack.lengthMm * share : slab.lengthMm - crack.lengthMm * share);
      keys.push({ alongMm: along(0.3), acrossMm: crack.acrossMm }, { alongMm: along(0.7), acrossMm: crack.acrossMm });
    }
    const voids = slab.defects.includes("voids_filled")
      ? [{ alongMm: slab.lengthMm * (0.55 + rand() * 0.2), acrossMm: (rand() - 0.5) * widest * 0.25, radiusMm: 30 + rand() * 18 }]
      : [];
    return {
      slab,
      originX: width / 2 - (slab.lengthMm * scale) / 2,
      originY,
      scale,
      textureShiftU: shiftU + (input.setKind === "sequential" ? index * 35 : 0),
      textureShiftV: shiftV + (input.setKind === "sequential" ? index * 28 : 0),
      mirrored: input.setKind === "bookmatched" && index % 2 === 1,
      upper,
      lower,
      bark,
      sapwood,
      checks,
      keys,
      voids,
      noiseSeed: seed,
      figure: slab.features.includes("figure"),
      crotch: slab.features.includes("crotch"),
      spalting: slab.features.includes("spalting"),
    };
  });
}

// ---- The picture -------------------------------------------------------------------------------

/** The demo photos' size: 16:10, like the catalogue's cards and the slab page's gallery. */
const SLAB_PHOTO_SIZE = { width: 960, height: 600 } as const;

/** Paints the photo and returns it as JPEG bytes (what a phone would upload). */
export async function slabPhoto(input: SlabPhotoInput): Promise<Buffer> {
  const { width, height } = SLAB_PHOTO_SIZE;
  return sharp(paint(input, width, height), { raw: { width, height, channels: 3 } })
    .jpeg({ quality: 88 })
    .toBuffer();
}

/** Grit and blotches of the ground, the same for every photo (made once). */
let groundShade: Float32Array | null = null;

/** The raw RGB pixels of the photo. */
function paint(input: SlabPhotoInput, width: number, height: number): Buffer {
  const { fine } = noiseFields();
  const rand = random(input.seed * 7919 + 17);
  const colours = PALETTES[input.speciesSlug] ?? FALLBACK;
  const texture = woodTexture(input.speciesSlug, colours);
  const placed = placeSlabs(input, width, height, rand);
  const angle = (rand() - 0.5) * 0.05;
  const cos = Math.cos(angle);
  const sin = Math.sin(angle);
  const cx = width / 2;
  const cy = height / 2;
  if (!groundShade || groundShade.length !== width * height) {
    const { blotch } = noiseFields();
    groundShade = new Float32Array(width * height);
    for (let y = 0; y < height; y++)
      for (let x = 0; x < width; x++)
        groundShade[y * width + x] = 0.78 + sample(fine, x * 0.9, y * 0.9) * 0.2 + sample(blotch, x * 0.5, y * 0.5) * 0.22;
  }
  // The yard: concrete or packed gravel (the grit shifted for each photo), stickers under the slab.
  const ground = rand() < 0.5 ? [150, 146, 138] : [132, 124, 110];
  const groundShift = Math.floor(rand() * width);
  const stickerCount = 3 + Math.floor(rand() * 2);
  const stickers = Array.from({ length: stickerCount }, (_, i) => width * (0.12 + (0.76 * (i + 0.5)) / stickerCount) + (rand() - 0.5) * 24);
  const stickerHalf = 17;
  const mill = input.mill ?? "band";

  // First pass: which slab each pixel shows (0: none), and where on it (mm).
  const which = new Uint8Array(width * height);
  const along = new Float32Array(width * height);
  const across = new Float32Array(width * height);
  for (let y = 0; y < height; y++) {
    for (let x = 0; x < width; x++) {
      // Undo the small turn of the whole set around the picture's centre.
      const rx = cx + (x - cx) * cos + (y - cy) * sin;
      const ry = cy - (x - cx) * sin + (y - cy) * cos;
      for (let s = 0; s < placed.length; s++) {
        const slab = placed[s]!;
        const u = (rx - slab.originX) / slab.scale;
        if (u < 0 || u >= slab.upper.length - 1) continue;
        const v = (slab.originY - ry) / slab.scale;
        const step = u | 0;
        if (v > slab.upper[step]! || v < -slab.lower[step]!) continue;
        const i = y * width + x;
        which[i] = s + 1;
        along[i] = u;
        across[i] = v;
        break;
      }
    }
  }

  const out = new Uint8ClampedArray(width * height * 3);
  const colour: [number, number, number] = [0, 0, 0];
  const shadowX = 7;
  const shadowY = 11;
  for (let y = 0; y < height; y++) {
    for (let x = 0; x < width; x++) {
      const i = y * width + x;
      let r: number;
      let g: number;
      let b: number;
      if (which[i]) {
        woodColour(placed[which[i] - 1]!, along[i]!, across[i]!, colours, texture, mill, colour);
        r = colour[0];
        g = colour[1];
        b = colour[2];
      } else {
        // Ground with grit, stickers, and the slab's soft shadow.
        const shifted = x + groundShift < width ? i + groundShift : i + groundShift - width;
        let shade = groundShade[shifted]!;
        r = ground[0]! * shade;
        g = ground[1]! * shade;
        b = ground[2]! * shade;
        for (let k = 0; k < stickers.length; k++) {
          const distance = Math.abs(x - stickers[k]!);
          if (distance >= stickerHalf) continue;
          shade = 0.84 + sample(fine, x * 0.15, y * 2.2) * 0.2 - distance / stickerHalf / 7;
          r = 198 * shade;
          g = 172 * shade;
          b = 130 * shade;
        }
        if (x >= shadowX && y >= shadowY && which[i - shadowY * width - shadowX]) {
          const deep = x >= 2 * shadowX && y >= 2 * shadowY && which[i - 2 * shadowY * width - 2 * shadowX];
          const soft = deep ? 0.5 : 0.66;
          r *= soft;
          g *= soft;
          b *= soft * 1.04;
        }
      }
      // Daylight from the upper left, and a little falloff to the corners as a phone lens gives.
      const dx = (x - cx) / width;
      const dy = (y - cy) / height;
      const light = 1.06 - 0.1 * (dx + dy) - 0.3 * (dx * dx + dy * dy);
      const o = i * 3;
      out[o] = r * light;
      out[o + 1] = g * light;
      out[o + 2] = b * light;
    }
  }
  return Buffer.from(out.buffer);
}

/** The colour of the wood at (u, v) mm on a placed slab, into `out`. */
function woodColour(
  placed: PlacedSlab,
  u: number,
  vPicture: number,
  colours: Palette,
  texture: WoodTexture,
  mill: "band" | "chainsaw",
  out: [number, number, number],
): void {
  const { warp, fine, blotch } = noiseFields();
  const { slab, noiseSeed: seed } = placed;
  const step = u | 0;
  const upper = placed.upper[step]!;
  const lower = placed.lower[step]!;
  const toUpper = upper - vPicture;
  const toLower = vPicture + lower;
  const upperLive = slab.liveEdge !== "none";
  const lowerLive = slab.liveEdge === "both";

  // Bark on a live edge: ridged, fissured dark bark, then a thin pale line of inner bark.
  const barkMm = placed.bark[step]!;
  const liveDistance = Math.min(upperLive ? toUpper : Infinity, lowerLive ? toLower : Infinity);
  if (liveDistance < barkMm) {
    const depth = liveDistance / barkMm;
    const ridge = sample(fine, u * 0.3 + seed, depth * 4 + (toUpper < toLower ? 0 : 40));
    const fissure = sample(warp, u * 1.2 + seed, 20 + depth * 6);
    let shade = 0.5 + ridge * 0.75 - (fissure > 0.62 ? 0.35 : 0);
    if (depth > 0.88) shade = 1.3; // inner bark: a thin pale, brownish line against the sapwood
    out[0] = colours.bark[0] * shade;
    out[1] = colours.bark[1] * shade;
    out[2] = colours.bark[2] * shade * 0.95;
    return;
  }

  // The grain from the species texture; a bookmatched leaf mirrors its neighbour's.
  const v = placed.mirrored ? -vPicture : vPicture;
  const tu = u + placed.textureShiftU;
  const tv = v + placed.textureShiftV;
  let line = textureAt(texture, texture.line, tu, tv);
  let light = textureAt(texture, texture.light, tu, tv);

  // Sapwood: the outer rings, in from the live edge (and towards a sawn edge where the tree was wide).
  const edge = Math.min(upperLive ? toUpper : toUpper + 60, lowerLive ? toLower : toLower + 60);
  const sapMm = placed.sapwood[step]!;
  const sap = smoothstep(sapMm + 6, sapMm - 10, edge + (sample(warp, u * 0.4 + seed, v * 0.4) - 0.5) * 24);
  line *= 1 - sap * 0.45;

  let r = mix(colours.heart[0], colours.sap[0], sap);
  let g = mix(colours.heart[1], colours.sap[1], sap);
  let b = mix(colours.heart[2], colours.sap[2], sap);
  r = mix(r, colours.line[0], line);
  g = mix(g, colours.line[1], line);
  b = mix(b, colours.line[2], line);

  if (placed.figure) {
    // Curl: soft, wavering bands of light across the width, in patches.
    const patch = smoothstep(0.35, 0.65, sample(blotch, u * 0.08 + seed, v * 0.15));
    light *= 1 + 0.07 * patch * Math.sin(u * 0.12 + v * 0.02 + (sample(warp, u * 0.25, v * 0.25 + seed) - 0.5) * 14);
  }
  if (placed.crotch) {
    // Crotch feathering: flame-shaped chevrons where two stems met, towards one end.
    const zone = smoothstep(slab.lengthMm * 0.5, slab.lengthMm * 0.08, u) * (1 - smoothstep(60, 220, Math.abs(v)));
    const feather = Math.sin(Math.abs(v) * 0.09 - u * 0.035 + sample(warp, u * 0.3, v * 0.3) * 5);
    light *= 1 + zone * 0.22 * feather;
    r = mix(r, colours.line[0], zone * 0.3 * (feather * 0.5 + 0.5));
    g = mix(g, colours.line[1], zone * 0.3 * (feather * 0.5 + 0.5));
    b = mix(b, colours.line[2], zone * 0.3 * (feather * 0.5 + 0.5));
  }
  if (placed.spalting) {
    // Spalting: thin black zone lines where fungi met (a net of them), bleached, greyed wood beside.
    const a = sample(blotch, u * 0.07 + seed * 2, v * 0.22 + 3);
    const c = sample(warp, u * 0.09 + 9, v * 0.28 + seed);
    const zoneLine = Math.max(1 - smoothstep(0.003, 0.009, Math.abs(a - 0.5)), 1 - smoothstep(0.003, 0.01, Math.abs(c - 0.47)));
    const bleach = smoothstep(0.48, 0.62, a) * 0.45;
    const jag = 0.75 + sample(fine, u * 1.5, v * 1.5) * 0.25;
    r = mix(mix(r, 214, bleach), 34, zoneLine * jag);
    g = mix(mix(g, 207, bleach), 30, zoneLine * jag);
    b = mix(mix(b, 194, bleach), 26, zoneLine * jag);
  }

  // Saw marks on a rough face: the band saw's straight lines across, the chainsaw mill's arcs.
  if (slab.surfacing === "rough_sawn") {
    const marks =
      mill === "chainsaw"
        ? Math.sin(Math.sqrt((u - slab.lengthMm * 0.5) ** 2 * 0.6 + (v + 1400) ** 2) * 0.22)
        : Math.sin((u + v * 0.06) * 0.3 + sample(warp, u * 0.2, v * 0.2) * 2);
    light *= 0.94 + 0.06 * marks;
    const grey = (r + g + b) / 3;
    r = mix(r, grey, 0.25) * 1.05;
    g = mix(g, grey, 0.25) * 1.05;
    b = mix(b, grey, 0.25) * 1.05;
  } else if (slab.surfacing === "sanded") {
    const grey = (r + g + b) / 3;
    r = mix(grey, r, 1.08) * 0.97;
    g = mix(grey, g, 1.08) * 0.97;
    b = mix(grey, b, 1.08) * 0.97;
  }

  // Defects the listing names: end checks and cracks, butterfly keys across them, filled voids.
  for (const check of placed.checks) {
    const along = check.fromEnd === "left" ? u : slab.lengthMm - u;
    if (along >= check.lengthMm) continue;
    const halfWidth = (check.widthMm * (1 - along / check.lengthMm)) / 2;
    const path = check.acrossMm + (sample(warp, along * 0.3 + check.acrossMm, 8.5) - 0.5) * 22;
    const off = Math.abs(v - path);
    if (off < halfWidth + 0.8) light *= 0.2;
    else if (off < halfWidth + 4) light *= 0.85;
  }
  for (const key of placed.keys) {
    // A bowtie of walnut across the crack: 100 mm long, 26 mm at the waist, 56 mm at the ends.
    const du = Math.abs(u - key.alongMm);
    const dv = Math.abs(v - key.acrossMm);
    if (dv < 50 && du < 13 + (dv / 50) * 15) {
      const rim = dv > 47.5 || du > 11 + (dv / 50) * 15;
      const grain = 0.85 + sample(fine, u * 0.6, v * 0.05) * 0.3;
      out[0] = rim ? 34 : 86 * grain;
      out[1] = rim ? 22 : 56 * grain;
      out[2] = rim ? 16 : 38 * grain;
      return;
    }
  }
  for (const hole of placed.voids) {
    const distance = Math.hypot(u - hole.alongMm, (v - hole.acrossMm) * 1.5) + (sample(warp, u * 1.2, v * 1.2) - 0.5) * 34;
    if (distance < hole.radiusMm) {
      // Clear epoxy over the dark of the void, with a soft highlight.
      const glint = smoothstep(
        hole.radiusMm * 0.5,
        0,
        Math.hypot(u - hole.alongMm + hole.radiusMm * 0.3, v - hole.acrossMm - hole.radiusMm * 0.2),
      );
      out[0] = 30 + glint * 70;
      out[1] = 22 + glint * 60;
      out[2] = 18 + glint * 52;
      return;
    }
  }

  // The sawn ends catch a little less light.
  light *= 0.86 + 0.14 * smoothstep(0, 18, Math.min(u, slab.lengthMm - u));
  out[0] = r * light;
  out[1] = g * light;
  out[2] = b * light;
}
