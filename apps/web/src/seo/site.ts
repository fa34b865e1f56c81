import { inject, type InjectionKey } from "vue";
import type { SiteInfo } from "../ssr/state.ts";

export const SITE: InjectionKey<SiteInfo> = Symbol("grainyard-site");

/** The site's public address (the server's PUBLIC_URL), for canonical links and previews. */
export function useSite(): SiteInfo {
  return inject(SITE, { origin: typeof location === "undefined" ? "" : location.origin });
}

/** An absolute address on this site for a path ("/slabs/x" → "https://…/slabs/x"). */
export function absoluteUrl(site: SiteInfo, path: string): string {
  return /^https?:\/\//.test(path) ? path : `${site.origin}${path.startsWith("/") ? "" : "/"}${path}`;
}
