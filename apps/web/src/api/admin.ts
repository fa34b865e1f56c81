/** The operator desk: audit log, reports, people, settings, dashboard, e-mail outbox. Derived from the endpoint table: one method per row. */
import { adminEndpoints } from "@grainyard/contracts";
import { clientFor } from "./http.ts";

export const adminApi = clientFor(adminEndpoints);
