/** The sawyer's yard: logs, slabs, moisture readings, log photos, CSV in and out. Derived from the endpoint table: one method per row. */
import { yardEndpoints } from "@grainyard/contracts";
import { clientFor } from "./http.ts";

export const yardApi = clientFor(yardEndpoints);
