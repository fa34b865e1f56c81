import { execFileSync } from "node:child_process";
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { deflateSync } from "node:zlib";
import exifReader from "exif-reader";
import sharp from "sharp";
import { describe, expect, it } from "vitest";
import {
  DISPLAY_SIZES,
  MAX_PHOTO_BYTES,
  MAX_PHOTO_MEGAPIXELS,
  PhotoRejected,
  inspectPhoto,
  renderDisplaySizes,
  sniffFormat,
  type PhotoRejectionCode,
} from "./photo-processing.ts";

// ---------------------------------------------------------------------------------------------
// Test images, made here with sharp or by hand (no binary fixtures).

const RED = { r: 220, g: 20, b: 20 };
const BLUE = { r: 20, g: 20, b: 220 };

/** Stored (not displayed) pixels: left half red, right half blue. */
async function redLeftBlueRight(width: number, height: number) {
  const half = Math.floor(width / 2);
  const left = await sharp({ create: { width: half, height, channels: 3, background: RED } })
    .png()
    .toBuffer();
  return sharp({ create: { width, height, channels: 3, background: BLUE } }).composite([{ input: left, left: 0, top: 0 }]);
}

// The yard's position, as EXIF writes it: 45° 30' 12.34" N, 122° 40' 56.78" W.
const GPS_LATITUDE = "45/1 30/1 1234/100";
const GPS_LONGITUDE = "122/1 40/1 5678/100";
const XMP_MARKER = "GrainyardYardSecretXmp";
const XMP_PACKET =
  `<?xpacket begin="" id="W5M0MpCehiHzreSzNTczkc9d"?><x:xmpmeta xmlns:x="adobe:ns:meta/"><rdf:RDF xmlns:rdf="http://www.w3.org/1999/02/22-rdf-syntax-ns#">` +
  `<rdf:Description xmlns:exif="http://ns.adobe.com/exif/1.0/" xmlns:dc="http://purl.org/dc/elements/1.1/" exif:GPSLatitude="45,30.2057N" exif:GPSLongitude="122,40.9463W"><dc:source>${XMP_MARKER}</dc:source></rdf:Description>` +
  `</rdf:RDF></x:xmpmeta><?xpacket end="w"?>`;
const IPTC_MARKER = "Lakemont Yard Secret";

/**
 * A Photoshop APP13 segment holding one IPTC record (2:90 City), spliced in after SOI: sharp
 * cannot write IPTC, and phones' editing apps do.
 */
function withIptcSegment(jpeg: Buffer): Buffer {
  const text = Buffer.from(IPTC_MARKER, "latin1");
  let iptc = Buffer.concat([Buffer.from([0x1c, 0x02, 0x5a, text.length >> 8, text.length & 0xff]), text]);
  if (iptc.length % 2) iptc = Buffer.concat([iptc, Buffer.from([0])]);
  const resourceSize = Buffer.alloc(4);
  resourceSize.writeUInt32BE(iptc.length);
  // "8BIM", resource 0x0404 (IPTC-NAA), empty Pascal name padded to 2 bytes, size, data.
  const resource = Buffer.concat([Buffer.from("8BIM", "latin1"), Buffer.from([0x04, 0x04, 0x00, 0x00]), resourceSize, iptc]);
  const payload = Buffer.concat([Buffer.from("Photoshop 3.0\0", "latin1"), resource]);
  const header = Buffer.from([0xff, 0xed, 0, 0]);
  header.writeUInt16BE(payload.length + 2, 2);
  return Buffer.concat([jpeg.subarray(0, 2), header, payload, jpeg.subarray(2)]);
}

/** 2000 × 1000 stored, EXIF orientation 6 (shown rotated 90° clockwise: 1000 × 2000), GPS, XMP, IPTC. */
async function phoneJpegWithLocation(): Promise<Buffer> {
  const jpeg = await (
    await redLeftBlueRight(2000, 1000)
  )
    .jpeg({ quality: 90 })
    .withExif({
      IFD0: { Make: "TestPhone", Copyright: "Test Yard" },
      IFD3: { GPSLatitudeRef: "N", GPSLatitude: GPS_LATITUDE, GPSLongitudeRef: "W", GPSLongitude: GPS_LONGITUDE },
    })
    .withMetadata({ orientation: 6 })
    .withXmp(XMP_PACKET)
    .toBuffer();
  return withIptcSegment(jpeg);
}

