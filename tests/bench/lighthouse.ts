/*
 * Lighthouse on the public pages of a demo stack (see `npm run bench`): the home page, the
 * catalogue, a slab page and a yard page, with Lighthouse's default mobile
 * preset (simulated slow 4G and a slower CPU) in Debian's Chromium. Prints each category's score
 * and the largest contentful paint, cumulative layout shift and total blocking time (the median
 * of LIGHTHOUSE_RUNS runs), the JavaScript a first visit to /browse loads and the size of a
 * rendered slab page's HTML. Figures only: no assertion.
 * Goals (issue 12): performance ≥ 95, accessibility, best practices and SEO 100; CLS ≤ 0.05;
 * LCP ≤ 2.0 s; /browse JavaScript ≤ 150 KB gzip.
 */
import { request as httpRequest } from "node:http";
import { gunzipSync } from "node:zlib";
import * as chromeLauncher from "chrome-launcher";
import lighthouse from "lighthouse";

const appUrl = process.env.APP_URL;
if (!appUrl) throw new Error("APP_URL is not set: run through `npm run bench`.");
const RUNS = Number(process.env.LIGHTHOUSE_RUNS ?? 3);
const CHROMIUM = process.env.CHROMIUM_PATH ?? "/usr/bin/chromium";

/** A GET through node:http (Node's fetch refuses a few ports), with the bytes as sent. */
function get(
  path: string,
  headers: Record<string, string> = {},
): Promise<{ status: number; body: Buffer; headers: Record<string, unknown> }> {
  return new Promise((resolve, reject) => {
    httpRequest(new URL(path, appUrl), { headers }, (response) => {
      const chunks: Buffer[] = [];
      response.on("data", (chunk: Buffer) => chunks.push(chunk));
      response.on("end", () => resolve({ status: response.statusCode ?? 0, body: Buffer.concat(chunks), headers: response.headers }));
      response.on("error", reject);
    })
      .on("error", reject)
      .end();
  });
}

const catalogue = JSON.parse((await get("/api/v1/catalogue?limit=50")).body.toString("utf8")) as {
  results: { listingId: string; title: string; photoUrl: string | null; yardSlug: string | null }[];
};
const slab = catalogue.results.find((card) => card.photoUrl) ?? catalogue.results[0];
if (!slab) throw new Error("The demo catalogue is empty.");
const pages: [string, string][] = [
  ["home", "/"],
  ["browse", "/browse"],
  ["slab page", `/slabs/${slab.listingId}`],
];
// The public yard page of the slab's sawyer (every live slab's card names its yard's address).
const yardSlug = slab.yardSlug ?? catalogue.results.find((card) => card.yardSlug)?.yardSlug;
if (!yardSlug) throw new Error("No live slab names its yard's public page.");
pages.push(["yard page", `/yards/${yardSlug}`]);

const median = (values: number[]) => {
  const sorted = [...values].sort((a, b) => a - b);
  const middle = Math.floor(sorted.length / 2);
  return sorted.length % 2 ? sorted[middle]! : (sorted[middle - 1]! + sorted[middle]!) / 2;
};

interface Run {
  scores: Record<string, number>;
  lcpMs: number;
  cls: number;
  tbtMs: number;
  /** The scripts the page loaded, as Lighthouse saw them. */
  scripts: string[];
}

/** One Lighthouse run; a run whose trace went wrong (it happens now and then) is run again, twice at most. */
async function audit(path: string, attempt = 1): Promise<NonNullable<Awaited<ReturnType<typeof lighthouse>>>["lhr"]> {
  const result = await lighthouse(new URL(path, appUrl).href, {
    port: chrome.port,
    output: "json",
    logLevel: "error",
    onlyCategories: ["performance", "accessibility", "best-practices", "seo"],
  });
  const error = result ? result.lhr.runtimeError : { message: "no result" };
  if (!error) return result!.lhr;
  if (attempt < 3) return audit(path, attempt + 1);
  throw new Error(`Lighthouse on ${path}: ${error.message}`);
}

