/** The public catalogue: search, slab pages, towns, the fees in force. Derived from the endpoint table: one method per row. */
import { catalogueEndpoints } from "@grainyard/contracts";
import { clientFor } from "./http.ts";

export const catalogueApi = clientFor(catalogueEndpoints);
