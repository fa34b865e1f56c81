import { endpoint } from "../endpoint.ts";
import { yardPageSchema } from "../yard-pages.ts";
import { API_PREFIX } from "./prefix.ts";

/** Public yard pages. */
export const yardPageEndpoints = {
  getYardPage: endpoint({
    method: "GET",
    path: `${API_PREFIX}/yard-pages/:slug`,
    summary:
      "A yard's public page: name, story, town (never the street), member since, slabs sold, first-reply time, rating, live slabs, logs still drying.",
    access: "anyone",
    answer: yardPageSchema,
  }),
} as const;
