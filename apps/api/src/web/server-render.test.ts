import { existsSync } from "node:fs";
import { join } from "node:path";
import request from "supertest";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { liveListing } from "../test-support/live-listing.ts";
import { createTestContext, type BrowserClient, type TestContext } from "../test-support/test-context.ts";

/*
 * The public pages as the server renders them, read as a search engine or a link preview reads
 * them: the HTML alone, no script run. Uses the real built web app (apps/web/dist: `npm test`
 * builds it first; by hand, `pnpm --filter @grainyard/web build`).
 */
const webDist = join(import.meta.dirname, "../../../web/dist");

let ctx: TestContext;
let sawyer: BrowserClient & { account: { id: string; email: string } };
let admin: BrowserClient;
const ids: Record<string, string> = {};

const live = (title: string, speciesSlug: string, rateMinor: number) =>
  liveListing(sawyer, admin, {
    title,
    speciesSlug,
    rateMinor,
    description: `${title}, from a storm-felled street tree. <b>Not bold</b> & "quoted" </script>`,
  });

/** The JSON-LD documents of a page, parsed (a syntax error fails the test). */
function jsonLd(html: string): Record<string, unknown>[] {
  return [...html.matchAll(/<script type="application\/ld\+json"[^>]*>([\s\S]*?)<\/script>/g)].map(
    (match) => JSON.parse(match[1]!) as Record<string, unknown>,
  );
}
const metaContent = (html: string, key: string) =>
  new RegExp(`<meta (?:name|property)="${key.replace(/[:+]/g, "\\$&")}" content="([^"]*)"`).exec(html)?.[1];
