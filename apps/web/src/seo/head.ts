/**
 * What search engines and link previews read about a public page: its description, the Open
 * Graph and card tags, and schema.org JSON-LD (https://schema.org/Product, /Offer,
 * /BreadcrumbList, /WebSite). Pure functions of the page's data, so the server and the browser
 * build exactly the same head. Every figure is the API's (or slab-math's through the formatter).
 */
import type { CatalogueDetail, YardPage } from "@grainyard/contracts";
import { unitFormatter } from "../composables/useUnits.ts";
import { formatMoney, minorToInput } from "@grainyard/slab-math";
import { botanicalName, speciesName } from "../utils/yard.ts";
import { absoluteUrl } from "./site.ts";
import type { SiteInfo } from "../ssr/state.ts";

export const SITE_NAME = "Grainyard";
export const SITE_DESCRIPTION =
  "Kiln-dried live-edge slabs from urban sawyers, milled from city trees lost to storms, pests and building work, measured by the people who milled them.";

/** Figures in structured data: to the tenth, as shown on the page (never more digits than were measured). */
const tenth = (value: number) => Math.round(value * 10) / 10;

const metric = unitFormatter("metric");
const imperial = unitFormatter("imperial");

interface MetaTag {
  name?: string;
  property?: string;
  content: string;
}

/** The head of one public page, ready for useHead. */
export interface PageHead {
  title: string;
  description: string;
  /** Absolute canonical address. */
  canonical: string;
  meta: MetaTag[];
  /** JSON-LD documents (each rendered as a `<script type="application/ld+json">`). */
  jsonLd: Record<string, unknown>[];
}

interface PreviewImage {
  url: string;
  /** Pixel size when known (a card's photo gives only its address). */
  width: number | null;
  height: number | null;
  alt: string;
}

/** Open Graph and card tags shared by every public page. */
function previewTags(
  kind: "website" | "product" | "profile",
  title: string,
  description: string,
  url: string,
  image: PreviewImage | null,
): MetaTag[] {
  const tags: MetaTag[] = [
    { property: "og:site_name", content: SITE_NAME },
    { property: "og:type", content: kind },
    { property: "og:title", content: title },
    { property: "og:description", content: description },
    { property: "og:url", content: url },
    { property: "og:locale", content: "en_US" },
    { name: "twitter:card", content: image ? "summary_large_image" : "summary" },
    { name: "twitter:title", content: title },
    { name: "twitter:description", content: description },
  ];
  if (image) {
    tags.push(
      { property: "og:image", content: image.url },
      { property: "og:image:type", content: "image/webp" },
      ...(image.width && image.height
        ? [
            { property: "og:image:width", content: String(image.width) },
            { property: "og:image:height", content: String(image.height) },
          ]
        : []),
      { property: "og:image:alt", content: image.alt },
      { name: "twitter:image", content: image.url },
      { name: "twitter:image:alt", content: image.alt },
    );
  }
  return tags;
}

/** One line of at most `max` characters, cut at a word. */
export function clip(text: string, max = 160): string {
  const flat = text.replace(/\s+/g, " ").trim();
  if (flat.length <= max) return flat;
  const cut = flat.slice(0, max - 1);
  return `${cut.slice(0, Math.max(cut.lastIndexOf(" "), max - 30)).replace(/[,;:.\s]+$/, "")}…`;
}

function breadcrumbs(site: SiteInfo, trail: { name: string; path: string }[]): Record<string, unknown> {
  return {
    "@context": "https://schema.org",
    "@type": "BreadcrumbList",
    itemListElement: trail.map((step, index) => ({
      "@type": "ListItem",
      position: index + 1,
      name: step.name,
      item: absoluteUrl(site, step.path),
    })),
  };
}

/** schema.org availability for a listing's status. */
export function availabilityOf(status: string): string {
  switch (status) {
    case "live":
      return "https://schema.org/InStock";
    case "reserved":
      return "https://schema.org/Reserved";
    case "sold":
      return "https://schema.org/SoldOut";
    default:
      return "https://schema.org/Discontinued";
  }
}

