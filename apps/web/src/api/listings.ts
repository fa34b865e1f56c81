/** A sawyer's listings and their photos. Derived from the endpoint table: one method per row. */
import { listingEndpoints } from "@grainyard/contracts";
import { clientFor } from "./http.ts";

export const listingsApi = clientFor(listingEndpoints);
