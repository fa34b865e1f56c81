import { catalogueQuerySchema, type catalogueEndpoints } from "@grainyard/contracts";
import { parse } from "../http/context.ts";
import { ANSWERED, type Handlers } from "../http/endpoints.ts";
import { gzippedAnswer, type CatalogueService } from "../services/catalogue-service.ts";
import { searchPlaces } from "../services/places.ts";
import type { SettingsService } from "../services/settings-service.ts";

/** The public catalogue: the search, slab pages, towns to search around, and the fees in force. */
export function catalogueHandlers(
  catalogue: CatalogueService,
  settings: Pick<SettingsService, "fees">,
): Handlers<typeof catalogueEndpoints> {
  return {
    /**
     * The same answer for everyone (its row is session-free): a query string asked in the last few
     * seconds is answered from the service's cache before it is parsed again, compressed once for
     * every browser that takes gzip.
     */
    searchCatalogue: async ({ req, res }) => {
      const queryString = req.url.slice(req.url.indexOf("?") + 1 || req.url.length);
      const answer =
        catalogue.cachedAnswer(queryString) ?? (await catalogue.searchAnswer(parse(catalogueQuerySchema, req.query), queryString));
      res.setHeader("etag", answer.etag);
      res.setHeader("vary", "Accept-Encoding");
      if (req.fresh) {
        res.status(304).end();
        return ANSWERED;
      }
      res.type("application/json");
      if (req.headers["accept-encoding"] && req.acceptsEncodings("gzip") === "gzip") {
        res.setHeader("content-encoding", "gzip");
        res.send(gzippedAnswer(answer));
      } else res.send(answer.body);
      return ANSWERED;
    },
    getCatalogueListing: ({ actor, params }) => catalogue.detail(actor, params.listingId),
    speciesCounts: async () => ({ species: await catalogue.speciesCounts() }),
    findPlaces: ({ query }) => ({ places: searchPlaces(query.query) }),
    getMarketplaceFees: () => ({ fees: settings.fees() }),
  };
}