function crc32(bytes: Buffer): number {
  let crc = 0xffffffff;
  for (const byte of bytes) {
    crc ^= byte;
    for (let bit = 0; bit < 8; bit++) crc = crc & 1 ? 0xedb88320 ^ (crc >>> 1) : crc >>> 1;
  }
  return (crc ^ 0xffffffff) >>> 0;
}

function pngChunk(type: string, data: Buffer): Buffer {
  const length = Buffer.alloc(4);
  length.writeUInt32BE(data.length);
  const typeAndData = Buffer.concat([Buffer.from(type, "latin1"), data]);
  const crc = Buffer.alloc(4);
  crc.writeUInt32BE(crc32(typeAndData));
  return Buffer.concat([length, typeAndData, crc]);
}

/** A valid PNG header claiming width × height RGB, with a tiny IDAT of zeros (a bomb's shape). */
function pngClaiming(width: number, height: number): Buffer {
  const header = Buffer.alloc(13);
  header.writeUInt32BE(width, 0);
  header.writeUInt32BE(height, 4);
  header[8] = 8; // bit depth
  header[9] = 2; // colour type: RGB
  return Buffer.concat([
    Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]),
    pngChunk("IHDR", header),
    pngChunk("IDAT", deflateSync(Buffer.alloc(4096))),
    pngChunk("IEND", Buffer.alloc(0)),
  ]);
}

/** An ISO-BMFF `ftyp` box with the given brands, then `rest`. */
function fileTypeBox(majorBrand: string, compatibleBrands: string[], rest = Buffer.alloc(0)): Buffer {
  const box = Buffer.alloc(16 + 4 * compatibleBrands.length);
  box.writeUInt32BE(box.length, 0);
  box.write("ftyp", 4, "latin1");
  box.write(majorBrand, 8, "latin1");
  compatibleBrands.forEach((brand, index) => box.write(brand, 16 + 4 * index, "latin1"));
  return Buffer.concat([box, rest]);
}

async function rejectionOf(work: Promise<unknown>): Promise<PhotoRejected> {
  try {
    await work;
  } catch (error) {
    if (error instanceof PhotoRejected) return error;
    throw new Error(`expected PhotoRejected, got ${String(error)}`, { cause: error });
  }
  throw new Error("expected PhotoRejected, but the photo was accepted");
}

async function expectRejected(work: Promise<unknown>, code: PhotoRejectionCode): Promise<PhotoRejected> {
  const rejection = await rejectionOf(work);
  expect(rejection.code).toBe(code);
  expect(rejection.message.length).toBeGreaterThan(20);
  return rejection;
}

/** The RIFF chunk ids of a WebP file (VP8/VP8L/VP8X/ALPH carry pixels; EXIF/XMP /ICCP metadata). */
function webpChunkIds(bytes: Buffer): string[] {
  expect(bytes.subarray(0, 4).toString("latin1")).toBe("RIFF");
  expect(bytes.subarray(8, 12).toString("latin1")).toBe("WEBP");
  const ids: string[] = [];
  for (let offset = 12; offset + 8 <= bytes.length;) {
    ids.push(bytes.subarray(offset, offset + 4).toString("latin1"));
    const size = bytes.readUInt32LE(offset + 4);
    offset += 8 + size + (size % 2);
  }
  return ids;
}

function rationalBytes(text: string, littleEndian: boolean): Buffer {
  const numbers = text.split(/[ /]/).map(Number);
  const bytes = Buffer.alloc(numbers.length * 4);
  numbers.forEach((value, index) => (littleEndian ? bytes.writeUInt32LE(value, index * 4) : bytes.writeUInt32BE(value, index * 4)));
  return bytes;
}

async function pixelAt(webp: Buffer, x: number, y: number) {
  const { data, info } = await sharp(webp).removeAlpha().raw().toBuffer({ resolveWithObject: true });
  const offset = (y * info.width + x) * info.channels;
  return { r: data[offset]!, g: data[offset + 1]!, b: data[offset + 2]! };
}

function sizeNamed(sizes: Awaited<ReturnType<typeof renderDisplaySizes>>["sizes"], name: "small" | "medium" | "large") {
  const size = sizes.find((entry) => entry.name === name);
  if (!size) throw new Error(`no ${name} size rendered`);
  return size;
}

