/**
 * Times the photo pipeline on a phone-like 12 MP photo: `inspectPhoto` + `renderDisplaySizes`.
 * Run from apps/api: `npx tsx bench/photo-pipeline.ts`. Prints figures only.
 *
 * The photo is made here, not shipped: gradients (sky, wood tone) plus per-pixel noise like a
 * phone sensor's, saved as JPEG quality 90 with EXIF (orientation and a GPS position), which is
 * the shape of what a sawyer uploads from the yard. Pure noise would be harder than any real
 * photo; smooth gradients alone would be far easier.
 */
import { randomFillSync } from "node:crypto";
import os from "node:os";
import sharp from "sharp";
import { inspectPhoto, renderDisplaySizes } from "../src/photos/index.ts";

const WIDTH = 4000;
const HEIGHT = 3000;
const RUNS = 5;

async function makePhonePhoto(): Promise<Buffer> {
  const channels = 3;
  const pixels = Buffer.alloc(WIDTH * HEIGHT * channels);
  const noise = randomFillSync(Buffer.alloc(WIDTH * HEIGHT));
  for (let y = 0; y < HEIGHT; y++) {
    for (let x = 0; x < WIDTH; x++) {
      const index = y * WIDTH + x;
      // ±24 levels of sensor-like noise around a few broad gradients and some "grain" stripes.
      const grain = 18 * Math.sin(x / 23 + Math.sin(y / 140) * 4);
      const jitter = (noise[index]! % 49) - 24;
      const offset = index * channels;
      pixels[offset] = clamp(90 + (x / WIDTH) * 110 + grain + jitter);
      pixels[offset + 1] = clamp(60 + (y / HEIGHT) * 80 + grain * 0.7 + jitter);
      pixels[offset + 2] = clamp(40 + ((x + y) / (WIDTH + HEIGHT)) * 60 + jitter);
    }
  }
  return sharp(pixels, { raw: { width: WIDTH, height: HEIGHT, channels } })
    .jpeg({ quality: 90 })
    .withExif({ IFD0: { Make: "Bench", Model: "Phone" }, IFD3: { GPSLatitudeRef: "N", GPSLatitude: "45/1 30/1 1234/100" } })
    .withMetadata({ orientation: 1 })
    .toBuffer();
}

function clamp(value: number): number {
  return value < 0 ? 0 : value > 255 ? 255 : Math.round(value);
}

function median(values: number[]): number {
  const sorted = [...values].sort((a, b) => a - b);
  const middle = Math.floor(sorted.length / 2);
  return sorted.length % 2 ? sorted[middle]! : (sorted[middle - 1]! + sorted[middle]!) / 2;
}

const photo = await makePhonePhoto();
console.log(
  `photo: ${WIDTH}×${HEIGHT} JPEG q90 with EXIF, ${(photo.length / 1024 / 1024).toFixed(2)} MB; ${os.availableParallelism()} cores; libvips threads ${sharp.concurrency()}`,
);

// One warm-up run: loads libvips code paths once, as a running server would have done.
await renderDisplaySizes(photo);

const timings: number[] = [];
let lastSizes: Awaited<ReturnType<typeof renderDisplaySizes>>["sizes"] = [];
for (let run = 0; run < RUNS; run++) {
  const started = performance.now();
  await inspectPhoto(photo);
  lastSizes = (await renderDisplaySizes(photo)).sizes;
  timings.push(performance.now() - started);
}

console.log(
  `inspectPhoto + renderDisplaySizes, ${RUNS} runs: median ${median(timings).toFixed(0)} ms, min ${Math.min(...timings).toFixed(0)} ms, max ${Math.max(...timings).toFixed(0)} ms`,
);
for (const size of lastSizes) {
  console.log(`  ${size.name}: ${size.width}×${size.height} WebP, ${(size.bytes.length / 1024).toFixed(1)} KB`);
}
