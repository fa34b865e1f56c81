/**
 * Pure image work for listing photos: identify and check an upload, then render the served
 * display sizes. No storage and no database here.
 *
 * Rules that matter for sawyers and buyers:
 * - The format is identified from the file's bytes (magic numbers), never from the file name or
 *   the MIME type the phone sent.
 * - Size and pixel count are checked from the header before anything is decoded, so a small file
 *   that claims huge dimensions is refused without allocating the decoded image.
 * - Served images carry no metadata at all: no EXIF (the GPS position of a sawyer's yard lives
 *   there), no XMP, no IPTC, no ICC profile (colours are converted to sRGB first).
 */
import sharp, { type Metadata, type ResizeOptions, type Sharp } from "sharp";
import { AppError } from "../errors.ts";
import { ACCEPTED_PHOTO_FORMATS_TEXT, MAX_PHOTO_BYTES } from "@grainyard/contracts";

export { MAX_PHOTO_BYTES };
/** 40 MP: room for 12–24 MP phone cameras and 36 MP cameras; 48 MP "max" modes must be exported smaller. */
export const MAX_PHOTO_MEGAPIXELS = 40;
const MAX_PHOTO_PIXELS = MAX_PHOTO_MEGAPIXELS * 1_000_000;

/** The served sizes, each fitted inside a square of `longSide` pixels (never enlarged). */
export const DISPLAY_SIZES = [
  { name: "small", longSide: 400 },
  // A phone screen at two or three device pixels per CSS pixel, and catalogue cards on any screen.
  { name: "medium", longSide: 800 },
  { name: "large", longSide: 1600 },
] as const;

export type DisplaySizeName = (typeof DISPLAY_SIZES)[number]["name"];
type PhotoFormat = "jpeg" | "png" | "webp" | "heic";

export interface PhotoInspection {
  format: PhotoFormat;
  /** Width as the photo is meant to be seen (after EXIF orientation / HEIF rotation). */
  width: number;
  /** Height as the photo is meant to be seen (after EXIF orientation / HEIF rotation). */
  height: number;
  /** width × height / 1,000,000, rounded to two decimals. */
  megapixels: number;
}

export interface DisplayImage {
  name: DisplaySizeName;
  width: number;
  height: number;
  bytes: Buffer;
  contentType: "image/webp";
}

export type PhotoRejectionCode =
  "not_an_image" | "unsupported_format" | "too_large_file" | "too_many_pixels" | "corrupt_image" | "decompression_bomb";

/** An upload we will not take, with a message a sawyer can act on. Maps to HTTP 413 or 422. */
export class PhotoRejected extends AppError {
  declare readonly code: PhotoRejectionCode;
  constructor(code: PhotoRejectionCode, message: string) {
    super(code, message);
  }
}

// WebP settings, timed on a 1600 px noisy photo on this 2-core machine: effort 2 encodes in
// ~100 ms against ~175 ms for the default effort 4, for files ~4 % larger; smart subsampling
// doubles the time and helps mostly sharp red-on-dark edges. Quality 80 keeps wood grain crisp.
const WEBP_OPTIONS = { quality: 80, effort: 2, smartSubsample: false } as const;

// libvips threads per image. Two cores here: two threads let one photo use the whole machine;
// more only adds contention when several uploads are processed at once. The operation cache
// holds decoded images for reuse, which never happens for unique uploads, so it is turned off.
sharp.concurrency(2);
sharp.cache(false);

// failOn "truncated": refuse cut-off files, but tolerate the benign warnings some phone encoders
// trigger (extra bytes between markers and the like), which the default "warning" would refuse.
const SHARP_INPUT_OPTIONS = { limitInputPixels: MAX_PHOTO_PIXELS, failOn: "truncated", sequentialRead: true } as const;

