/** Paying sawyers: the sawyer's payout account and statement, the admin's payouts desk and dispute refunds. Derived from the endpoint table: one method per row. */
import { payoutEndpoints } from "@grainyard/contracts";
import { clientFor } from "./http.ts";

export const payoutsApi = clientFor(payoutEndpoints);
