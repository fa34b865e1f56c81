import { describe, expect, it } from "vitest";
import type { CatalogueDetail } from "@grainyard/contracts";
import { availabilityOf, browsePageHead, clip, slabPageHead } from "./head.ts";

const site = { origin: "https://grainyard.test" };

/** A walnut slab as the API describes it (only the fields the head reads are filled in). */
function walnut(status: string): CatalogueDetail {
  return {
    listing: {
      id: "lst_walnut",
      title: "Black walnut counter slab",
      description: "From a storm-felled street tree on Harbour Hill.",
      setKind: "single",
      priceMode: "fixed",
      rateMinor: 0,
      currency: "USD",
      pickup: true,
      freight: false,
      status,
      figures: {
        boardFeet: 21.84,
        volumeM3: 0.0515,
        weightKg: 36.27,
        weightLowKg: 33.1,
        weightHighKg: 39.9,
        heavyLift: true,
        priceMinor: 84550,
      },
      photos: [
        {
          id: "p2",
          position: 1,
          altText: "",
          width: 1600,
          height: 1000,
          smallUrl: "/api/v1/photos/p2/small.webp",
          mediumUrl: "/api/v1/photos/p2/medium.webp",
          largeUrl: "/api/v1/photos/p2/large.webp",
        },
        {
          id: "p1",
          position: 0,
          altText: "Top face",
          width: 1600,
          height: 1067,
          smallUrl: "/api/v1/photos/p1/small.webp",
          mediumUrl: "/api/v1/photos/p1/medium.webp",
          largeUrl: "/api/v1/photos/p1/large.webp",
        },
      ],
      publishedAt: "2026-03-01T10:00:00.000Z",
    },
    slabs: [
      {
        speciesSlug: "black-walnut",
        lengthMm: 2440,
        thicknessMm: 51,
        lastMoisturePct: 7.5,
        figures: { averageWidthMm: 536.33 },
      },
    ],
    log: null,
    logPhotos: [],
    otherSlabsFromLog: [],
    yard: { name: "Northshore Kiln Co-op", town: "Northshore", latitude: null, longitude: null },
  } as unknown as CatalogueDetail;
}

describe("a slab page's head", () => {
  it("describes the slab: title, canonical address, size in both units, price and the yard", () => {
    const head = slabPageHead(walnut("live"), site);
    expect(head.title).toBe("Black walnut counter slab");
    expect(head.canonical).toBe("https://grainyard.test/slabs/lst_walnut");
    expect(head.description).toContain("Black walnut live-edge slab, 2,440 × 536 × 51 mm (8′ 1/16″ × 21 1/8″ × 2″)");
    expect(head.description).toContain("$845.50 from Northshore Kiln Co-op, Northshore.");
  });

  it("previews with the first photo, large, at an absolute address", () => {
    const meta = Object.fromEntries(slabPageHead(walnut("live"), site).meta.map((tag) => [tag.property ?? tag.name, tag.content]));
    expect(meta["og:image"]).toBe("https://grainyard.test/api/v1/photos/p1/large.webp");
    expect(meta["og:image:height"]).toBe("1067");
    expect(meta["og:image:alt"]).toBe("Top face");
    expect(meta["twitter:card"]).toBe("summary_large_image");
    expect(meta["product:price:amount"]).toBe("845.50");
  });

  it("gives schema.org Product with an Offer (price, currency, availability, the yard as seller) and a BreadcrumbList", () => {
    const [product, trail] = slabPageHead(walnut("live"), site).jsonLd as [
      Record<string, unknown>,
      { "@type": string; itemListElement: { position: number; name: string; item: string }[] },
    ];
    expect(product["@type"]).toBe("Product");
    expect(product.material).toBe("Black walnut (Juglans nigra)");
    expect(product.image).toEqual([
      "https://grainyard.test/api/v1/photos/p1/large.webp",
      "https://grainyard.test/api/v1/photos/p2/large.webp",
    ]);
    expect(product.weight).toEqual({ "@type": "QuantitativeValue", value: 36.3, unitCode: "KGM", unitText: "kg" });
    expect(product.offers).toMatchObject({
      "@type": "Offer",
      price: "845.50",
      priceCurrency: "USD",
      availability: "https://schema.org/InStock",
      seller: { "@type": "Organization", name: "Northshore Kiln Co-op", address: { addressLocality: "Northshore" } },
      availableDeliveryMethod: ["https://schema.org/OnSitePickup"],
    });
    expect(trail["@type"]).toBe("BreadcrumbList");
    expect(trail.itemListElement.map((item) => [item.position, item.name])).toEqual([
      [1, "Grainyard"],
      [2, "Slabs"],
      [3, "Black walnut slabs"],
      [4, "Black walnut counter slab"],
    ]);
    expect(trail.itemListElement[2]?.item).toBe("https://grainyard.test/browse?species=black-walnut");
  });

  it("says a sold slab is sold, to people and to schema.org", () => {
    const head = slabPageHead(walnut("sold"), site);
    expect(head.description.startsWith("Sold. ")).toBe(true);
    expect((head.jsonLd[0] as { offers: { availability: string } }).offers.availability).toBe("https://schema.org/SoldOut");
  });
});

describe("head helpers", () => {
  it("maps every listing status a slab page can show to schema.org's ItemAvailability", () => {
    expect(availabilityOf("live")).toBe("https://schema.org/InStock");
    expect(availabilityOf("reserved")).toBe("https://schema.org/Reserved");
    expect(availabilityOf("sold")).toBe("https://schema.org/SoldOut");
  });

  it("cuts a long description at a word, within the limit", () => {
    const text = "word ".repeat(60);
    const cut = clip(text, 50);
    expect(cut.length).toBeLessThanOrEqual(50);
    expect(cut.endsWith("word…")).toBe(true);
    expect(clip("  short   text ")).toBe("short text");
  });

  it("indexes the catalogue and one-species pages only; other filter mixes are noindex", () => {
    const oneSpecies = browsePageHead(site, { species: ["white-oak"], otherFilters: false }, { total: 12, atLeast: false });
    expect(oneSpecies.title).toBe("White oak slabs");
    expect(oneSpecies.canonical).toBe("https://grainyard.test/browse?species=white-oak");
    expect(oneSpecies.meta.some((tag) => tag.name === "robots")).toBe(false);
    const mixed = browsePageHead(site, { species: ["white-oak"], otherFilters: true }, null);
    expect(mixed.meta.find((tag) => tag.name === "robots")?.content).toBe("noindex, follow");
  });
});
