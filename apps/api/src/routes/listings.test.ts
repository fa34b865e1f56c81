import { GetObjectCommand, ListObjectsV2Command } from "@aws-sdk/client-s3";
import exifReader from "exif-reader";
import sharp from "sharp";
import request from "supertest";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { ListingPhotoEntity } from "../entities/index.ts";
import { createPhotoStorage } from "../integrations/storage.ts";
import { createTestContext, mailTo, type BrowserClient, type TestContext } from "../test-support/test-context.ts";

let ctx: TestContext;
let sawyer: BrowserClient & { account: { id: string; email: string } };
let otherSawyer: BrowserClient;
let admin: BrowserClient;
let buyer: BrowserClient;
beforeAll(async () => {
  ctx = await createTestContext();
  sawyer = await ctx.signedInClient("sawyer");
  otherSawyer = await ctx.signedInClient("sawyer");
  admin = await ctx.signedInClient("admin");
  buyer = await ctx.signedInClient("buyer");
});
afterAll(async () => ctx?.close());

const slabBase = {
  speciesSlug: "black-walnut",
  lengthMm: 2438,
  thicknessMm: 76,
  widthStationsMm: [305, 305, 305],
  liveEdge: "both",
  surfacing: "flattened",
  dryingMethod: "kiln",
};

async function newSlab(client: BrowserClient, overrides: Record<string, unknown> = {}) {
  const res = await client.post("/api/v1/yard/slabs", { ...slabBase, ...overrides });
  if (res.status !== 201) throw new Error(JSON.stringify(res.body));
  return res.body.slab as { id: string; figures: { boardFeet: number; volumeM3: number } };
}

/** A phone photo: a JPEG that carries the yard's GPS position in its EXIF (sharp writes IFD3 = GPS). */
async function phonePhoto(): Promise<Buffer> {
  return sharp({ create: { width: 1200, height: 800, channels: 3, background: { r: 150, g: 98, b: 60 } } })
    .jpeg({ quality: 85 })
    .withExif({
      IFD0: { Make: "YardPhone" },
      IFD3: { GPSLatitudeRef: "N", GPSLatitude: "45/1 30/1 1234/100", GPSLongitudeRef: "W", GPSLongitude: "122/1 40/1 5678/100" },
    })
    .toBuffer();
}

function upload(client: BrowserClient, listingId: string, bytes: Buffer, contentType = "image/jpeg", altText = "Top face, oiled") {
  return client.agent
    .post(`/api/v1/yard/listings/${listingId}/photos?altText=${encodeURIComponent(altText)}`)
    .set("x-csrf-token", client.csrfToken)
    .set("content-type", contentType)
    .send(bytes);
}

describe("listing figures", () => {
  it("prices per board foot on the server and splits the fees so they sum to the price", async () => {
    const slab = await newSlab(sawyer);
    const res = await sawyer.post("/api/v1/yard/listings", {
      title: "Walnut slab, 8 ft",
      slabIds: [slab.id],
      priceMode: "per_board_foot",
      rateMinor: 1200,
      figures: { priceMinor: 1 },
    });
    expect(res.status).toBe(201);
    const { figures, status } = res.body.listing;
    expect(status).toBe("draft");
    // Hand-worked with the documented rule (half-up once per fee): bf × 12.00, 10 % platform, 2.9 % + 0.30 processing.
    const price = Math.round(slab.figures.boardFeet * 1200);
    const platform = Math.round(price * 0.1);
    const processing = Math.round(price * 0.029) + 30;
    expect(figures.priceMinor).toBe(price);
    expect(figures.platformFeeMinor).toBe(platform);
    expect(figures.processingFeeMinor).toBe(processing);
    expect(figures.sawyerNetMinor).toBe(price - platform - processing);
    expect(figures.priceMinor).not.toBe(1);
  });

  it("prices per cubic metre and as a fixed price", async () => {
    const slab = await newSlab(sawyer);
    const perVolume = await sawyer.post("/api/v1/yard/listings", {
      title: "Per volume",
      slabIds: [slab.id],
      priceMode: "per_cubic_metre",
      rateMinor: 500_000,
    });
    expect(perVolume.body.listing.figures.priceMinor).toBe(Math.round(slab.figures.volumeM3 * 500_000));
    const slab2 = await newSlab(sawyer);
    const fixed = await sawyer.post("/api/v1/yard/listings", {
      title: "Fixed price",
      slabIds: [slab2.id],
      priceMode: "fixed",
      rateMinor: 45_000,
    });
    expect(fixed.body.listing.figures.priceMinor).toBe(45_000);
  });

  it("follows a slab's new figures while the listing is a draft", async () => {
    const slab = await newSlab(sawyer);
    const listing = (
      await sawyer.post("/api/v1/yard/listings", { title: "Follows", slabIds: [slab.id], priceMode: "per_board_foot", rateMinor: 1000 })
    ).body.listing;
    await sawyer.patch(`/api/v1/yard/slabs/${slab.id}`, { thicknessMm: 152 });
    const after = (await sawyer.get(`/api/v1/yard/listings/${listing.id}`)).body.listing;
    expect(after.figures.priceMinor / listing.figures.priceMinor).toBeCloseTo(2, 1);
  });
});

