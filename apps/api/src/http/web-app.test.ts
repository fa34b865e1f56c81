import { once } from "node:events";
import { get, type IncomingMessage } from "node:http";
import type { AddressInfo } from "node:net";
import { mkdtempSync, mkdirSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { gunzipSync } from "node:zlib";
import request from "supertest";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { createTestContext } from "../test-support/test-context.ts";

// A built web app in miniature (the browser's half only, so every page is the shell): the page
// template, and one content-named script larger than the compression threshold.
const webDist = mkdtempSync(join(tmpdir(), "grainyard-web-"));
const script = `export const rows = ${JSON.stringify(Array.from({ length: 400 }, (_, i) => ({ slab: i, species: "black walnut" })))};`;
mkdirSync(join(webDist, "client", "assets"), { recursive: true });
writeFileSync(
  join(webDist, "client", "index.html"),
  "<!doctype html><head><!--app-head--></head><div id=app><!--app-html--></div><!--app-state-->",
);
writeFileSync(join(webDist, "client", "assets", "browse-3f9a1c.js"), script);

let ctx: Awaited<ReturnType<typeof createTestContext>>;

/** A GET through node:http, keeping the bytes exactly as sent (supertest inflates them). */
async function rawGet(path: string, headers: Record<string, string>) {
  const server = ctx.app.listen(0, "127.0.0.1");
  await once(server, "listening");
  try {
    const { port } = server.address() as AddressInfo;
    const response = await new Promise<IncomingMessage>((resolve, reject) =>
      get({ host: "127.0.0.1", port, path, headers }, resolve).on("error", reject),
    );
    const chunks: Buffer[] = [];
    for await (const chunk of response) chunks.push(chunk as Buffer);
    return { headers: response.headers, body: Buffer.concat(chunks) };
  } finally {
    server.close();
  }
}
beforeAll(async () => {
  ctx = await createTestContext({ environment: { WEB_DIST: webDist } });
});
afterAll(async () => {
  await ctx.close();
  rmSync(webDist, { recursive: true, force: true });
});

describe("serving the web app", () => {
  it("keeps content-named assets for good and sends them compressed to browsers that take gzip", async () => {
    const res = await request(ctx.app).get("/assets/browse-3f9a1c.js").set("accept-encoding", "gzip");
    expect(res.status).toBe(200);
    expect(res.headers["cache-control"]).toMatch(/max-age=31536000.*immutable/);
    expect(res.headers["content-encoding"]).toBe("gzip");
    expect(res.text).toBe(script); // supertest inflates the body
    const plain = await request(ctx.app).get("/assets/browse-3f9a1c.js").set("accept-encoding", "identity");
    expect(plain.headers["content-encoding"]).toBeUndefined();
    expect(plain.text).toBe(script);
  });

  it("answers a missing asset with 404, not the app's page", async () => {
    const res = await request(ctx.app).get("/assets/browse-000000.js");
    expect(res.status).toBe(404);
    expect(res.text).not.toContain("<!doctype html>");
  });

  it("serves the page for the app's own routes, never cached, and never the raw template", async () => {
    const res = await request(ctx.app).get("/browse?species=white-oak");
    expect(res.status).toBe(200);
    expect(res.text).toContain("<div id=app></div>");
    expect(res.text).not.toContain("<!--app-");
    expect(res.headers["cache-control"]).toBe("no-cache");
    const template = await request(ctx.app).get("/index.html");
    expect(template.status).toBe(301);
    expect(template.headers.location).toBe("/");
  });

  it("answers a missing file-like address with a plain 404, not a page", async () => {
    const res = await request(ctx.app).get("/favicon.ico");
    expect(res.status).toBe(404);
    expect(res.headers["content-type"]).toMatch(/^text\/plain/);
  });

  it("compresses the catalogue's answer once for gzip clients: the same JSON and entity tag either way", async () => {
    const query = "/api/v1/catalogue?sort=price_low&limit=5";
    const plain = await request(ctx.app).get(query).set("accept-encoding", "identity");
    const gzipped = await rawGet(query, { "accept-encoding": "gzip, br" });
    expect(plain.headers["content-encoding"]).toBeUndefined();
    expect(gzipped.headers["content-encoding"]).toBe("gzip");
    expect(gzipped.headers.vary).toMatch(/Accept-Encoding/i);
    expect(gzipped.headers.etag).toBe(plain.headers.etag);
    // The bytes on the wire are gzip.
    const body = gzipped.body;
    expect(body.subarray(0, 2)).toEqual(Buffer.from([0x1f, 0x8b]));
    expect(JSON.parse(gunzipSync(body).toString("utf8"))).toEqual(plain.body);
  });
});