/** The visible text of the rendered app (tags dropped), to read like a person would. */
const appText = (html: string) =>
  html
    .slice(html.indexOf('<div id="app">'), html.indexOf('<script type="application/json"'))
    .replace(/<[^>]+>/g, " ")
    .replace(/&#39;/g, "'")
    .replace(/&quot;/g, '"')
    .replace(/&lt;/g, "<")
    .replace(/&gt;/g, ">")
    .replace(/&amp;/g, "&")
    .replace(/\s+/g, " ");

beforeAll(async () => {
  if (!existsSync(join(webDist, "server", "entry-server.js"))) {
    throw new Error("The web app is not built: run `pnpm --filter @grainyard/web build` (npm test does it before this suite).");
  }
  ctx = await createTestContext({ environment: { WEB_DIST: webDist, PUBLIC_URL: "https://grainyard.example" } });
  admin = await ctx.signedInClient("admin");
  sawyer = await ctx.signedInClient("sawyer", {
    displayName: "Oskar Lindqvist",
    yardName: "Harbour Hill Timber",
    pickupTown: "Lakemont",
    email: "oskar.private@harbourhill.test",
  });
  ids.walnut = await live("Black walnut counter slab", "black-walnut", 84_550);
  ids.walnutTwo = await live("Black walnut bench top", "black-walnut", 39_000);
  ids.withdrawn = await live("White oak shelf board", "white-oak", 12_000);
  expect((await sawyer.post(`/api/v1/yard/listings/${ids.withdrawn}/withdraw`)).status).toBe(200);
  ids.sold = await live("Black walnut desk slab", "black-walnut", 61_000);
  // A sale itself is covered end to end in checkout.test.ts; here only its outcome matters:
  // the listing is sold and out of the catalogue (what the order service's webhook handling leaves).
  await ctx.dataSource.query("UPDATE listing SET status = 'sold' WHERE id = ?", [ids.sold]);
  await ctx.dataSource.query("DELETE FROM catalogue_entry WHERE listing_id = ?", [ids.sold]);
}, 60_000);
afterAll(async () => {
  await ctx?.close();
});

describe("a slab page, rendered on the server", () => {
  it("has the slab in its HTML: title, price, species, size, weight, a preview photo and valid JSON-LD", async () => {
    const res = await request(ctx.app).get(`/slabs/${ids.walnut}`).set("accept-language", "en-GB");
    expect(res.status).toBe(200);
    expect(res.headers["content-type"]).toMatch(/^text\/html/);
    const html = res.text;
    expect(html).toContain("<title>Black walnut counter slab · Grainyard</title>");
    const text = appText(html);
    expect(text).toContain("Black walnut counter slab");
    expect(text).toContain("$845.50");
    expect(text).toContain("Black walnut Juglans nigra");
    expect(text).toContain("2,440 × 540 × 51 mm"); // en-GB: metric; the average of the three width stations
    expect(text).toContain("Harbour Hill Timber");
    // The sawyer's words are text, never markup.
    expect(html).toContain("&lt;b&gt;Not bold&lt;/b&gt; &amp; &quot;quoted&quot; &lt;/script&gt;");

    expect(html).toContain(`<link rel="canonical" href="https://grainyard.example/slabs/${ids.walnut}">`);
    expect(metaContent(html, "og:image")).toMatch(/^https:\/\/grainyard\.example\/api\/v1\/photos\/[\w-]+\/large\.webp$/);
    expect(metaContent(html, "og:type")).toBe("product");
    expect(metaContent(html, "description")).toContain("Black walnut live-edge slab, 2,440 × 540 × 51 mm");

    const [product, breadcrumbs] = jsonLd(html) as [Record<string, unknown>, Record<string, unknown>];
    expect(product["@context"]).toBe("https://schema.org");
    expect(product["@type"]).toBe("Product");
    expect(product.name).toBe("Black walnut counter slab");
    expect(product.image).toEqual([metaContent(html, "og:image")]);
    expect(product.offers).toMatchObject({
      "@type": "Offer",
      price: "845.50",
      priceCurrency: "USD",
      availability: "https://schema.org/InStock",
      seller: { "@type": "Organization", name: "Harbour Hill Timber" },
    });
    expect(breadcrumbs["@type"]).toBe("BreadcrumbList");
    expect((breadcrumbs.itemListElement as { name: string }[]).map((item) => item.name)).toEqual([
      "Grainyard",
      "Slabs",
      "Black walnut slabs",
      "Black walnut counter slab",
    ]);

    // The page photo that answers og:image is really there for anyone.
    const photo = await request(ctx.app).get(new URL(metaContent(html, "og:image")!).pathname);
    expect(photo.status).toBe(200);
    expect(photo.headers["content-type"]).toBe("image/webp");
  });

  it("renders in the units the person chose (the cookie), or their language's", async () => {
    const american = await request(ctx.app).get(`/slabs/${ids.walnut}`).set("accept-language", "en-US,en;q=0.9");
    expect(appText(american.text)).toContain("8′ 1/16″ × 21 1/4″ × 2″");
    const chosen = await request(ctx.app)
      .get(`/slabs/${ids.walnut}`)
      .set("accept-language", "en-US")
      .set("cookie", "grainyard_units=metric");
    expect(appText(chosen.text)).toContain("2,440 × 540 × 51 mm");
  });

  it("answers 404 with a helpful page for a slab that does not exist or was taken off sale", async () => {
    for (const id of ["00000000-0000-4000-8000-000000000000", ids.withdrawn!]) {
      const res = await request(ctx.app).get(`/slabs/${id}`);
      expect(res.status).toBe(404);
      expect(appText(res.text)).toContain("This slab isn't for sale here");
      expect(res.text).toContain('href="/browse"');
      expect(metaContent(res.text, "robots")).toBe("noindex");
    }
  });

  it("shows a sold slab as sold, with links to similar slabs that are for sale", async () => {
    const res = await request(ctx.app).get(`/slabs/${ids.sold}`);
    expect(res.status).toBe(200);
    expect(res.text).toContain('data-test="slab-sold"');
    const similar = /data-test="similar-slabs"[\s\S]*?<\/ul>/.exec(res.text)?.[0] ?? "";
    expect(similar).toContain(`href="/slabs/${ids.walnut}"`);
    expect(similar).toContain(`href="/slabs/${ids.walnutTwo}"`);
    expect(similar).not.toContain(`/slabs/${ids.sold}"`);
    expect(res.text).toContain('href="/browse?species=black-walnut"');
    expect((jsonLd(res.text)[0]!.offers as { availability: string }).availability).toBe("https://schema.org/SoldOut");
  });
});

describe("nothing personal in a rendered page", () => {
  it("renders a signed-in buyer's request exactly as anyone's: no e-mail, name, favourites or session", async () => {
    const buyer = await ctx.signedInClient("buyer", { displayName: "Juniper Oake", email: "juniper.oake@example.test" });
    expect((await buyer.agent.put(`/api/v1/favourites/${ids.walnut}`).set("x-csrf-token", buyer.csrfToken)).status).toBe(200);
    for (const path of [`/slabs/${ids.walnut}`, "/browse", "/"]) {
      const signedIn = await buyer.get(path);
      const anonymous = await request(ctx.app).get(path);
      expect(signedIn.status).toBe(200);
      for (const secret of ["juniper", "Juniper Oake", buyer.account.id, buyer.csrfToken]) {
        expect(signedIn.text.toLowerCase()).not.toContain(secret.toLowerCase());
      }
      expect(signedIn.text).not.toContain('aria-pressed="true"'); // no filled heart
      expect(signedIn.text).toContain("Sign in");
      // Same page for both (the state block holds the same data).
      expect(appText(signedIn.text)).toBe(appText(anonymous.text));
    }
  });

  it("does not show a signed-in sawyer their own account on their listing's page", async () => {
    const res = await sawyer.get(`/slabs/${ids.walnut}`);
    expect(res.status).toBe(200);
    expect(res.text).not.toContain("oskar.private@harbourhill.test");
    expect(res.text).not.toContain("Oskar Lindqvist");
    // The yard's id is public (its reviews are fetched by it); the sawyer's session is not in the page.
    expect(sawyer.csrfToken.length).toBeGreaterThan(10);
    expect(res.text).not.toContain(sawyer.csrfToken);
  });

  it("sends a private page as the bare shell, marked noindex, with no state", async () => {
    const res = await sawyer.get("/yard");
    expect(res.status).toBe(200);
    expect(res.text).toContain('<div id="app"></div>');
    expect(res.text).toContain("<title>My yard · Grainyard</title>");
    expect(metaContent(res.text, "robots")).toBe("noindex, nofollow");
    expect(res.text).not.toContain('id="grainyard-state"');
    expect(res.text).not.toContain("Harbour Hill Timber");
  });
});

describe("the catalogue and the home page, rendered on the server", () => {
  it("lists the live slabs of a search in the URL, with the page's own head", async () => {
    const res = await request(ctx.app).get("/browse?species=black-walnut");
    expect(res.status).toBe(200);
    const text = appText(res.text);
    expect(text).toContain("Black walnut counter slab");
    expect(text).toContain("Black walnut bench top");
    expect(text).not.toContain("Black walnut desk slab");
    expect(res.text).toContain('<link rel="canonical" href="https://grainyard.example/browse?species=black-walnut">');
    expect(res.text).toContain("<title>Black walnut slabs · Grainyard</title>");
  });

  it("renders the home page with the site's JSON-LD", async () => {
    const res = await request(ctx.app).get("/");
    expect(res.status).toBe(200);
    expect(jsonLd(res.text)[0]).toMatchObject({ "@type": "WebSite", url: "https://grainyard.example/" });
  });

  it("answers an unknown address with 404 and the app's not-found page", async () => {
    const res = await request(ctx.app).get("/no/such/page");
    expect(res.status).toBe(404);
    expect(appText(res.text)).toContain("Nothing grows at this address");
  });
});

describe("a yard's public page, rendered on the server", () => {
  it("has the yard, its live slabs and an Organization with its offers in the HTML, and nothing private", async () => {
    const slab = await request(ctx.app).get(`/api/v1/catalogue/${ids.walnut}`);
    const slug = (slab.body as { yard: { slug: string | null } }).yard.slug;
    expect(slug).toBeTruthy();
    // The slab page links to it.
    expect((await request(ctx.app).get(`/slabs/${ids.walnut}`)).text).toContain(`href="/yards/${slug}"`);

    const res = await request(ctx.app).get(`/yards/${slug}`);
    expect(res.status).toBe(200);
    expect(res.text).toContain("<title>Harbour Hill Timber in Lakemont · Grainyard</title>");
    expect(res.text).toContain(`<link rel="canonical" href="https://grainyard.example/yards/${slug}">`);
    const text = appText(res.text);
    expect(text).toContain("Harbour Hill Timber");
    expect(text).toContain("Black walnut counter slab");
    expect(text).toContain("Black walnut bench top");
    expect(text).not.toContain("Black walnut desk slab"); // sold
    expect(text).not.toContain("White oak shelf board"); // withdrawn
    expect(res.text).not.toContain("oskar.private@harbourhill.test");

    const [organization, breadcrumbs] = jsonLd(res.text) as [Record<string, unknown>, Record<string, unknown>];
    expect(organization).toMatchObject({
      "@context": "https://schema.org",
      "@type": "Organization",
      name: "Harbour Hill Timber",
      address: { "@type": "PostalAddress", addressLocality: "Lakemont" },
    });
    const offers = organization.makesOffer as { price: string; url: string }[];
    expect(offers.map((offer) => offer.price).sort()).toEqual(["390.00", "845.50"]);
    expect(offers.map((offer) => offer.url)).toContain(`https://grainyard.example/slabs/${ids.walnut}`);
    expect(breadcrumbs["@type"]).toBe("BreadcrumbList");
  });

  it("answers 404 with a helpful page for a yard that does not exist", async () => {
    const res = await request(ctx.app).get("/yards/no-such-yard");
    expect(res.status).toBe(404);
    expect(appText(res.text)).toContain("This yard isn't here");
    expect(res.text).toContain('<meta name="robots" content="noindex">');
  });
});