// ---------------------------------------------------------------------------------------------

describe("constants", () => {
  it("are the published limits", () => {
    expect(MAX_PHOTO_BYTES).toBe(25 * 1024 * 1024);
    expect(MAX_PHOTO_MEGAPIXELS).toBe(40);
    expect(DISPLAY_SIZES.map((size) => [size.name, size.longSide])).toEqual([
      ["small", 400],
      ["medium", 800],
      ["large", 1600],
    ]);
  });
});

describe("a phone JPEG with orientation, GPS, XMP and IPTC", () => {
  it("really carries that metadata going in (so the checks below can fail)", async () => {
    const input = await phoneJpegWithLocation();
    const metadata = await sharp(input).metadata();
    expect(metadata.orientation).toBe(6);
    expect(metadata.xmp?.toString("utf8")).toContain(XMP_MARKER);
    expect(metadata.iptc?.toString("latin1")).toContain(IPTC_MARKER);
    const exif = exifReader(metadata.exif!);
    expect(exif.GPSInfo?.GPSLatitude).toEqual([45, 30, 12.34]);
    expect(exif.GPSInfo?.GPSLongitude).toEqual([122, 40, 56.78]);
    expect(input.includes(rationalBytes(GPS_LATITUDE, !exif.bigEndian))).toBe(true);
  });

  it("is inspected with its shown (rotated) dimensions", async () => {
    expect(await inspectPhoto(await phoneJpegWithLocation())).toEqual({ format: "jpeg", width: 1000, height: 2000, megapixels: 2 });
  });

  it("renders upright sizes fitted inside 400, 800 and 1600 px", async () => {
    const { sizes } = await renderDisplaySizes(await phoneJpegWithLocation());
    expect(sizes.map(({ name, width, height, contentType }) => ({ name, width, height, contentType }))).toEqual([
      { name: "small", width: 200, height: 400, contentType: "image/webp" },
      { name: "medium", width: 400, height: 800, contentType: "image/webp" },
      { name: "large", width: 800, height: 1600, contentType: "image/webp" },
    ]);
    // Rotated 90° clockwise, the stored left (red) half is shown on top, the right (blue) below.
    const large = sizeNamed(sizes, "large").bytes;
    const top = await pixelAt(large, 400, 200);
    const bottom = await pixelAt(large, 400, 1400);
    expect(top.r).toBeGreaterThan(180);
    expect(top.b).toBeLessThan(60);
    expect(bottom.b).toBeGreaterThan(180);
    expect(bottom.r).toBeLessThan(60);
  });

  it("serves no EXIF, GPS, XMP, IPTC or ICC in any size", async () => {
    const { sizes } = await renderDisplaySizes(await phoneJpegWithLocation());
    expect(sizes).toHaveLength(3);
    for (const size of sizes) {
      expect(sniffFormat(size.bytes)).toEqual({ kind: "supported", format: "webp" });
      const metadata = await sharp(size.bytes).metadata();
      expect(metadata.format).toBe("webp");
      expect(metadata.exif).toBeUndefined();
      expect(metadata.xmp).toBeUndefined();
      expect(metadata.iptc).toBeUndefined();
      expect(metadata.icc).toBeUndefined();
      expect(metadata.orientation).toBeUndefined();
      // Only pixel chunks in the container: no EXIF, "XMP " or ICCP chunk.
      for (const id of webpChunkIds(size.bytes)) expect(["VP8 ", "VP8L", "VP8X", "ALPH"]).toContain(id);
      const bytes = size.bytes;
      for (const marker of [
        "Exif",
        "GPS",
        XMP_MARKER,
        "W5M0MpCehiHzreSzNTczkc9d",
        "xmpmeta",
        "Photoshop",
        "8BIM",
        IPTC_MARKER,
        "TestPhone",
        "Test Yard",
      ]) {
        expect(bytes.includes(Buffer.from(marker, "latin1")), `served ${size.name} contains ${marker}`).toBe(false);
      }
      for (const rational of [GPS_LATITUDE, GPS_LONGITUDE]) {
        expect(bytes.includes(rationalBytes(rational, true))).toBe(false);
        expect(bytes.includes(rationalBytes(rational, false))).toBe(false);
      }
    }
  });
});