describe("sets and slab rules", () => {
  it("sells neighbouring slabs of one log as a bookmatched pair, and refuses mismatched sets", async () => {
    const log = (
      await sawyer.post("/api/v1/yard/logs", {
        speciesSlug: "black-walnut",
        siteTown: "Lakemont",
        siteKind: "park",
        fellingReason: "disease",
      })
    ).body.log;
    const [one, two, four] = [
      await newSlab(sawyer, { logId: log.id, sequenceInLog: 1 }),
      await newSlab(sawyer, { logId: log.id, sequenceInLog: 2 }),
      await newSlab(sawyer, { logId: log.id, sequenceInLog: 4 }),
    ];
    const loose = await newSlab(sawyer);
    const pair = await sawyer.post("/api/v1/yard/listings", {
      title: "Bookmatched walnut pair",
      slabIds: [one.id, two.id],
      setKind: "bookmatched",
      priceMode: "fixed",
      rateMinor: 180_000,
    });
    expect(pair.status).toBe(201);
    expect(pair.body.listing.slabs.map((s: { sequenceInLog: number }) => s.sequenceInLog)).toEqual([1, 2]);
    const gap = await sawyer.post("/api/v1/yard/listings", {
      title: "Not neighbours",
      slabIds: [two.id, four.id],
      setKind: "sequential",
      priceMode: "fixed",
      rateMinor: 1000,
    });
    expect(gap.status).toBe(409); // slab two is already in the pair
    const mixed = await sawyer.post("/api/v1/yard/listings", {
      title: "Mixed logs",
      slabIds: [four.id, loose.id],
      setKind: "sequential",
      priceMode: "fixed",
      rateMinor: 1000,
    });
    expect(mixed.status).toBe(422);
    expect(mixed.body.error.fields.slabIds).toMatch(/one log/);
    const three = await sawyer.post("/api/v1/yard/listings", {
      title: "Three in a pair",
      slabIds: [one.id, two.id, four.id],
      setKind: "bookmatched",
      priceMode: "fixed",
      rateMinor: 1000,
    });
    expect(three.status).toBe(422);
  });

  it("refuses another yard's slab, and a slab already listed", async () => {
    const theirs = await newSlab(otherSawyer);
    expect(
      (await sawyer.post("/api/v1/yard/listings", { title: "Not mine", slabIds: [theirs.id], priceMode: "fixed", rateMinor: 1000 })).status,
    ).toBe(403);
    const mine = await newSlab(sawyer);
    expect(
      (await sawyer.post("/api/v1/yard/listings", { title: "First", slabIds: [mine.id], priceMode: "fixed", rateMinor: 1000 })).status,
    ).toBe(201);
    const second = await sawyer.post("/api/v1/yard/listings", { title: "Second", slabIds: [mine.id], priceMode: "fixed", rateMinor: 1000 });
    expect(second.status).toBe(409);
    expect(second.body.error.code).toBe("slab_already_listed");
    expect(
      (
        await sawyer.post("/api/v1/yard/listings", {
          title: "No way out",
          slabIds: [mine.id],
          priceMode: "fixed",
          rateMinor: 1000,
          pickup: false,
          freight: false,
        })
      ).body.error.fields.pickup,
    ).toBeTruthy();
  });
});

