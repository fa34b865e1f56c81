import sharp from "sharp";

/**
 * A drawn photo of a slab for the demo data: its real outline (from the width stations) on a
 * workshop floor, in the species' colour, with growth-ring grain. Made with sharp from SVG, so the
 * seed needs no photo files.
 */
const COLOURS: Record<string, { face: string; grain: string; bark: string }> = {
  "black-walnut": { face: "#5b3a26", grain: "#3f271a", bark: "#2b1d14" },
  "silver-maple": { face: "#e2cfa8", grain: "#c7ab7c", bark: "#6d5a45" },
  "northern-red-oak": { face: "#c99a6b", grain: "#a8764a", bark: "#5a4331" },
  "white-oak": { face: "#c9a77c", grain: "#a9875d", bark: "#5c4a38" },
};

export async function slabPicture(speciesSlug: string, lengthMm: number, widthStationsMm: number[], variant = 0): Promise<Buffer> {
  const colour = COLOURS[speciesSlug] ?? { face: "#c8a27a", grain: "#a47e57", bark: "#5a4634" };
  const width = 1600;
  const height = 1000;
  const scale = Math.min((width - 160) / lengthMm, (height - 200) / Math.max(...widthStationsMm));
  const left = (width - lengthMm * scale) / 2;
  const middle = height / 2;
  const step = (lengthMm * scale) / (widthStationsMm.length - 1);
  const wobble = (i: number) => Math.sin(i * 2.3 + variant) * 6;
  const top = widthStationsMm.map((w, i) => `${(left + i * step).toFixed(1)},${(middle - (w * scale) / 2 + wobble(i)).toFixed(1)}`);
  const bottom = widthStationsMm
    .map((w, i) => `${(left + i * step).toFixed(1)},${(middle + (w * scale) / 2 + wobble(i + 3)).toFixed(1)}`)
    .reverse();
  const outline = [...top, ...bottom].join(" ");
  // Flat-sawn "cathedral" grain: growth rings cut at a slant show as nested arches.
  const pithX = left + lengthMm * scale * (0.72 + 0.05 * Math.sin(variant));
  const rings = Array.from({ length: 22 }, (_, k) => {
    const rx = 40 + k * 55;
    const ry = 8 + k * 17;
    return `<ellipse cx="${pithX.toFixed(1)}" cy="${(middle + 10 * Math.cos(variant)).toFixed(1)}" rx="${rx}" ry="${ry}" stroke="${colour.grain}" stroke-width="${2 + (k % 4 === 0 ? 2 : 0)}" fill="none" opacity="${0.35 + (k % 3) * 0.12}"/>`;
  }).join("");
  const svg = `<svg xmlns="http://www.w3.org/2000/svg" width="${width}" height="${height}">
    <rect width="100%" height="100%" fill="#8d8a83"/>
    <rect y="${height * 0.82}" width="100%" height="${height * 0.18}" fill="#77736b"/>
    <defs><clipPath id="slab"><polygon points="${outline}"/></clipPath></defs>
    <polygon points="${outline}" fill="${colour.bark}" transform="translate(6 10)" opacity="0.45"/>
    <polygon points="${outline}" fill="${colour.face}" stroke="${colour.bark}" stroke-width="10"/>
    <g clip-path="url(#slab)">${rings}<polygon points="${outline}" fill="none" stroke="${colour.grain}" stroke-width="34" opacity="0.35"/></g>
  </svg>`;
  return sharp(Buffer.from(svg)).jpeg({ quality: 86 }).toBuffer();
}
