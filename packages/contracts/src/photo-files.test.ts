import { describe, expect, it } from "vitest";
import { MAX_PHOTO_BYTES, photoFileProblem } from "./listings.ts";

describe("photoFileProblem (checked in the browser before an upload)", () => {
  it("takes phone photos: JPEG, PNG, WebP, HEIC (also with no type, by name)", () => {
    expect(photoFileProblem({ name: "slab.jpg", size: 4_000_000, type: "image/jpeg" })).toBeNull();
    expect(photoFileProblem({ name: "slab.png", size: 4_000_000, type: "image/png" })).toBeNull();
    expect(photoFileProblem({ name: "slab.webp", size: 4_000_000, type: "image/webp" })).toBeNull();
    expect(photoFileProblem({ name: "IMG_0042.HEIC", size: 3_000_000, type: "" })).toBeNull();
    expect(photoFileProblem({ name: "IMG_0042.heic", size: 3_000_000, type: "image/heic" })).toBeNull();
    expect(photoFileProblem({ name: "edge.jpg", size: MAX_PHOTO_BYTES, type: "image/jpeg" })).toBeNull();
  });

  it("refuses a 50 MB file, an empty one, a drawing and a document, saying why", () => {
    expect(photoFileProblem({ name: "huge.jpg", size: 50 * 1024 * 1024, type: "image/jpeg" })).toBe(
      "“huge.jpg” is 50.0 MB; photos can be at most 25 MB.",
    );
    expect(photoFileProblem({ name: "edge.jpg", size: MAX_PHOTO_BYTES + 1, type: "image/jpeg" })).toMatch(/at most 25 MB/);
    expect(photoFileProblem({ name: "blank.jpg", size: 0, type: "image/jpeg" })).toMatch(/is empty/);
    expect(photoFileProblem({ name: "logo.svg", size: 2_000, type: "image/svg+xml" })).toMatch(/JPEG, PNG, WebP or HEIC/);
    expect(photoFileProblem({ name: "notes.txt", size: 2_000, type: "" })).toMatch(/not a photo/);
    expect(photoFileProblem({ name: "invoice.pdf", size: 2_000, type: "application/pdf" })).toMatch(/not a photo/);
  });
});