describe("photos", () => {
  it("stores the original privately and serves WebP sizes with no EXIF or GPS", async () => {
    const slab = await newSlab(sawyer);
    const listing = (
      await sawyer.post("/api/v1/yard/listings", { title: "Photo check", slabIds: [slab.id], priceMode: "fixed", rateMinor: 9000 })
    ).body.listing;
    const input = await phonePhoto();
    expect(exifReader((await sharp(input).metadata()).exif!).GPSInfo?.GPSLatitude).toEqual([45, 30, 12.34]); // the input really carries GPS
    const res = await upload(sawyer, listing.id, input);
    expect(res.status).toBe(201);
    expect(res.body.photo).toMatchObject({ altText: "Top face, oiled", position: 0, width: 1200, height: 800 });

    // Read back what is served and what is stored: no metadata in either.
    const served = await sawyer.agent
      .get(res.body.photo.largeUrl)
      .buffer(true)
      .parse((r, done) => {
        const chunks: Buffer[] = [];
        r.on("data", (c: Buffer) => chunks.push(c));
        r.on("end", () => done(null, Buffer.concat(chunks)));
      });
    expect(served.status).toBe(200);
    expect(served.headers["content-type"]).toBe("image/webp");
    const meta = await sharp(served.body as Buffer).metadata();
    expect(meta.format).toBe("webp");
    expect(meta.exif).toBeUndefined();
    expect(meta.xmp).toBeUndefined();
    expect((served.body as Buffer).includes(Buffer.from("Exif"))).toBe(false);

    const storage = createPhotoStorage(ctx.config.storage);
    const listed = await storage.client.send(new ListObjectsV2Command({ Bucket: storage.bucket, Prefix: `display/${listing.id}/` }));
    expect(listed.Contents?.map((o) => o.Key).sort()).toEqual([
      `display/${listing.id}/${res.body.photo.id}/large.webp`,
      `display/${listing.id}/${res.body.photo.id}/small.webp`,
    ]);
    const small = await storage.client.send(
      new GetObjectCommand({ Bucket: storage.bucket, Key: `display/${listing.id}/${res.body.photo.id}/small.webp` }),
    );
    const smallBytes = Buffer.from(await small.Body!.transformToByteArray());
    const smallMeta = await sharp(smallBytes).metadata();
    expect(Math.max(smallMeta.width!, smallMeta.height!)).toBe(400);
    expect(smallMeta.exif).toBeUndefined();
    storage.close();

    // Before the listing is live only its sawyer (and admins) can see the photo.
    expect((await buyer.get(res.body.photo.smallUrl)).status).toBe(404);
    expect((await otherSawyer.get(res.body.photo.smallUrl)).status).toBe(404);
    expect((await admin.get(res.body.photo.smallUrl)).status).toBe(200);
  });

  it("refuses files that are not photos by their bytes, and stores nothing for them", async () => {
    const slab = await newSlab(sawyer);
    const listing = (
      await sawyer.post("/api/v1/yard/listings", { title: "Bad files", slabIds: [slab.id], priceMode: "fixed", rateMinor: 9000 })
    ).body.listing;
    const text = await upload(sawyer, listing.id, Buffer.from("this is a shopping list, not a photo"), "image/jpeg");
    expect(text.status).toBe(422);
    expect(text.body.error.code).toBe("not_an_image");
    const gif = await upload(
      sawyer,
      listing.id,
      await sharp({ create: { width: 20, height: 20, channels: 3, background: "red" } })
        .gif()
        .toBuffer(),
      "image/gif",
    );
    expect(gif.body.error.code).toBe("unsupported_format");
    const huge = await upload(sawyer, listing.id, Buffer.alloc(26 * 1024 * 1024, 0xff), "image/jpeg");
    expect(huge.status).toBe(413);
    expect(huge.body.error.message).toMatch(/25 MB/);
    expect(await ctx.dataSource.getRepository(ListingPhotoEntity).countBy({ listingId: listing.id })).toBe(0);
    const storage = createPhotoStorage(ctx.config.storage);
    const listed = await storage.client.send(new ListObjectsV2Command({ Bucket: storage.bucket, Prefix: `originals/${listing.id}/` }));
    expect(listed.KeyCount ?? 0).toBe(0);
    storage.close();
  });

  it("fails clearly and leaves no row when storage is down", async () => {
    const down = await createTestContext({ environment: { S3_ENDPOINT: "http://127.0.0.1:9" } });
    try {
      const client = await down.signedInClient("sawyer");
      const slab = (await client.post("/api/v1/yard/slabs", slabBase)).body.slab;
      const listing = (
        await client.post("/api/v1/yard/listings", { title: "Storage down", slabIds: [slab.id], priceMode: "fixed", rateMinor: 9000 })
      ).body.listing;
      const res = await upload(client, listing.id, await phonePhoto());
      expect(res.status).toBe(503);
      expect(res.body).toEqual({
        error: { code: "storage_unavailable", message: "Photo storage is not answering just now. Please try again in a moment." },
      });
      expect(await down.dataSource.getRepository(ListingPhotoEntity).countBy({ listingId: listing.id })).toBe(0);

      // A log photo the same way: no key, no driver or stack text in the answer; all of it in the log.
      const log = (
        await client.post("/api/v1/yard/logs", {
          speciesSlug: "white-oak",
          siteTown: "Lakemont",
          siteKind: "street",
          fellingReason: "storm",
        })
      ).body.log;
      const logPhoto = await client.agent
        .post(`/api/v1/yard/logs/${log.id}/photos`)
        .set("x-csrf-token", client.csrfToken)
        .set("content-type", "image/jpeg")
        .send(await phonePhoto());
      expect(logPhoto.status).toBe(503);
      for (const answer of [res, logPhoto]) {
        const text = JSON.stringify(answer.body) + JSON.stringify(answer.headers);
        expect(text).not.toMatch(/originals\/|display\/|logs\/|ECONNREFUSED|AbortError|TimeoutError|Error:|127\.0\.0\.1:9|\.ts:\d/);
        expect(text).not.toContain(listing.id);
        expect(text).not.toContain(log.id);
      }
      const logged = down.logLines.join("\n");
      expect(logged).toContain(`could not store originals/${listing.id}/`);
      expect(logged).toContain(`could not store logs/${log.id}/`);
      expect(logged).toMatch(/ECONNREFUSED/);
    } finally {
      await down.close();
    }
  });

  it("reorders photos, changes alt text and removes a photo; other yards cannot", async () => {
    const slab = await newSlab(sawyer);
    const listing = (
      await sawyer.post("/api/v1/yard/listings", { title: "Order", slabIds: [slab.id], priceMode: "fixed", rateMinor: 9000 })
    ).body.listing;
    const a = (await upload(sawyer, listing.id, await phonePhoto(), "image/jpeg", "first")).body.photo;
    const b = (await upload(sawyer, listing.id, await phonePhoto(), "image/jpeg", "second")).body.photo;
    expect((await upload(otherSawyer, listing.id, await phonePhoto())).status).toBe(403);
    const reordered = await sawyer.agent
      .put(`/api/v1/yard/listings/${listing.id}/photo-order`)
      .set("x-csrf-token", sawyer.csrfToken)
      .send({ photoIds: [b.id, a.id] });
    expect(reordered.body.photos.map((p: { id: string }) => p.id)).toEqual([b.id, a.id]);
    expect((await sawyer.patch(`/api/v1/yard/listings/${listing.id}/photos/${a.id}`, { altText: "End grain" })).body.photo.altText).toBe(
      "End grain",
    );
    expect((await sawyer.delete(`/api/v1/yard/listings/${listing.id}/photos/${b.id}`)).status).toBe(204);
    const after = (await sawyer.get(`/api/v1/yard/listings/${listing.id}`)).body.listing;
    expect(after.photos.map((p: { id: string; altText: string }) => [p.id, p.altText])).toEqual([[a.id, "End grain"]]);
  });
});

