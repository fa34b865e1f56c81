import { describe, expect, it } from "vitest";
import { preloadLinks } from "./preload.ts";

describe("preload links of a render", () => {
  it("preloads each script and links each style once, and leaves fonts and images alone", () => {
    const manifest = {
      "src/views/BrowseView.vue": ["/assets/BrowseView-a1.js", "/assets/BrowseView-b2.css", "/assets/shared-c3.js"],
      "src/components/catalogue/CatalogueCard.vue": ["/assets/shared-c3.js", "/assets/plex-latin-400.woff2", "/assets/art.svg"],
    };
    const html = preloadLinks(
      new Set(["src/views/BrowseView.vue", "src/components/catalogue/CatalogueCard.vue", "src/unknown.ts"]),
      manifest,
    );
    expect(html).toBe(
      '<link rel="modulepreload" crossorigin href="/assets/BrowseView-a1.js">' +
        '<link rel="stylesheet" href="/assets/BrowseView-b2.css">' +
        '<link rel="modulepreload" crossorigin href="/assets/shared-c3.js">',
    );
  });
});
