import { afterEach, describe, expect, it } from "vitest";
import { CSRF_HEADER, listingEndpoints, pathOf } from "@grainyard/contracts";
import { ApiRequestError } from "./errors.ts";
import { transport } from "./http.ts";
import { listingsApi } from "./listings.ts";

/** Just enough of XMLHttpRequest to drive an upload by hand. */
class FakeXhr {
  static last: FakeXhr | null = null;
  method = "";
  url = "";
  headers: Record<string, string> = {};
  body: unknown = null;
  status = 0;
  responseText = "";
  withCredentials = false;
  upload: { onprogress: ((event: { lengthComputable: boolean; loaded: number; total: number }) => void) | null } = { onprogress: null };
  onload: (() => void) | null = null;
  onerror: (() => void) | null = null;
  ontimeout: (() => void) | null = null;
  onabort: (() => void) | null = null;
  constructor() {
    FakeXhr.last = this;
  }
  open(method: string, url: string) {
    this.method = method;
    this.url = url;
  }
  setRequestHeader(name: string, value: string) {
    this.headers[name] = value;
  }
  send(body: unknown) {
    this.body = body;
  }
  abort() {
    this.onabort?.();
  }
  progress(loaded: number, total: number) {
    this.upload.onprogress?.({ lengthComputable: true, loaded, total });
  }
  answer(status: number, body: unknown) {
    this.status = status;
    this.responseText = JSON.stringify(body);
    this.onload?.();
  }
}

afterEach(() => {
  transport.useXhr(undefined);
  transport.useCsrfToken(() => null);
});

function client() {
  transport.useCsrfToken(() => "tok-9");
  transport.useXhr(() => new FakeXhr() as unknown as XMLHttpRequest);
  return listingsApi;
}

const photo = {
  id: "ph_1",
  position: 0,
  altText: "Top face",
  width: 1600,
  height: 1000,
  smallUrl: "/s.webp",
  mediumUrl: "/m.webp",
  largeUrl: "/l.webp",
};

describe("photo upload", () => {
  it("posts the raw bytes with the file's type, the CSRF token and the alt text, reporting progress", async () => {
    const api = client();
    const file = new File(["jpeg bytes"], "slab.jpg", { type: "image/jpeg" });
    const seen: number[] = [];
    const pending = api.uploadListingPhoto(
      { listingId: "lst 1", body: file, query: { altText: "Top face" } },
      { onProgress: (fraction) => seen.push(fraction) },
    );
    const xhr = FakeXhr.last!;
    expect(xhr.method).toBe("POST");
    expect(xhr.url).toBe(`${pathOf(listingEndpoints.uploadListingPhoto, { listingId: "lst 1" })}?altText=Top+face`);
    expect(xhr.headers["content-type"]).toBe("image/jpeg");
    expect(xhr.headers[CSRF_HEADER]).toBe("tok-9");
    expect(xhr.body).toBe(file);
    xhr.progress(25, 100);
    xhr.progress(100, 100);
    xhr.answer(201, { photo });
    await expect(pending).resolves.toEqual({ photo });
    expect(seen).toEqual([0.25, 1, 1]);
  });

  it("sends application/octet-stream when the file has no type", async () => {
    const api = client();
    const pending = api.uploadListingPhoto({ listingId: "lst_1", body: new Blob(["?"]) });
    expect(FakeXhr.last!.headers["content-type"]).toBe("application/octet-stream");
    expect(FakeXhr.last!.url).toBe(pathOf(listingEndpoints.uploadListingPhoto, { listingId: "lst_1" }));
    FakeXhr.last!.answer(201, { photo });
    await pending;
  });

  it("turns the API's refusal into an error with its message", async () => {
    const api = client();
    const pending = api.uploadListingPhoto({ listingId: "lst_1", body: new File(["x"], "notes.txt", { type: "text/plain" }) });
    FakeXhr.last!.answer(415, { error: { code: "not_an_image", message: "That file is not a photo." } });
    const error = await pending.catch((caught: unknown) => caught);
    expect(error).toBeInstanceOf(ApiRequestError);
    expect((error as ApiRequestError).status).toBe(415);
    expect((error as ApiRequestError).message).toBe("That file is not a photo.");
  });

  it("says 'offline' when the connection drops", async () => {
    const api = client();
    const pending = api.uploadListingPhoto({ listingId: "lst_1", body: new File(["x"], "a.jpg", { type: "image/jpeg" }) });
    FakeXhr.last!.onerror?.();
    const error = await pending.catch((caught: unknown) => caught);
    expect((error as ApiRequestError).code).toBe("offline");
  });
});