const HEIC_BRANDS = new Set(["heic", "heix", "hevc", "hevx", "heim", "heis", "hevm", "hevs", "mif1", "msf1"]);
/** Brands that heic-decode accepts as the major brand (it checks only that one). */
const HEIC_DECODE_MAJOR_BRANDS = new Set(["heic", "heix", "hevc", "hevx", "mif1", "msf1"]);
/** Brands that mean HEVC-coded HEIF ("mif1"/"msf1" alone are codec-neutral). */
const HEVC_BRANDS = new Set(["heic", "heix", "hevc", "hevx", "heim", "heis", "hevm", "hevs"]);
const AVIF_BRANDS = new Set(["avif", "avis"]);

type SniffResult = { kind: "supported"; format: PhotoFormat } | { kind: "unsupported"; name: string } | { kind: "unknown" };

function startsWith(bytes: Buffer, signature: number[], offset = 0): boolean {
  if (bytes.length < offset + signature.length) return false;
  return signature.every((value, index) => bytes[offset + index] === value);
}

function ascii(bytes: Buffer, start: number, end: number): string {
  return bytes.subarray(start, end).toString("latin1");
}

/** Brands of an ISO-BMFF `ftyp` box at the start of the file (major brand first), or null. */
function fileTypeBrands(bytes: Buffer): string[] | null {
  if (bytes.length < 16 || ascii(bytes, 4, 8) !== "ftyp") return null;
  const boxSize = bytes.readUInt32BE(0);
  if (boxSize < 16 || boxSize > bytes.length || boxSize > 4096) return null;
  const brands = [ascii(bytes, 8, 12)];
  // Bytes 12–16 are the minor version; compatible brands follow, four bytes each.
  for (let offset = 16; offset + 4 <= boxSize; offset += 4) brands.push(ascii(bytes, offset, offset + 4));
  return brands;
}

/** Identifies the format from magic numbers only. */
export function sniffFormat(bytes: Buffer): SniffResult {
  if (startsWith(bytes, [0xff, 0xd8, 0xff])) return { kind: "supported", format: "jpeg" };
  if (startsWith(bytes, [0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a])) return { kind: "supported", format: "png" };
  if (bytes.length >= 12 && ascii(bytes, 0, 4) === "RIFF" && ascii(bytes, 8, 12) === "WEBP") return { kind: "supported", format: "webp" };
  const brands = fileTypeBrands(bytes);
  if (brands) {
    const isAvif = brands.some((brand) => AVIF_BRANDS.has(brand));
    const isHevc = brands.some((brand) => HEVC_BRANDS.has(brand));
    // AVIF files also list "mif1"; without an HEVC brand beside it, it is AVIF, not HEIC.
    if (isAvif && !isHevc) return { kind: "unsupported", name: "AVIF" };
    if (brands.some((brand) => HEIC_BRANDS.has(brand))) return { kind: "supported", format: "heic" };
    return { kind: "unsupported", name: "a video or other ISO media file" };
  }
  if (ascii(bytes, 0, 6) === "GIF87a" || ascii(bytes, 0, 6) === "GIF89a") return { kind: "unsupported", name: "GIF" };
  if (startsWith(bytes, [0x49, 0x49, 0x2a, 0x00]) || startsWith(bytes, [0x4d, 0x4d, 0x00, 0x2a]))
    return { kind: "unsupported", name: "TIFF or camera RAW" };
  if (ascii(bytes, 0, 2) === "BM" && bytes.length >= 14) return { kind: "unsupported", name: "BMP" };
  if (startsWith(bytes, [0xff, 0x0a]) || startsWith(bytes, [0x00, 0x00, 0x00, 0x0c, 0x4a, 0x58, 0x4c, 0x20]))
    return { kind: "unsupported", name: "JPEG XL" };
  if (ascii(bytes, 0, 4) === "8BPS") return { kind: "unsupported", name: "Photoshop" };
  if (/^\s*(<\?xml[^>]*>\s*)?<svg[\s>]/i.test(ascii(bytes, 0, 512))) return { kind: "unsupported", name: "SVG" };
  return { kind: "unknown" };
}

