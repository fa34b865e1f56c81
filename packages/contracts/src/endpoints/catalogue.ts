import { z } from "zod";
import { marketplaceFeesSchema } from "../admin.ts";
import { catalogueDetailSchema, catalogueQuerySchema, catalogueResultSchema, placeListSchema, speciesCountsSchema } from "../catalogue.ts";
import { endpoint } from "../endpoint.ts";
import { API_PREFIX } from "./prefix.ts";

export const placeQuerySchema = z.object({ query: z.string().trim().min(1, "Type the start of a town name.").max(80) });

/** The public catalogue: search, a slab's page, towns to search around, the fees in force. */
export const catalogueEndpoints = {
  searchCatalogue: endpoint({
    method: "GET",
    path: `${API_PREFIX}/catalogue`,
    summary: "Live listings by filters, sorted, paged with an opaque cursor (the same answer for everyone, cached briefly).",
    access: "anyone",
    query: catalogueQuerySchema,
    answer: catalogueResultSchema,
    sessionFree: true,
    errors: ["bad_cursor", "unknown_place"],
  }),
  getCatalogueListing: endpoint({
    method: "GET",
    path: `${API_PREFIX}/catalogue/:listingId`,
    summary: "Everything a buyer needs about one listing (live, sold, or the viewer's own).",
    access: "anyone",
    answer: catalogueDetailSchema,
  }),
  speciesCounts: endpoint({
    method: "GET",
    path: `${API_PREFIX}/species-counts`,
    summary: "How many live slabs each species has (one grouped query, kept with the catalogue's answers).",
    access: "anyone",
    answer: speciesCountsSchema,
    sessionFree: true,
  }),
  findPlaces: endpoint({
    method: "GET",
    path: `${API_PREFIX}/places`,
    summary: "Towns whose names start with the text typed.",
    access: "anyone",
    query: placeQuerySchema,
    answer: placeListSchema,
  }),
  getMarketplaceFees: endpoint({
    method: "GET",
    path: `${API_PREFIX}/marketplace/fees`,
    summary: "The platform and processing fees in force.",
    access: "anyone",
    answer: marketplaceFeesSchema,
  }),
} as const;