/** A slab page: title, a description with size, moisture, weight and price, previews and Product JSON-LD. */
export function slabPageHead(detail: CatalogueDetail, site: SiteInfo): PageHead {
  const { listing, slabs, yard } = detail;
  const first = slabs[0];
  const path = `/slabs/${encodeURIComponent(listing.id)}`;
  const canonical = absoluteUrl(site, path);
  const species = first ? speciesName(first.speciesSlug) : "Wood";
  const botanical = first ? botanicalName(first.speciesSlug) : "";
  const price = formatMoney(listing.figures.priceMinor, listing.currency);
  const isSet = slabs.length > 1;
  const sizeText = first
    ? `${metric.dimensions(first.lengthMm, first.figures.averageWidthMm, first.thicknessMm)} (${imperial.dimensions(
        first.lengthMm,
        first.figures.averageWidthMm,
        first.thicknessMm,
      )})`
    : "";
  const moisture = first?.lastMoisturePct != null ? `, ${first.lastMoisturePct} % moisture content` : "";
  const where = [yard.name, yard.town].filter(Boolean).join(", ");
  const statusNote = listing.status === "sold" ? "Sold. " : listing.status === "reserved" ? "Reserved. " : "";
  const description = clip(
    `${statusNote}${species} live-edge ${isSet ? `set of ${slabs.length} slabs` : "slab"}${sizeText ? `, ${sizeText}` : ""}${moisture}, ` +
      `${metric.weightRange(listing.figures.weightLowKg, listing.figures.weightHighKg)}. ${price}${where ? ` from ${where}` : ""}.`,
    200,
  );
  const photos = [...listing.photos].sort((a, b) => a.position - b.position);
  const cover = photos[0];
  const image: PreviewImage | null = cover
    ? {
        url: absoluteUrl(site, cover.largeUrl),
        width: cover.width,
        height: cover.height,
        alt: cover.altText.trim() || `Photo of ${listing.title}`,
      }
    : null;

  const meta: MetaTag[] = [
    { name: "description", content: description },
    ...previewTags("product", listing.title, description, canonical, image),
    { property: "product:price:amount", content: minorToInput(listing.figures.priceMinor) },
    { property: "product:price:currency", content: listing.currency },
    { property: "product:availability", content: listing.status === "live" ? "in stock" : "out of stock" },
  ];

  const properties: Record<string, unknown>[] = first
    ? [
        { "@type": "PropertyValue", name: "Length", value: first.lengthMm, unitCode: "MMT", unitText: "mm" },
        {
          "@type": "PropertyValue",
          name: "Average width",
          value: Math.round(first.figures.averageWidthMm),
          unitCode: "MMT",
          unitText: "mm",
        },
        { "@type": "PropertyValue", name: "Thickness", value: first.thicknessMm, unitCode: "MMT", unitText: "mm" },
        { "@type": "PropertyValue", name: "Volume", value: tenth(listing.figures.boardFeet), unitText: "board feet" },
        ...(first.lastMoisturePct != null
          ? [{ "@type": "PropertyValue", name: "Moisture content", value: first.lastMoisturePct, unitCode: "P1", unitText: "%" }]
          : []),
      ]
    : [];

  const product: Record<string, unknown> = {
    "@context": "https://schema.org",
    "@type": "Product",
    "@id": `${canonical}#product`,
    name: listing.title,
    description: clip(listing.description || description, 5000),
    url: canonical,
    sku: listing.id,
    category: "Live-edge wood slabs",
    material: botanical ? `${species} (${botanical})` : species,
    ...(photos.length ? { image: photos.map((photo) => absoluteUrl(site, photo.largeUrl)) } : {}),
    weight: { "@type": "QuantitativeValue", value: tenth(listing.figures.weightKg), unitCode: "KGM", unitText: "kg" },
    additionalProperty: properties,
    offers: {
      "@type": "Offer",
      url: canonical,
      price: minorToInput(listing.figures.priceMinor),
      priceCurrency: listing.currency,
      availability: availabilityOf(listing.status),
      itemCondition: "https://schema.org/NewCondition",
      seller: {
        "@type": "Organization",
        name: yard.name ?? "A Grainyard sawyer",
        ...(yard.town ? { address: { "@type": "PostalAddress", addressLocality: yard.town } } : {}),
      },
      availableDeliveryMethod: [
        ...(listing.pickup ? ["https://schema.org/OnSitePickup"] : []),
        ...(listing.freight ? ["http://purl.org/goodrelations/v1#DeliveryModeFreight"] : []),
      ],
    },
  };

  const trail = [
    { name: "Grainyard", path: "/" },
    { name: "Slabs", path: "/browse" },
    ...(first ? [{ name: `${species} slabs`, path: `/browse?species=${encodeURIComponent(first.speciesSlug)}` }] : []),
    { name: listing.title, path },
  ];

  return { title: listing.title, description, canonical, meta, jsonLd: [product, breadcrumbs(site, trail)] };
}