const ACCEPTED_FORMATS_TEXT = ACCEPTED_PHOTO_FORMATS_TEXT;

function checkFileSize(bytes: Buffer): void {
  if (bytes.length > MAX_PHOTO_BYTES) {
    const megabytes = (bytes.length / (1024 * 1024)).toFixed(1);
    throw new PhotoRejected("too_large_file", `This file is ${megabytes} MB; photos can be at most ${MAX_PHOTO_BYTES / (1024 * 1024)} MB.`);
  }
}

function identifyFormat(bytes: Buffer): PhotoFormat {
  if (bytes.length === 0) throw new PhotoRejected("not_an_image", "The file is empty; choose a photo to upload.");
  const sniffed = sniffFormat(bytes);
  if (sniffed.kind === "supported") return sniffed.format;
  if (sniffed.kind === "unsupported") {
    throw new PhotoRejected("unsupported_format", `This file is ${sniffed.name}; photos must be ${ACCEPTED_FORMATS_TEXT}.`);
  }
  throw new PhotoRejected("not_an_image", `This file is not an image; photos must be ${ACCEPTED_FORMATS_TEXT}.`);
}

function tooManyPixels(width?: number, height?: number): PhotoRejected {
  const size =
    width && height ? `${width} × ${height} pixels (${megapixelsOf(width, height)} MP)` : `more than ${MAX_PHOTO_MEGAPIXELS} megapixels`;
  return new PhotoRejected(
    "too_many_pixels",
    `This photo is ${size}; photos can be at most ${MAX_PHOTO_MEGAPIXELS} megapixels. Export a smaller copy and try again.`,
  );
}

function corruptImage(format: PhotoFormat): PhotoRejected {
  return new PhotoRejected(
    "corrupt_image",
    `This ${format.toUpperCase()} file is damaged or incomplete and cannot be read. Try exporting or uploading it again.`,
  );
}

/** Turns sharp's errors into the rejection a sawyer sees. */
function rejectionFromSharpError(error: unknown, format: PhotoFormat): PhotoRejected {
  const message = error instanceof Error ? error.message : String(error);
  if (/exceeds pixel limit/i.test(message)) return tooManyPixels();
  return corruptImage(format);
}

function megapixelsOf(width: number, height: number): number {
  return Math.round((width * height) / 10_000) / 100;
}

function checkPixelCount(width: number, height: number, pages = 1): void {
  if (width * height > MAX_PHOTO_PIXELS) throw tooManyPixels(width, height);
  // Only the first frame is ever used, but a file whose frames add up past the limit is built to
  // exhaust memory in any viewer that decodes it whole: a phone photo is never that.
  if (width * height * pages > MAX_PHOTO_PIXELS) {
    throw new PhotoRejected(
      "decompression_bomb",
      `This file holds ${pages} frames that add up to more than ${MAX_PHOTO_MEGAPIXELS} megapixels; upload a single photo.`,
    );
  }
}

// heic-decode loads a multi-megabyte WebAssembly build of libheif; load it only when a HEIC comes.
type HeicImageData = { width: number; height: number; data: Uint8ClampedArray };
type HeicDecode = {
  (input: { buffer: Uint8Array }): Promise<HeicImageData>;
  all(input: {
    buffer: Uint8Array;
  }): Promise<Array<{ width: number; height: number; decode(): Promise<HeicImageData> }> & { dispose(): void }>;
};
let heicDecodeModule: Promise<HeicDecode> | undefined;
function loadHeicDecode(): Promise<HeicDecode> {
  heicDecodeModule ??= import("heic-decode").then((module) => (module.default ?? module) as unknown as HeicDecode);
  return heicDecodeModule;
}

/**
 * heic-decode checks only the major brand and knows fewer brands than the HEIF standard lists. A
 * file whose major brand it does not know, but which lists a HEIC brand among its compatible
 * brands, gets "mif1" as major brand in a copy; libheif itself reads the compatible brands.
 */
