/** The admin's review of submitted listings. Derived from the endpoint table: one method per row. */
import { reviewEndpoints } from "@grainyard/contracts";
import { clientFor } from "./http.ts";

export const reviewApi = clientFor(reviewEndpoints);
