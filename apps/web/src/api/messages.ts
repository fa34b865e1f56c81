/** Conversations about a listing between a buyer and its sawyer. Derived from the endpoint table: one method per row. */
import { messageEndpoints } from "@grainyard/contracts";
import { clientFor } from "./http.ts";

export const messagesApi = clientFor(messageEndpoints);
