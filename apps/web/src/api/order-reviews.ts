/** Reviews of completed orders, a yard's reviews, the desk's hiding. Derived from the endpoint table: one method per row. */
import { orderReviewEndpoints } from "@grainyard/contracts";
import { clientFor } from "./http.ts";

export const orderReviewsApi = clientFor(orderReviewEndpoints);