describe("review flow", () => {
  it("draft → review → sent back with a reason → edited → resubmitted → live, with e-mails; measurements lock while live", async () => {
    const slab = await newSlab(sawyer);
    const listing = (
      await sawyer.post("/api/v1/yard/listings", {
        title: "Walnut for review",
        slabIds: [slab.id],
        priceMode: "per_board_foot",
        rateMinor: 1500,
      })
    ).body.listing;

    const noPhoto = await sawyer.post(`/api/v1/yard/listings/${listing.id}/submit`);
    expect(noPhoto.status).toBe(422);
    expect(noPhoto.body.error.code).toBe("photos_missing");
    await upload(sawyer, listing.id, await phonePhoto());

    const submitted = await sawyer.post(`/api/v1/yard/listings/${listing.id}/submit`);
    expect(submitted.status).toBe(200);
    expect(submitted.body.listing.status).toBe("in_review");
    expect((await sawyer.patch(`/api/v1/yard/listings/${listing.id}`, { title: "Sneaky change" })).status).toBe(409);

    const desk = (await admin.get("/api/v1/admin/review-desk")).body.items.map((item: { listing: { id: string } }) => item.listing.id);
    expect(desk).toContain(listing.id);
    expect((await sawyer.get("/api/v1/admin/review-desk")).status).toBe(403);
    expect((await admin.post(`/api/v1/admin/listings/${listing.id}/send-back`, {})).status).toBe(422);
    const sentBack = await admin.post(`/api/v1/admin/listings/${listing.id}/send-back`, { reason: "Please add a photo of the end grain." });
    expect(sentBack.body.listing).toMatchObject({ status: "sent_back", reviewNote: "Please add a photo of the end grain." });
    expect((await mailTo(sawyer.account.email))[0]!.text).toContain("Please add a photo of the end grain.");

    const edited = await sawyer.patch(`/api/v1/yard/listings/${listing.id}`, { description: "End grain photo added." });
    expect(edited.body.listing.status).toBe("sent_back");
    expect((await sawyer.post(`/api/v1/yard/listings/${listing.id}/submit`)).body.listing.status).toBe("in_review");
    const approved = await admin.post(`/api/v1/admin/listings/${listing.id}/approve`);
    expect(approved.body.listing.status).toBe("live");
    expect(approved.body.listing.publishedAt).not.toBeNull();
    expect((await mailTo(sawyer.account.email))[0]!.subject).toMatch(/live/i);
    expect((await admin.post(`/api/v1/admin/listings/${listing.id}/approve`)).status).toBe(409);

    // Live: photos are public, the slab's measurements are locked until the listing is withdrawn.
    expect((await request(ctx.app).get(approved.body.listing.photos[0].smallUrl)).status).toBe(200);
    const locked = await sawyer.patch(`/api/v1/yard/slabs/${slab.id}`, { lengthMm: 3000 });
    expect(locked.status).toBe(409);
    expect(locked.body.error.code).toBe("slab_locked");
    expect((await otherSawyer.post(`/api/v1/yard/listings/${listing.id}/withdraw`)).status).toBe(403);
    expect((await sawyer.post(`/api/v1/yard/listings/${listing.id}/withdraw`)).body.listing.status).toBe("withdrawn");
    expect((await sawyer.patch(`/api/v1/yard/slabs/${slab.id}`, { lengthMm: 3000 })).status).toBe(200);
  });

  it("only a sawyer with a confirmed e-mail can submit", async () => {
    const unverified = await ctx.signedInClient("sawyer", { emailVerifiedAt: null });
    const slab = await newSlab(unverified);
    const listing = (
      await unverified.post("/api/v1/yard/listings", { title: "Unverified", slabIds: [slab.id], priceMode: "fixed", rateMinor: 9000 })
    ).body.listing;
    await upload(unverified, listing.id, await phonePhoto());
    const res = await unverified.post(`/api/v1/yard/listings/${listing.id}/submit`);
    expect(res.status).toBe(403);
    expect(res.body.error.code).toBe("email_unverified");
  });
});

