import { gzipSync } from "node:zlib";
import type { Plugin } from "vite";

/** Goal of the catalogue issue: the JavaScript a first visit to /browse loads, gzip, at most 150 KB. */
const BUDGET_BYTES = 150 * 1024;

interface ChunkLike {
  type: "chunk" | "asset";
  fileName: string;
  code?: string;
  isEntry?: boolean;
  imports?: string[];
  facadeModuleId?: string | null;
}

/**
 * Files loaded for a route on a first visit: the entry, the route's own chunk, and everything
 * either imports statically (dynamic imports load later, on demand, so they do not count).
 */
export function routeFiles(bundle: Record<string, ChunkLike>, routeModule: RegExp): string[] {
  const chunks = Object.values(bundle).filter((item) => item.type === "chunk");
  const entry = chunks.find((chunk) => chunk.isEntry);
  const route = chunks.find((chunk) => chunk.facadeModuleId && routeModule.test(chunk.facadeModuleId));
  if (!entry || !route) return [];
  const seen = new Set<string>();
  const visit = (fileName: string) => {
    if (seen.has(fileName)) return;
    seen.add(fileName);
    for (const imported of bundle[fileName]?.imports ?? []) visit(imported);
  };
  visit(entry.fileName);
  visit(route.fileName);
  return [...seen].sort();
}

/** Prints, after `vite build`, the gzip size of the JavaScript loaded for the catalogue (/browse). */
export function catalogueRouteSize(): Plugin {
  return {
    name: "grainyard-catalogue-route-size",
    apply: "build",
    generateBundle(_options, bundle) {
      const files = routeFiles(bundle as unknown as Record<string, ChunkLike>, /views\/BrowseView\.vue$/);
      const bytes = files.reduce((sum, file) => sum + gzipSync((bundle[file] as ChunkLike).code ?? "").length, 0);
      const verdict = bytes <= BUDGET_BYTES ? "within" : "OVER";
      console.log(
        `\n[grainyard] JavaScript loaded for /browse: ${(bytes / 1024).toFixed(1)} KB gzip in ${files.length} files (goal ≤ 150 KB: ${verdict})`,
      );
    },
  };
}