describe("other inputs", () => {
  it("a Display P3 photo is converted to sRGB and served without a profile", async () => {
    const colour = { r: 200, g: 120, b: 60 };
    // withIccProfile converts the sRGB colour into P3 numbers and tags the file with P3.
    const tagged = await sharp({ create: { width: 64, height: 64, channels: 3, background: colour } })
      .withIccProfile("p3")
      .jpeg({ quality: 95 })
      .toBuffer();
    expect((await sharp(tagged).metadata()).icc).toBeDefined();
    // The stored numbers are visibly not the sRGB ones (P3 orange: less red, more blue)…
    const stored = await pixelAt(await sharp(tagged, { ignoreIcc: true }).png().toBuffer(), 32, 32);
    expect(colour.r - stored.r).toBeGreaterThan(8);
    expect(stored.b - colour.b).toBeGreaterThan(8);
    // …and the served copy, which has no profile to explain them, shows the sRGB colour again.
    const served = sizeNamed((await renderDisplaySizes(tagged)).sizes, "large");
    expect((await sharp(served.bytes).metadata()).icc).toBeUndefined();
    const shown = await pixelAt(served.bytes, 32, 32);
    expect(Math.abs(shown.r - colour.r)).toBeLessThanOrEqual(4);
    expect(Math.abs(shown.g - colour.g)).toBeLessThanOrEqual(4);
    expect(Math.abs(shown.b - colour.b)).toBeLessThanOrEqual(4);
  });

  it("a large PNG with transparency is fitted and keeps its alpha", async () => {
    const png = await sharp({ create: { width: 2400, height: 1200, channels: 4, background: { r: 120, g: 80, b: 40, alpha: 0.5 } } })
      .png()
      .toBuffer();
    expect(await inspectPhoto(png)).toEqual({ format: "png", width: 2400, height: 1200, megapixels: 2.88 });
    const { sizes } = await renderDisplaySizes(png);
    expect(sizes.map(({ width, height }) => [width, height])).toEqual([
      [400, 200],
      [800, 400],
      [1600, 800],
    ]);
    expect((await sharp(sizeNamed(sizes, "large").bytes).metadata()).hasAlpha).toBe(true);
  });

  it("a small PNG is never enlarged", async () => {
    const png = await (await redLeftBlueRight(300, 200)).png().toBuffer();
    const { sizes } = await renderDisplaySizes(png);
    expect(sizes.map(({ name, width, height }) => [name, width, height])).toEqual([
      ["small", 300, 200],
      ["medium", 300, 200],
      ["large", 300, 200],
    ]);
  });

  it("a WebP photo works and a portrait one is fitted by its height", async () => {
    const webp = await (await redLeftBlueRight(700, 1400)).webp({ quality: 90 }).toBuffer();
    expect(await inspectPhoto(webp)).toEqual({ format: "webp", width: 700, height: 1400, megapixels: 0.98 });
    const { sizes } = await renderDisplaySizes(webp);
    expect(sizes.map(({ width, height }) => [width, height])).toEqual([
      [200, 400],
      [400, 800],
      [700, 1400],
    ]);
  });
});

