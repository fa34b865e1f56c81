/** Reporting a listing or a message to the admins. Derived from the endpoint table: one method per row. */
import { reportEndpoints } from "@grainyard/contracts";
import { clientFor } from "./http.ts";

export const reportsApi = clientFor(reportEndpoints);
