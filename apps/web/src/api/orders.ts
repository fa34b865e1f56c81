/** Buying and the steps of an order. Derived from the endpoint table: one method per row. */
import { orderEndpoints } from "@grainyard/contracts";
import { clientFor } from "./http.ts";

export const ordersApi = clientFor(orderEndpoints);