describe("refusals", () => {
  it("a text file named .jpg is not an image", async () => {
    await expectRejected(inspectPhoto(Buffer.from("hello")), "not_an_image");
    await expectRejected(renderDisplaySizes(Buffer.from("hello")), "not_an_image");
    await expectRejected(inspectPhoto(Buffer.alloc(0)), "not_an_image");
    await expectRejected(inspectPhoto(Buffer.from("%PDF-1.7\n...")), "not_an_image");
  });

  it("GIF, AVIF, TIFF and video are recognised but not taken", async () => {
    const gif = await sharp({ create: { width: 32, height: 32, channels: 3, background: RED } })
      .gif()
      .toBuffer();
    expect((await expectRejected(inspectPhoto(gif), "unsupported_format")).message).toContain("GIF");
    const avif = await sharp({ create: { width: 32, height: 32, channels: 3, background: RED } })
      .avif()
      .toBuffer();
    expect((await expectRejected(inspectPhoto(avif), "unsupported_format")).message).toContain("AVIF");
    const tiff = await sharp({ create: { width: 32, height: 32, channels: 3, background: RED } })
      .tiff()
      .toBuffer();
    await expectRejected(inspectPhoto(tiff), "unsupported_format");
    await expectRejected(inspectPhoto(fileTypeBox("isom", ["isom", "iso2", "mp41"], Buffer.alloc(64))), "unsupported_format");
  });

  it("a file over 25 MB is refused before anything is decoded", async () => {
    // A JPEG start followed by zeros: decoding it would give corrupt_image, not too_large_file.
    const huge = Buffer.alloc(26 * 1024 * 1024);
    huge.set([0xff, 0xd8, 0xff, 0xe0]);
    const started = performance.now();
    await expectRejected(inspectPhoto(huge), "too_large_file");
    await expectRejected(renderDisplaySizes(huge), "too_large_file");
    expect(performance.now() - started).toBeLessThan(200);
    // Exactly at the limit the size is fine, and the bad content is what gets refused.
    await expectRejected(inspectPhoto(huge.subarray(0, MAX_PHOTO_BYTES)), "corrupt_image");
    const rejection = await rejectionOf(inspectPhoto(huge));
    expect(rejection.status).toBe(413);
  });

  it("a tiny PNG claiming 20000 × 20000 pixels is refused quickly from its header", async () => {
    const bomb = pngClaiming(20_000, 20_000);
    expect(bomb.length).toBeLessThan(200);
    const started = performance.now();
    await expectRejected(inspectPhoto(bomb), "too_many_pixels");
    await expectRejected(renderDisplaySizes(bomb), "too_many_pixels");
    expect(performance.now() - started).toBeLessThan(500);
  });

  it("just over 40 MP is refused, just under is inspected from the header alone", async () => {
    await expectRejected(inspectPhoto(pngClaiming(8000, 5001)), "too_many_pixels");
    // 36 MP claimed with a 4 KB body: inspection reads only the header, so it answers quickly;
    // rendering must decode, and finds the body missing.
    const started = performance.now();
    expect(await inspectPhoto(pngClaiming(6000, 6000))).toEqual({ format: "png", width: 6000, height: 6000, megapixels: 36 });
    expect(performance.now() - started).toBeLessThan(200);
    await expectRejected(renderDisplaySizes(pngClaiming(6000, 6000)), "corrupt_image");
  });

  it("an animation whose frames add up past 40 MP is a decompression bomb", async () => {
    const frames = await Promise.all(
      Array.from({ length: 11 }, (_, index) =>
        sharp({ create: { width: 2000, height: 2000, channels: 3, background: { r: index * 20, g: 0, b: 0 } } })
          .png({ compressionLevel: 1 })
          .toBuffer(),
      ),
    );
    const animation = await sharp(frames, { join: { animated: true } })
      .webp({ lossless: true, effort: 0 })
      .toBuffer();
    expect((await sharp(animation).metadata()).pages).toBe(11);
    await expectRejected(inspectPhoto(animation), "decompression_bomb");
    // Three such frames (12 MP in all) are fine: the first frame is what gets shown.
    const short = await sharp(frames.slice(0, 3), { join: { animated: true } })
      .webp({ lossless: true, effort: 0 })
      .toBuffer();
    expect((await inspectPhoto(short)).megapixels).toBe(4);
  });

  it("a truncated JPEG is corrupt", async () => {
    const jpeg = await (await redLeftBlueRight(1200, 800)).jpeg({ quality: 90 }).toBuffer();
    await expectRejected(renderDisplaySizes(jpeg.subarray(0, Math.floor(jpeg.length * 0.6))), "corrupt_image");
    // Cut inside the header: even inspection cannot read it.
    await expectRejected(inspectPhoto(jpeg.subarray(0, 120)), "corrupt_image");
  });

  it("a PNG with a damaged header is corrupt", async () => {
    const png = await (await redLeftBlueRight(100, 100)).png().toBuffer();
    await expectRejected(inspectPhoto(png.subarray(0, 12)), "corrupt_image");
  });
});

/** Debian's libheif-examples brings heif-enc with the x265 HEVC encoder; the project does not install it. */
function findHeifEncoder(): boolean {
  try {
    return execFileSync("heif-enc", ["--list-encoders"], { encoding: "utf8", stdio: ["ignore", "pipe", "ignore"] }).includes("x265");
  } catch {
    return false;
  }
}
const HAS_HEIF_ENCODER = findHeifEncoder();

