/** Sign-in, sign-up, e-mail confirmation, password reset and the yard profile. Derived from the endpoint table: one method per row. */
import { accountEndpoints } from "@grainyard/contracts";
import { clientFor } from "./http.ts";

export const accountsApi = clientFor(accountEndpoints);