function heicBytesForDecoder(bytes: Buffer): Uint8Array {
  if (HEIC_DECODE_MAJOR_BRANDS.has(ascii(bytes, 8, 12))) return bytes;
  const copy = Buffer.from(bytes);
  copy.write("mif1", 8, "latin1");
  return copy;
}

async function inspectHeic(bytes: Buffer): Promise<{ width: number; height: number; pages: number }> {
  const heicDecode = await loadHeicDecode();
  let images: Awaited<ReturnType<HeicDecode["all"]>>;
  try {
    // Parses the container only; pixels are decoded later, one image at a time, if asked.
    images = await heicDecode.all({ buffer: heicBytesForDecoder(bytes) });
  } catch {
    throw corruptImage("heic");
  }
  try {
    const primary = images[0];
    if (!primary || !(primary.width > 0) || !(primary.height > 0)) throw corruptImage("heic");
    // libheif reports the size after the HEIF rotation (irot) is applied.
    return { width: primary.width, height: primary.height, pages: images.length };
  } finally {
    images.dispose();
  }
}

async function inspectWithSharp(bytes: Buffer, format: PhotoFormat): Promise<{ width: number; height: number; pages: number }> {
  let metadata: Metadata;
  try {
    metadata = await sharp(bytes, SHARP_INPUT_OPTIONS).metadata();
  } catch (error) {
    throw rejectionFromSharpError(error, format);
  }
  // Guard against libvips reading it as something else than the bytes said (a polyglot file).
  const expected = format === "heic" ? "heif" : format;
  if (metadata.format !== expected || !metadata.width || !metadata.height) throw corruptImage(format);
  const oriented = metadata.autoOrient ?? { width: metadata.width, height: metadata.height };
  return { width: oriented.width, height: oriented.height, pages: metadata.pages ?? 1 };
}

/**
 * Identifies the photo by its bytes and checks size and pixel count from the header, without
 * decoding the image. Throws `PhotoRejected` for anything we will not take.
 */
export async function inspectPhoto(bytes: Buffer): Promise<PhotoInspection> {
  checkFileSize(bytes);
  const format = identifyFormat(bytes);
  const { width, height, pages } = format === "heic" ? await inspectHeic(bytes) : await inspectWithSharp(bytes, format);
  checkPixelCount(width, height, pages);
  return { format, width, height, megapixels: megapixelsOf(width, height) };
}

/** Opens the photo as a sharp pipeline that is the right way up. */
async function openUpright(bytes: Buffer, format: PhotoFormat): Promise<Sharp> {
  if (format !== "heic") {
    // .rotate() with no angle applies the EXIF orientation (and drops the tag).
    return sharp(bytes, SHARP_INPUT_OPTIONS).rotate();
  }
  // sharp's bundled libheif decodes AV1 only, so HEVC photos go through heic-decode (libheif in
  // WebAssembly). libheif already applies the HEIF rotation and mirroring (irot/imir), which the
  // HEIF standard makes authoritative; the EXIF orientation in a HEIC repeats it and must NOT be
  // applied again, so no .rotate() here.
  const heicDecode = await loadHeicDecode();
  let decoded: HeicImageData;
  try {
    decoded = await heicDecode({ buffer: heicBytesForDecoder(bytes) });
  } catch {
    throw corruptImage("heic");
  }
  const { width, height, data } = decoded;
  // The header was checked already; a file whose decoded image is bigger than its header said is hostile.
  if (width * height > MAX_PHOTO_PIXELS) {
    throw new PhotoRejected(
      "decompression_bomb",
      `This HEIC file decodes to more than ${MAX_PHOTO_MEGAPIXELS} megapixels although its header says less.`,
    );
  }
  if (data.length !== width * height * 4) throw corruptImage("heic");
  const pixels = Buffer.from(data.buffer, data.byteOffset, data.byteLength);
  return sharp(pixels, { raw: { width, height, channels: 4 }, limitInputPixels: MAX_PHOTO_PIXELS });
}

