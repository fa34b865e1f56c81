/**
 * What a server-rendered page hands to the browser: the query cache (so nothing is asked twice),
 * the Pinia state the page was rendered with (units), and the site's public address. It travels
 * in a `<script type="application/json">` data block: a data block never runs, so the strict
 * Content-Security-Policy (script-src 'self') needs no exception. devalue keeps Sets, Dates and
 * the API's errors (a slab that is not found hydrates as not found).
 */
import { parse, stringify } from "devalue";
import { ApiRequestError } from "../api/errors.ts";

export const STATE_ELEMENT_ID = "grainyard-state";

export interface SiteInfo {
  /** The public address of the site, without a trailing slash (canonical links, og:url). */
  origin: string;
}

export interface PageState {
  site: SiteInfo;
  pinia: Record<string, unknown>;
  colada: Record<string, unknown>;
}

type ErrorParts = [number, string, string, Record<string, string>, unknown];

const reducers = {
  ApiRequestError: (value: unknown): ErrorParts | false =>
    value instanceof ApiRequestError ? [value.status, value.code, value.message, value.fields, value.detail] : false,
};
const revivers = {
  ApiRequestError: ([status, code, message, fields, detail]: ErrorParts) => new ApiRequestError(status, code, message, fields, detail),
};

/** The data block's text: JSON (a string holding devalue's text), safe inside a script element. */
export function serialisePageState(state: PageState): string {
  return JSON.stringify(stringify(state, reducers))
    .replace(/</g, "\\u003c")
    .replace(/\u2028/g, "\\u2028")
    .replace(/\u2029/g, "\\u2029");
}

export function parsePageState(text: string): PageState {
  return parse(JSON.parse(text) as string, revivers) as PageState;
}

/** The whole element, for the page template. */
export function pageStateElement(state: PageState): string {
  return `<script type="application/json" id="${STATE_ELEMENT_ID}">${serialisePageState(state)}</script>`;
}
