import type { DataSource } from "typeorm";
import { createReplicaReads, type ReplicaReads } from "../db/read-replica.ts";

/**
 * What search engines are told: robots.txt (the public pages are open, everything personal is
 * closed) and the sitemaps (https://www.sitemaps.org/protocol.html): the home page, the
 * catalogue, one catalogue page per species on sale and every live slab, each slab with the time
 * its listing last changed. Past 50 000 addresses the sitemap becomes an index of files of at
 * most 50 000 each. Slabs are read in batches in the order of their id (keyset paging on the
 * catalogue's primary key), so a national catalogue is never held in memory at once.
 */

/** The protocol's limit of addresses in one sitemap file. */
const SITEMAP_URL_LIMIT = 50_000;

/**
 * Pages that belong to somebody (the web app draws them in the browser and marks them noindex).
 * `/yard` is the sawyer's own yard; the public yard pages will live under `/yards/`.
 */
const PRIVATE_PATHS = [
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
  "/sign-up",
  "/join",
  "/verify-email",
  "/forgot-password",
  "/reset-password",
];

export interface SitemapEntry {
  /** Path on the site ("/slabs/…"). */
  path: string;
  /** When the page last changed (W3C datetime), if known. */
  lastmod?: string;
}

/** One sitemap answer: a plain list of addresses, or an index of the files that hold them. */
export type SitemapPlan = { kind: "urlset" } | { kind: "index"; slabFiles: number };

interface SeoOptions {
  dataSource: DataSource;
  /** The sitemaps read from the replica when one is configured (db/read-replica.ts). */
  reads?: ReplicaReads;
  /** The site's public address, without a trailing slash. */
  publicUrl: string;
  /** Addresses per file (the protocol's 50 000; smaller in tests). */
  urlsPerFile?: number;
  /** Slabs read per query. */
  batchSize?: number;
}