describe("HEIC", () => {
  // Neither sharp (its libheif encodes AV1 only) nor heic-decode (decode only) can write HEVC,
  // so recognition and refusal are checked always, and a real HEIC only where heif-enc exists.
  it.skipIf(!HAS_HEIF_ENCODER)(
    "a real HEVC HEIC is decoded, fitted and served without its EXIF (needs heif-enc from libheif-examples)",
    async () => {
      const folder = mkdtempSync(join(tmpdir(), "grainyard-heic-"));
      try {
        const jpeg = await (
          await redLeftBlueRight(1200, 800)
        )
          .jpeg({ quality: 95 })
          .withExif({ IFD0: { Make: "TestPhone" }, IFD3: { GPSLatitudeRef: "N", GPSLatitude: GPS_LATITUDE } })
          .toBuffer();
        writeFileSync(join(folder, "in.jpg"), jpeg);
        execFileSync("heif-enc", ["-q", "90", "-o", join(folder, "out.heic"), join(folder, "in.jpg")], { stdio: "ignore" });
        const heic = readFileSync(join(folder, "out.heic"));
        expect(sniffFormat(heic)).toEqual({ kind: "supported", format: "heic" });
        // heif-enc copies the EXIF block (stored uncompressed) into the HEIC.
        expect(heic.includes(Buffer.from("TestPhone", "latin1"))).toBe(true);
        expect(await inspectPhoto(heic)).toEqual({ format: "heic", width: 1200, height: 800, megapixels: 0.96 });
        const { sizes } = await renderDisplaySizes(heic);
        expect(sizes.map(({ name, width, height }) => [name, width, height])).toEqual([
          ["small", 400, 267],
          ["medium", 800, 533],
          ["large", 1200, 800],
        ]);
        for (const size of sizes) {
          expect((await sharp(size.bytes).metadata()).exif).toBeUndefined();
          expect(size.bytes.includes(Buffer.from("TestPhone", "latin1"))).toBe(false);
          expect(size.bytes.includes(rationalBytes(GPS_LATITUDE, true))).toBe(false);
        }
        const large = sizeNamed(sizes, "large").bytes;
        expect((await pixelAt(large, 100, 400)).r).toBeGreaterThan(180);
        expect((await pixelAt(large, 1100, 400)).b).toBeGreaterThan(180);
      } finally {
        rmSync(folder, { recursive: true, force: true });
      }
    },
  );

  it("is recognised by its ftyp brands, major or compatible", () => {
    expect(sniffFormat(fileTypeBox("heic", ["mif1", "heic"]))).toEqual({ kind: "supported", format: "heic" });
    expect(sniffFormat(fileTypeBox("mif1", ["mif1", "heic"]))).toEqual({ kind: "supported", format: "heic" });
    expect(sniffFormat(fileTypeBox("heix", []))).toEqual({ kind: "supported", format: "heic" });
    expect(sniffFormat(fileTypeBox("msf1", ["hevc"]))).toEqual({ kind: "supported", format: "heic" });
    expect(sniffFormat(fileTypeBox("abcd", ["heim"]))).toEqual({ kind: "supported", format: "heic" });
    // AVIF lists mif1 too, but is not HEIC.
    expect(sniffFormat(fileTypeBox("avif", ["mif1", "avif", "miaf"]))).toEqual({ kind: "unsupported", name: "AVIF" });
    expect(sniffFormat(fileTypeBox("isom", ["isom"]))).toMatchObject({ kind: "unsupported" });
  });

  it("a broken HEIC is corrupt, for inspection and rendering", async () => {
    const broken = fileTypeBox(
      "heic",
      ["mif1", "heic"],
      Buffer.concat([Buffer.from([0, 0, 0, 40]), Buffer.from("meta", "latin1"), Buffer.alloc(200, 7)]),
    );
    await expectRejected(inspectPhoto(broken), "corrupt_image");
    await expectRejected(renderDisplaySizes(broken), "corrupt_image");
    // Major brand heic-decode does not know, HEIC among the compatible brands: still refused cleanly.
    await expectRejected(inspectPhoto(fileTypeBox("heim", ["mif1", "heic"], Buffer.alloc(100))), "corrupt_image");
  });
});