async function encodeWebp(pipeline: Sharp, name: DisplaySizeName): Promise<DisplayImage> {
  // sharp writes no metadata unless asked (no withMetadata/keepExif/keepIccProfile here).
  const { data, info } = await pipeline.webp(WEBP_OPTIONS).toBuffer({ resolveWithObject: true });
  return { name, width: info.width, height: info.height, bytes: data, contentType: "image/webp" };
}

function fitInside(longSide: number): ResizeOptions {
  return { width: longSide, height: longSide, fit: "inside", withoutEnlargement: true };
}

/**
 * Renders the served sizes as WebP: upright, fitted inside 400, 800 and 1600 px (never enlarged),
 * converted to sRGB, with every piece of metadata removed. Checks the photo first like
 * `inspectPhoto`, so it is safe to call on an unchecked upload.
 */
export async function renderDisplaySizes(bytes: Buffer): Promise<{ sizes: DisplayImage[] }> {
  const { format } = await inspectPhoto(bytes);
  const [small, medium, large] = DISPLAY_SIZES;
  try {
    // Decode once into the large size: for JPEG, libvips shrinks while decoding (a 4000 px photo
    // is decoded at 2000 px), which is most of the saving. The small size is made from the
    // large one rather than from the original, as is the medium; the encodes then run side by side.
    const upright = await openUpright(bytes, format);
    const { data, info } = await upright
      .resize(fitInside(large.longSide))
      .toColourspace("srgb")
      .raw({ depth: "uchar" })
      .toBuffer({ resolveWithObject: true });
    const largeRaw = () => sharp(data, { raw: { width: info.width, height: info.height, channels: info.channels } });
    const sizes = await Promise.all([
      encodeWebp(largeRaw().resize(fitInside(small.longSide)), small.name),
      encodeWebp(largeRaw().resize(fitInside(medium.longSide)), medium.name),
      encodeWebp(largeRaw(), large.name),
    ]);
    return { sizes };
  } catch (error) {
    if (error instanceof PhotoRejected) throw error;
    throw rejectionFromSharpError(error, format);
  }
}

/**
 * The medium size from a stored large one, for photos uploaded before the medium size existed
 * (their original stays private and untouched; the large one is already upright, sRGB and bare).
 */
export async function mediumFromLarge(large: Buffer): Promise<Buffer> {
  const medium = DISPLAY_SIZES.find((size) => size.name === "medium")!;
  return (await encodeWebp(sharp(large, SHARP_INPUT_OPTIONS).resize(fitInside(medium.longSide)), "medium")).bytes;
}

/**
 * The original as stored: full size, upright (the orientation applied), its colour profile kept,
 * and nothing else of the file's metadata — no EXIF (so no GPS position or maker notes), XMP or
 * IPTC. JPEG, PNG and WebP keep their format (JPEG and WebP re-encoded at quality 95, PNG
 * losslessly); HEIC is stored as JPEG, which sharp can write. Checks the photo first like
 * `inspectPhoto`.
 */
export async function cleanOriginal(bytes: Buffer): Promise<{ bytes: Buffer; contentType: string }> {
  const { format } = await inspectPhoto(bytes);
  try {
    const upright = (await openUpright(bytes, format)).keepIccProfile();
    if (format === "png") return { bytes: await upright.png().toBuffer(), contentType: "image/png" };
    if (format === "webp") return { bytes: await upright.webp({ quality: 95 }).toBuffer(), contentType: "image/webp" };
    return { bytes: await upright.jpeg({ quality: 95, chromaSubsampling: "4:4:4" }).toBuffer(), contentType: "image/jpeg" };
  } catch (error) {
    if (error instanceof PhotoRejected) throw error;
    throw rejectionFromSharpError(error, format);
  }
}