const chrome = await chromeLauncher.launch({
  chromePath: CHROMIUM,
  chromeFlags: [
    "--headless=new",
    "--no-sandbox",
    "--disable-gpu",
    "--disable-background-networking",
    "--disable-component-update",
    "--disable-sync",
  ],
});
const results: { name: string; path: string; runs: Run[] }[] = [];
try {
  for (const [name, path] of pages) {
    const runs: Run[] = [];
    for (let run = 0; run < RUNS; run++) {
      const lhr = await audit(path);
      const requests = (lhr.audits["network-requests"]?.details as { items?: { resourceType?: string; url: string }[] } | undefined)?.items;
      runs.push({
        scores: Object.fromEntries(Object.entries(lhr.categories).map(([id, category]) => [id, Math.round((category.score ?? 0) * 100)])),
        lcpMs: lhr.audits["largest-contentful-paint"]?.numericValue ?? NaN,
        cls: lhr.audits["cumulative-layout-shift"]?.numericValue ?? NaN,
        tbtMs: lhr.audits["total-blocking-time"]?.numericValue ?? NaN,
        scripts: (requests ?? []).filter((item) => item.resourceType === "Script").map((item) => item.url),
      });
      const failing = Object.values(lhr.categories)
        .flatMap((category) => category.auditRefs.map((ref) => lhr.audits[ref.id]))
        .filter((audit) => audit && audit.score !== null && audit.score < 0.9 && audit.scoreDisplayMode !== "informative")
        .map((audit) => audit!.id);
      if (run === 0 && failing.length) console.log(`  ${name}: audits below 90: ${[...new Set(failing)].join(", ")}`);
    }
    results.push({ name, path, runs });
  }
} finally {
  await chrome.kill();
}

console.log(`\nLighthouse 12, mobile preset (simulated throttling), median of ${RUNS} run(s) per page, ${appUrl}`);
console.log("page          perf  a11y  best   seo      LCP      CLS      TBT");
for (const { name, runs } of results) {
  const score = (id: string) => String(median(runs.map((run) => run.scores[id] ?? 0))).padStart(4);
  console.log(
    `${name.padEnd(12)} ${score("performance")}  ${score("accessibility")}  ${score("best-practices")}  ${score("seo")}` +
      `  ${(median(runs.map((run) => run.lcpMs)) / 1000).toFixed(2).padStart(5)} s  ${median(runs.map((run) => run.cls))
        .toFixed(3)
        .padStart(7)}` +
      `  ${Math.round(median(runs.map((run) => run.tbtMs)))
        .toString()
        .padStart(5)} ms`,
  );
}
const browse = results.find((page) => page.path === "/browse");
if (browse) {
  // The same files fetched again, gzip, as the goal counts them (Lighthouse's own figure adds headers).
  let gzipBytes = 0;
  const scripts = [...new Set(browse.runs[0]!.scripts)].filter((url) => url.startsWith(appUrl));
  for (const url of scripts) {
    const answer = await get(new URL(url).pathname, { "accept-encoding": "gzip" });
    gzipBytes += answer.body.length;
  }
  console.log(
    `\nJavaScript a first visit to /browse loads: ${(gzipBytes / 1024).toFixed(1)} KB gzip in ${scripts.length} files (goal ≤ 150 KB)`,
  );
}

const slabPage = await get(`/slabs/${slab.listingId}`, { "accept-encoding": "gzip" });
const gzipped = slabPage.headers["content-encoding"] === "gzip";
const html = gzipped ? gunzipSync(slabPage.body) : slabPage.body;
console.log(
  `HTML of a rendered slab page (${slab.title}): ${(html.length / 1024).toFixed(1)} KB, ${gzipped ? `${(slabPage.body.length / 1024).toFixed(1)} KB gzip` : "sent uncompressed"}`,
);