const xmlEscape = (text: string) =>
  text.replace(/[&<>"']/g, (c) => ({ "&": "&amp;", "<": "&lt;", ">": "&gt;", '"': "&quot;", "'": "&apos;" })[c]!);

/** A W3C datetime to the second ("2026-03-14T09:30:00Z"). */
const w3cDate = (date: Date) => date.toISOString().replace(/\.\d{3}Z$/, "Z");

export function createSeoService(options: SeoOptions) {
  const { publicUrl } = options;
  const reads = options.reads ?? createReplicaReads(options.dataSource);
  const dataSource = { query: (sql: string, parameters?: unknown[]) => reads.query(sql, parameters) };
  const perFile = options.urlsPerFile ?? SITEMAP_URL_LIMIT;
  const batchSize = Math.min(options.batchSize ?? 5_000, perFile);
  const absolute = (path: string) => `${publicUrl}${path}`;

  /** The home page, the catalogue and one catalogue page for each species on sale. */
  async function pageEntries(): Promise<SitemapEntry[]> {
    // Read from the species-first index: one short entry per species, never the rows.
    const species = (await dataSource.query("SELECT DISTINCT species_slug FROM catalogue_entry ORDER BY species_slug")) as {
      species_slug: string;
    }[];
    return [
      { path: "/" },
      { path: "/browse" },
      ...species.map((row) => ({ path: `/browse?species=${encodeURIComponent(row.species_slug)}` })),
    ];
  }

  async function liveSlabCount(): Promise<number> {
    const [row] = (await dataSource.query("SELECT COUNT(*) AS count FROM catalogue_entry")) as { count: number | string }[];
    return Number(row?.count ?? 0);
  }

  /** The id just before the `skip`-th live slab in id order (null: start from the first). */
  async function idBefore(skip: number): Promise<string | null> {
    if (skip <= 0) return null;
    const rows = (await dataSource.query("SELECT listing_id FROM catalogue_entry ORDER BY listing_id LIMIT 1 OFFSET ?", [skip - 1])) as {
      listing_id: string;
    }[];
    return rows[0]?.listing_id ?? null;
  }

  /** Live slabs after an id, in id order, in batches, up to `limit` addresses. */
  async function* slabEntries(after: string | null, limit: number): AsyncGenerator<SitemapEntry[]> {
    let cursor = after;
    let left = limit;
    while (left > 0) {
      const size = Math.min(batchSize, left);
      const rows = (await dataSource.query(
        `SELECT c.listing_id, l.updated_at
           FROM catalogue_entry c JOIN listing l ON l.id = c.listing_id
          ${cursor === null ? "" : "WHERE c.listing_id > ?"}
          ORDER BY c.listing_id
          LIMIT ?`,
        cursor === null ? [size] : [cursor, size],
      )) as { listing_id: string; updated_at: Date }[];
      if (rows.length === 0) return;
      yield rows.map((row) => ({ path: `/slabs/${encodeURIComponent(row.listing_id)}`, lastmod: w3cDate(new Date(row.updated_at)) }));
      cursor = rows[rows.length - 1]!.listing_id;
      left -= rows.length;
      if (rows.length < size) return;
    }
  }

  function urlElement(entry: SitemapEntry): string {
    return `<url><loc>${xmlEscape(absolute(entry.path))}</loc>${entry.lastmod ? `<lastmod>${entry.lastmod}</lastmod>` : ""}</url>\n`;
  }

  const URLSET_OPEN = '<?xml version="1.0" encoding="UTF-8"?>\n<urlset xmlns="http://www.sitemaps.org/schemas/sitemap/0.9">\n';
  const URLSET_CLOSE = "</urlset>\n";

  return {
    robotsTxt(): string {
      return [
        "# Grainyard: the catalogue and the slab pages are for everyone; accounts, yards at work and the desk are not.",
        "User-agent: *",
        "Allow: /",
        "Allow: /api/v1/photos/",
        ...PRIVATE_PATHS.map((path) => `Disallow: ${path}`),
        "",
        `Sitemap: ${absolute("/sitemap.xml")}`,
        "",
      ].join("\n");
    },

    /** Whether /sitemap.xml lists the addresses itself or is an index of files. */
    async plan(): Promise<SitemapPlan> {
      const [pages, slabs] = await Promise.all([pageEntries(), liveSlabCount()]);
      if (pages.length + slabs <= perFile) return { kind: "urlset" };
      return { kind: "index", slabFiles: Math.max(1, Math.ceil(slabs / perFile)) };
    },

    /** The sitemap index (once there are more addresses than one file takes). */
    indexXml(slabFiles: number): string {
      const files = ["/sitemaps/pages.xml", ...Array.from({ length: slabFiles }, (_, i) => `/sitemaps/slabs-${i + 1}.xml`)];
      return (
        '<?xml version="1.0" encoding="UTF-8"?>\n<sitemapindex xmlns="http://www.sitemaps.org/schemas/sitemap/0.9">\n' +
        files.map((file) => `<sitemap><loc>${xmlEscape(absolute(file))}</loc></sitemap>\n`).join("") +
        "</sitemapindex>\n"
      );
    },

    /** Every address in one urlset (small catalogues), written a batch at a time. */
    async *allXml(): AsyncGenerator<string> {
      yield URLSET_OPEN + (await pageEntries()).map(urlElement).join("");
      for await (const batch of slabEntries(null, perFile)) yield batch.map(urlElement).join("");
      yield URLSET_CLOSE;
    },

    /** The file of the index with the pages that are not slabs. */
    async pagesXml(): Promise<string> {
      return URLSET_OPEN + (await pageEntries()).map(urlElement).join("") + URLSET_CLOSE;
    },

    /** Slab file `n` (1-based) of the index, or null when there is no such file. */
    async slabsXml(file: number): Promise<AsyncGenerator<string> | null> {
      if (!Number.isInteger(file) || file < 1) return null;
      const total = await liveSlabCount();
      if ((file - 1) * perFile >= Math.max(total, 1)) return null;
      const after = await idBefore((file - 1) * perFile);
      return (async function* () {
        yield URLSET_OPEN;
        for await (const batch of slabEntries(after, perFile)) yield batch.map(urlElement).join("");
        yield URLSET_CLOSE;
      })();
    },
  };
}

export type SeoService = ReturnType<typeof createSeoService>;