/** A yard's public page: who the sawyer is, their rating and what they have, as an Organization with its offers. */
export function yardPageHead(page: YardPage, site: SiteInfo): PageHead {
  const { yard, liveSlabs } = page;
  const path = `/yards/${encodeURIComponent(yard.slug)}`;
  const canonical = absoluteUrl(site, path);
  const where = yard.town ? ` in ${yard.town}` : "";
  const slabs = liveSlabs.length === 1 ? "1 slab" : `${liveSlabs.length} slabs`;
  const description = clip(`${yard.name}, an urban sawyer${where} on Grainyard: ${slabs} for sale. ${yard.story ?? ""}`.trim(), 200);
  const cover = liveSlabs.find((card) => card.photoUrl);
  const image: PreviewImage | null = cover?.photoMediumUrl
    ? { url: absoluteUrl(site, cover.photoMediumUrl), width: null, height: null, alt: cover.photoAlt ?? `A slab from ${yard.name}` }
    : null;
  const organization: Record<string, unknown> = {
    "@context": "https://schema.org",
    "@type": "Organization",
    "@id": `${canonical}#yard`,
    name: yard.name,
    url: canonical,
    ...(yard.story ? { description: clip(yard.story, 5000) } : {}),
    ...(yard.town ? { address: { "@type": "PostalAddress", addressLocality: yard.town } } : {}),
    ...(yard.rating.count > 0 && yard.rating.average !== null
      ? {
          aggregateRating: {
            "@type": "AggregateRating",
            ratingValue: Math.round(yard.rating.average * 10) / 10,
            bestRating: 5,
            worstRating: 1,
            ratingCount: yard.rating.count,
          },
        }
      : {}),
    makesOffer: liveSlabs.map((card) => ({
      "@type": "Offer",
      url: absoluteUrl(site, `/slabs/${encodeURIComponent(card.listingId)}`),
      price: minorToInput(card.priceMinor),
      priceCurrency: card.currency,
      availability: "https://schema.org/InStock",
      itemOffered: { "@type": "Product", name: card.title },
    })),
  };
  const trail = [
    { name: "Grainyard", path: "/" },
    { name: "Slabs", path: "/browse" },
    { name: yard.name, path },
  ];
  return {
    title: `${yard.name}${where}`,
    description,
    canonical,
    meta: [{ name: "description", content: description }, ...previewTags("profile", yard.name, description, canonical, image)],
    jsonLd: [organization, breadcrumbs(site, trail)],
  };
}

/** The catalogue: one species is a page of its own; other filter mixes are for people, not the index. */
export function browsePageHead(
  site: SiteInfo,
  filters: { species: string[]; otherFilters: boolean },
  count: { total: number; atLeast: boolean } | null,
): PageHead & { indexable: boolean } {
  const single = filters.species.length === 1 ? filters.species[0]! : null;
  const name = single ? `${speciesName(single)} slabs` : "Live-edge slabs from city trees";
  const path = single ? `/browse?species=${encodeURIComponent(single)}` : "/browse";
  const canonical = absoluteUrl(site, path);
  const counted = count && count.total > 0 ? `${count.total}${count.atLeast ? "+" : ""} kiln-dried ` : "Kiln-dried ";
  const description = clip(
    `${counted}${single ? `${speciesName(single).toLowerCase()} ` : ""}live-edge slabs from urban sawyers: true measurements in mm and inches, weight, moisture history and the tree's story. Pickup or freight.`,
  );
  const indexable = !filters.otherFilters && filters.species.length <= 1;
  const meta: MetaTag[] = [
    { name: "description", content: description },
    ...previewTags("website", name, description, canonical, null),
    ...(indexable ? [] : [{ name: "robots", content: "noindex, follow" }]),
  ];
  const trail = [{ name: "Grainyard", path: "/" }, { name: "Slabs", path: "/browse" }, ...(single ? [{ name, path }] : [])];
  return { title: name, description, canonical, meta, jsonLd: [breadcrumbs(site, trail)], indexable };
}

/** The home page: the site itself. */
export function homePageHead(site: SiteInfo): PageHead {
  const canonical = absoluteUrl(site, "/");
  const description = clip(SITE_DESCRIPTION);
  const title = "Live-edge slabs from city trees";
  return {
    title,
    description,
    canonical,
    meta: [
      { name: "description", content: description },
      ...previewTags("website", `${SITE_NAME}: ${title}`, description, canonical, null),
    ],
    jsonLd: [
      {
        "@context": "https://schema.org",
        "@type": "WebSite",
        name: SITE_NAME,
        url: canonical,
        description,
      },
    ],
  };
}
