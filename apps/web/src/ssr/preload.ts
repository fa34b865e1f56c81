/** Source module → the built files it needs (Vite's `.vite/ssr-manifest.json`). */
export type SsrManifest = Record<string, string[]>;

/**
 * Links for the files of the modules a render used: the route's scripts start loading with the
 * page (no waterfall before hydration) and its styles apply before the first paint. Fonts are not
 * preloaded here: their metric-matched fallbacks keep the text from moving when they arrive.
 */
export function preloadLinks(modules: Set<string> | undefined, manifest: SsrManifest): string {
  const seen = new Set<string>();
  let links = "";
  for (const id of modules ?? []) {
    for (const file of manifest[id] ?? []) {
      if (seen.has(file)) continue;
      seen.add(file);
      if (file.endsWith(".js")) links += `<link rel="modulepreload" crossorigin href="${file}">`;
      else if (file.endsWith(".css")) links += `<link rel="stylesheet" href="${file}">`;
    }
  }
  return links;
}
