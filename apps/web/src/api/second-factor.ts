/** The sign-in's code step and the second factor's set-up and removal. Derived from the endpoint table: one method per row. */
import { secondFactorEndpoints } from "@grainyard/contracts";
import { clientFor } from "./http.ts";

export const secondFactorApi = clientFor(secondFactorEndpoints);