describe("log photos", () => {
  it("stores a log's photos without metadata, shows them with the slab page once a slab from the log is live", async () => {
    const log = (
      await sawyer.post("/api/v1/yard/logs", {
        speciesSlug: "black-walnut",
        siteTown: "Lakemont",
        siteKind: "private_yard",
        fellingReason: "hazard",
      })
    ).body.log;
    const upload = (client: BrowserClient, bytes: Buffer) =>
      client.agent
        .post(`/api/v1/yard/logs/${log.id}/photos?altText=${encodeURIComponent("The log on the trailer")}`)
        .set("x-csrf-token", client.csrfToken)
        .set("content-type", "image/jpeg")
        .send(bytes);
    const res = await upload(sawyer, await phonePhoto());
    expect(res.status).toBe(201);
    expect(res.body.photo.altText).toBe("The log on the trailer");
    expect((await upload(otherSawyer, await phonePhoto())).status).toBe(403);
    expect((await upload(sawyer, Buffer.from("not a picture"))).body.error.code).toBe("not_an_image");
    const detail = await sawyer.get(`/api/v1/yard/logs/${log.id}`);
    expect(detail.body.photos.map((p: { id: string }) => p.id)).toEqual([res.body.photo.id]);

    const own = await sawyer.agent
      .get(res.body.photo.largeUrl)
      .buffer(true)
      .parse((r, done) => {
        const chunks: Buffer[] = [];
        r.on("data", (c: Buffer) => chunks.push(c));
        r.on("end", () => done(null, Buffer.concat(chunks)));
      });
    expect(own.status).toBe(200);
    expect((await sharp(own.body as Buffer).metadata()).exif).toBeUndefined();
    // Nothing from this log is live yet: hidden from others.
    expect((await request(ctx.app).get(res.body.photo.smallUrl)).status).toBe(404);

    const slab = await newSlab(sawyer, { logId: log.id, sequenceInLog: 1 });
    const listing = (
      await sawyer.post("/api/v1/yard/listings", {
        title: "Walnut from the yard tree",
        slabIds: [slab.id],
        priceMode: "fixed",
        rateMinor: 30_000,
      })
    ).body.listing;
    await upload(sawyer, await phonePhoto()); // a second log photo
    await sawyer.agent
      .post(`/api/v1/yard/listings/${listing.id}/photos`)
      .set("x-csrf-token", sawyer.csrfToken)
      .set("content-type", "image/jpeg")
      .send(await phonePhoto());
    await sawyer.post(`/api/v1/yard/listings/${listing.id}/submit`);
    await admin.post(`/api/v1/admin/listings/${listing.id}/approve`);
    expect((await request(ctx.app).get(res.body.photo.smallUrl)).status).toBe(200);
    const page = await request(ctx.app).get(`/api/v1/catalogue/${listing.id}`);
    expect(page.body.logPhotos).toHaveLength(2);

    expect((await otherSawyer.delete(`/api/v1/yard/logs/${log.id}/photos/${res.body.photo.id}`)).status).toBe(403);
    expect((await sawyer.delete(`/api/v1/yard/logs/${log.id}/photos/${res.body.photo.id}`)).status).toBe(204);
    expect((await request(ctx.app).get(res.body.photo.smallUrl)).status).toBe(404);
  });
});
