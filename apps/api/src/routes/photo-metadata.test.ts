import { ListObjectsV2Command } from "@aws-sdk/client-s3";
import exifReader from "exif-reader";
import sharp from "sharp";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { createPhotoStorage } from "../integrations/storage.ts";
import { getObjectBytes } from "../photos/index.ts";
import { DISPLAY_SIZES } from "../photos/photo-processing.ts";
import { createTestContext, type BrowserClient, type TestContext } from "../test-support/test-context.ts";

/*
 * No location in any stored file: every object an upload leaves in the bucket (the private
 * original too) is read straight back from the S3 API and searched for EXIF, GPS and XMP.
 */

const XMP_MARKER = "grainyard-xmp-location-marker";
const XMP_PACKET =
  `<?xpacket begin="" id="W5M0MpCehiHzreSzNTczkc9d"?><x:xmpmeta xmlns:x="adobe:ns:meta/"><rdf:RDF xmlns:rdf="http://www.w3.org/1999/02/22-rdf-syntax-ns#">` +
  `<rdf:Description xmlns:exif="http://ns.adobe.com/exif/1.0/" xmlns:dc="http://purl.org/dc/elements/1.1/" exif:GPSLatitude="45,30.2057N" exif:GPSLongitude="122,40.9463W"><dc:source>${XMP_MARKER}</dc:source></rdf:Description>` +
  `</rdf:RDF></x:xmpmeta><?xpacket end="w"?>`;

/** 1200 × 600 stored with EXIF orientation 6 (shown 600 × 1200), a GPS position, a maker and XMP with a location. */
async function phonePhoto(): Promise<Buffer> {
  return sharp({ create: { width: 1200, height: 600, channels: 3, background: "#8a5a32" } })
    .jpeg({ quality: 90 })
    .withExif({
      IFD0: { Make: "TestPhone", Model: "Yard 12" },
      IFD3: { GPSLatitudeRef: "N", GPSLatitude: "45/1 30/1 1234/100", GPSLongitudeRef: "W", GPSLongitude: "122/1 40/1 5678/100" },
    })
    .withMetadata({ orientation: 6 })
    .withXmp(XMP_PACKET)
    .toBuffer();
}

let ctx: TestContext;
let sawyer: BrowserClient;
let input: Buffer;
const storage = () => createPhotoStorage(ctx.config.storage);

beforeAll(async () => {
  ctx = await createTestContext();
  sawyer = await ctx.signedInClient("sawyer");
  input = await phonePhoto();
}, 60_000);
afterAll(async () => ctx?.close());

const send = (path: string) => sawyer.agent.post(path).set("x-csrf-token", sawyer.csrfToken).set("content-type", "image/jpeg").send(input);

/** Every object under a prefix, read back from the S3 API, checked for any trace of the location. */
async function expectNoLocationUnder(prefix: string): Promise<string[]> {
  const client = storage();
  try {
    const listed = await client.client.send(new ListObjectsV2Command({ Bucket: client.bucket, Prefix: prefix }));
    const keys = (listed.Contents ?? []).map((o) => o.Key!).sort();
    for (const key of keys) {
      const bytes = (await getObjectBytes(client.client, client.bucket, key))!;
      const metadata = await sharp(bytes).metadata();
      expect(metadata.exif, key).toBeUndefined();
      expect(metadata.xmp, key).toBeUndefined();
      expect(metadata.iptc, key).toBeUndefined();
      expect(metadata.orientation, key).toBeUndefined();
      for (const marker of ["Exif", "GPS", "TestPhone", XMP_MARKER, "xmpmeta"])
        expect(bytes.includes(Buffer.from(marker)), `${key}: ${marker}`).toBe(false);
    }
    return keys;
  } finally {
    client.close();
  }
}

describe("no location in any stored file", () => {
  it("the upload really carries a GPS position, a maker and XMP (so the checks can fail)", async () => {
    const metadata = await sharp(input).metadata();
    expect(metadata.orientation).toBe(6);
    expect(exifReader(metadata.exif!).GPSInfo?.GPSLatitude).toEqual([45, 30, 12.34]);
    expect(metadata.exif?.includes(Buffer.from("TestPhone"))).toBe(true);
    expect(metadata.xmp?.toString("utf8")).toContain(XMP_MARKER);
  });

  it("a listing photo: the original and both sizes in the bucket hold no EXIF, GPS, XMP or maker; the original is upright at full size", async () => {
    const slab = (
      await sawyer.post("/api/v1/yard/slabs", {
        speciesSlug: "black-walnut",
        lengthMm: 2000,
        thicknessMm: 50,
        widthStationsMm: [600, 580],
        liveEdge: "both",
        surfacing: "sanded",
        dryingMethod: "kiln",
      })
    ).body.slab;
    const listing = (
      await sawyer.post("/api/v1/yard/listings", { title: "Walnut top", slabIds: [slab.id], priceMode: "fixed", rateMinor: 50_000 })
    ).body.listing;
    const res = await send(`/api/v1/yard/listings/${listing.id}/photos`);
    expect(res.status).toBe(201);
    const photoId = res.body.photo.id as string;
    expect(await expectNoLocationUnder(`originals/${listing.id}/`)).toEqual([`originals/${listing.id}/${photoId}`]);
    // Every display size (small, medium, large), each checked.
    expect(await expectNoLocationUnder(`display/${listing.id}/`)).toHaveLength(DISPLAY_SIZES.length);
    const client = storage();
    const original = (await getObjectBytes(client.client, client.bucket, `originals/${listing.id}/${photoId}`))!;
    client.close();
    const metadata = await sharp(original).metadata();
    expect({ format: metadata.format, width: metadata.width, height: metadata.height }).toEqual({
      format: "jpeg",
      width: 600,
      height: 1200,
    });
  });

  it("a log photo: its stored original and sizes hold no location either", async () => {
    const log = (
      await sawyer.post("/api/v1/yard/logs", {
        speciesSlug: "black-walnut",
        siteTown: "Lakemont",
        siteKind: "street",
        fellingReason: "storm",
      })
    ).body.log;
    const res = await send(`/api/v1/yard/logs/${log.id}/photos`);
    expect(res.status).toBe(201);
    const keys = await expectNoLocationUnder(`logs/${log.id}/`);
    expect(keys).toContain(`logs/${log.id}/${res.body.photo.id}/original`);
    expect(keys).toHaveLength(1 + DISPLAY_SIZES.length);
  });
});
