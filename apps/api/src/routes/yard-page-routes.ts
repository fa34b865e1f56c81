import type { yardPageEndpoints } from "@grainyard/contracts";
import type { Handlers } from "../http/endpoints.ts";
import type { YardPageService } from "../services/yard-page-service.ts";

/** Public yard pages. */
export function yardPageHandlers(pages: YardPageService): Handlers<typeof yardPageEndpoints> {
  return {
    getYardPage: ({ params }) => pages.page(params.slug),
  };
}
