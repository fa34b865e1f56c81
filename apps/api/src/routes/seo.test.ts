import request from "supertest";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { createSeoService } from "../services/seo-service.ts";
import { liveListing } from "../test-support/live-listing.ts";
import { createTestContext, type BrowserClient, type TestContext } from "../test-support/test-context.ts";

let ctx: TestContext;
let sawyer: BrowserClient;
let admin: BrowserClient;
const live: string[] = [];
let withdrawn: string;

/** The <loc> and <lastmod> of every <url> of a sitemap file. */
function urls(xml: string): { loc: string; lastmod: string | null }[] {
  return [...xml.matchAll(/<url><loc>([^<]+)<\/loc>(?:<lastmod>([^<]+)<\/lastmod>)?<\/url>/g)].map((m) => ({
    loc: m[1]!,
    lastmod: m[2] ?? null,
  }));
}

beforeAll(async () => {
  ctx = await createTestContext({ environment: { PUBLIC_URL: "https://grainyard.example" } });
  admin = await ctx.signedInClient("admin");
  sawyer = await ctx.signedInClient("sawyer");
  const species = ["black-walnut", "white-oak", "black-walnut", "silver-maple", "black-cherry", "white-oak", "american-elm"];
  for (const [index, slug] of species.entries())
    live.push(await liveListing(sawyer, admin, { title: `Slab ${index + 1}`, speciesSlug: slug, rateMinor: 10_000 }));
  withdrawn = live.pop()!;
  expect((await sawyer.post(`/api/v1/yard/listings/${withdrawn}/withdraw`)).status).toBe(200);
}, 60_000);
afterAll(async () => {
  await ctx?.close();
});

describe("robots.txt", () => {
  it("opens the public pages and the photos, closes everything personal, and names the sitemap", async () => {
    const res = await request(ctx.app).get("/robots.txt");
    expect(res.status).toBe(200);
    expect(res.headers["content-type"]).toBe("text/plain; charset=utf-8");
    const lines = res.text.split("\n");
    expect(lines).toContain("User-agent: *");
    expect(lines).toContain("Allow: /api/v1/photos/");
    for (const path of [
      "/api/",
      "/yard$",
      "/yard/",
      "/orders",
      "/account",
      "/admin",
      "/messages",
      "/favourites",
      "/saved-searches",
      "/sign-in",
    ])
      expect(lines).toContain(`Disallow: ${path}`);
    // The public pages stay open, including the yard pages to come (/yards/…).
    expect(lines.filter((line) => /^Disallow: \/(browse|slabs|yards)/.test(line))).toEqual([]);
    expect(lines).toContain("Sitemap: https://grainyard.example/sitemap.xml");
  });
});

describe("sitemap.xml", () => {
  it("lists the home page, the catalogue, each species on sale and every live slab with its last change", async () => {
    const res = await request(ctx.app).get("/sitemap.xml");
    expect(res.status).toBe(200);
    expect(res.headers["content-type"]).toBe("application/xml; charset=utf-8");
    expect(
      res.text.startsWith('<?xml version="1.0" encoding="UTF-8"?>\n<urlset xmlns="http://www.sitemaps.org/schemas/sitemap/0.9">'),
    ).toBe(true);
    expect(res.text.trim().endsWith("</urlset>")).toBe(true);
    const entries = urls(res.text);
    const locs = entries.map((entry) => entry.loc);
    expect(locs.slice(0, 2)).toEqual(["https://grainyard.example/", "https://grainyard.example/browse"]);
    for (const slug of ["black-cherry", "black-walnut", "silver-maple", "white-oak"])
      expect(locs).toContain(`https://grainyard.example/browse?species=${slug}`);
    // The only elm was taken off sale: no page for it, and not its slab either.
    expect(locs).not.toContain("https://grainyard.example/browse?species=american-elm");
    expect(locs).not.toContain(`https://grainyard.example/slabs/${withdrawn}`);
    const slabs = entries.filter((entry) => entry.loc.includes("/slabs/"));
    expect(slabs.map((entry) => entry.loc).sort()).toEqual(live.map((id) => `https://grainyard.example/slabs/${id}`).sort());
    // No private page is ever listed.
    expect(locs.filter((loc) => /\/(yard|orders|account|admin|messages|favourites|saved-searches|sign-in|join)\b/.test(loc))).toEqual([]);
    // lastmod is the listing's own change time (W3C datetime, to the second).
    const [row] = (await ctx.dataSource.query("SELECT updated_at FROM listing WHERE id = ?", [live[0]])) as { updated_at: Date }[];
    const first = slabs.find((entry) => entry.loc.endsWith(live[0]!));
    expect(first?.lastmod).toBe(new Date(row!.updated_at).toISOString().replace(/\.\d{3}Z$/, "Z"));
  });

  it("becomes an index of files past the limit, each slab in exactly one file, read in batches", async () => {
    // Three addresses per file and batches of two: the same paging as 50 000 per file, at a size a test can hold.
    const seo = createSeoService({ dataSource: ctx.dataSource, publicUrl: "https://grainyard.example", urlsPerFile: 3, batchSize: 2 });
    const plan = await seo.plan();
    expect(plan).toEqual({ kind: "index", slabFiles: 2 });
    const index = seo.indexXml(2);
    expect(index).toContain('<sitemapindex xmlns="http://www.sitemaps.org/schemas/sitemap/0.9">');
    expect([...index.matchAll(/<loc>([^<]+)<\/loc>/g)].map((m) => m[1])).toEqual([
      "https://grainyard.example/sitemaps/pages.xml",
      "https://grainyard.example/sitemaps/slabs-1.xml",
      "https://grainyard.example/sitemaps/slabs-2.xml",
    ]);
    const read = async (file: number) => {
      const parts = await seo.slabsXml(file);
      if (!parts) return null;
      let xml = "";
      for await (const part of parts) xml += part;
      return urls(xml).map((entry) => entry.loc.split("/slabs/")[1]);
    };
    const [one, two, three] = [await read(1), await read(2), await read(3)];
    expect(one).toHaveLength(3);
    expect(two).toHaveLength(3);
    expect(three).toBeNull();
    expect([...one!, ...two!]).toEqual([...live].sort());
    expect(urls(await seo.pagesXml()).map((entry) => entry.loc)).toContain("https://grainyard.example/browse");
  });

  it("serves the index's files at their addresses, and 404 past the last one", async () => {
    const pages = await request(ctx.app).get("/sitemaps/pages.xml");
    expect(pages.status).toBe(200);
    expect(pages.headers["content-type"]).toBe("application/xml; charset=utf-8");
    const slabs = await request(ctx.app).get("/sitemaps/slabs-1.xml");
    expect(urls(slabs.text)).toHaveLength(live.length);
    expect((await request(ctx.app).get("/sitemaps/slabs-2.xml")).status).toBe(404);
    expect((await request(ctx.app).get("/sitemaps/slabs-0.xml")).status).toBe(404);
  });
});
