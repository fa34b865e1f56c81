/** A buyer's saved searches and favourites. Derived from the endpoint table: one method per row. */
import { buyerEndpoints } from "@grainyard/contracts";
import { clientFor } from "./http.ts";

export const buyerApi = clientFor(buyerEndpoints);
