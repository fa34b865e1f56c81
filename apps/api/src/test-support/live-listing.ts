import sharp from "sharp";
import type { BrowserClient } from "./test-context.ts";

let photo: Promise<Buffer> | null = null;
/** A plain brown photo, made once. */
const slabPhoto = () =>
  (photo ??= sharp({ create: { width: 1200, height: 800, channels: 3, background: "#6b3e26" } })
    .jpeg()
    .toBuffer());

/**
 * A live listing of one slab, made the way a sawyer makes it (slab, moisture reading, listing,
 * photo, submission) and approved by an admin.
 */
export async function liveListing(
  sawyer: BrowserClient,
  admin: BrowserClient,
  options: { title: string; speciesSlug: string; rateMinor: number; description?: string },
): Promise<string> {
  const slab = await sawyer.post("/api/v1/yard/slabs", {
    speciesSlug: options.speciesSlug,
    lengthMm: 2440,
    thicknessMm: 51,
    widthStationsMm: [560, 540, 520],
    liveEdge: "both",
    surfacing: "flattened",
    dryingMethod: "kiln",
  });
  if (slab.status !== 201) throw new Error(JSON.stringify(slab.body));
  await sawyer.post(`/api/v1/yard/slabs/${slab.body.slab.id}/readings`, {
    readOn: "2026-01-10",
    moistureContentPct: 8,
    method: "pin_meter",
  });
  const made = await sawyer.post("/api/v1/yard/listings", {
    title: options.title,
    description: options.description ?? "",
    slabIds: [slab.body.slab.id],
    priceMode: "fixed",
    rateMinor: options.rateMinor,
    freight: true,
  });
  if (made.status !== 201) throw new Error(JSON.stringify(made.body));
  const id = made.body.listing.id as string;
  const uploaded = await sawyer.agent
    .post(`/api/v1/yard/listings/${id}/photos?altText=${encodeURIComponent(`${options.title}, top face`)}`)
    .set("x-csrf-token", sawyer.csrfToken)
    .set("content-type", "image/jpeg")
    .send(await slabPhoto());
  if (uploaded.status !== 201) throw new Error(JSON.stringify(uploaded.body));
  const submitted = await sawyer.post(`/api/v1/yard/listings/${id}/submit`);
  if (submitted.status !== 200) throw new Error(JSON.stringify(submitted.body));
  const approved = await admin.post(`/api/v1/admin/listings/${id}/approve`);
  if (approved.status !== 200) throw new Error(JSON.stringify(approved.body));
  return id;
}
