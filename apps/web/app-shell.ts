import type { Plugin } from "vite";

/**
 * `app-shell.html`: the built page template with nothing rendered into it, for the service worker
 * to answer a navigation with when there is no connection (the browser then draws the page). The
 * template itself (index.html) is never served as it is: the server fills it for every page.
 */
export function appShell(): Plugin {
  return {
    name: "grainyard-app-shell",
    apply: "build",
    enforce: "post",
    generateBundle: {
      order: "post",
      handler(_options, bundle) {
        const template = bundle["index.html"];
        if (!template || template.type !== "asset") return;
        const source = String(template.source);
        this.emitFile({
          type: "asset",
          fileName: "app-shell.html",
          source: source
            .replace("<!--app-head-->", '<title>Grainyard</title><meta name="robots" content="noindex">')
            .replace("<!--app-html-->", "")
            .replace("<!--app-state-->", ""),
        });
      },
    },
  };
}
