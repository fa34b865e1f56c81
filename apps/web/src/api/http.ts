/**
 * The one way the web app talks to the API: it sends a call described by a row of the endpoint
 * table (packages/contracts) and checks the answer with the row's schema.
 * - Same-origin cookies, JSON bodies; a photo goes as raw bytes through XMLHttpRequest (fetch cannot
 *   report upload progress), a CSV file as text.
 * - Every POST/PATCH/PUT/DELETE carries the anti-forgery token (CSRF_HEADER) from the session store.
 * - Every failure becomes an ApiRequestError with status, code, message and per-field messages.
 */
import {
  apiErrorSchema,
  CSRF_HEADER,
  pathOf,
  type Answer,
  type BodyInput,
  type EndpointSpec,
  type FileAnswer,
  type PathParams,
  type QueryInput,
} from "@grainyard/contracts";
import { ApiRequestError, clientErrorCodes, OFFLINE_MESSAGE, UNAVAILABLE_MESSAGE, UNEXPECTED_MESSAGE } from "./errors.ts";

type HasKeys<T> = keyof T extends never ? false : true;
type QueryPart<S extends EndpointSpec> = [QueryInput<S>] extends [never] ? unknown : { query?: QueryInput<S> };
type BodyPart<S extends EndpointSpec> = [BodyInput<S>] extends [never] ? unknown : { body: BodyInput<S> };
/** A call's input: its path parameters by name, `query` and `body` where the row has them. */
type CallInput<S extends EndpointSpec> = PathParams<S> & QueryPart<S> & BodyPart<S>;
type NeedsInput<S extends EndpointSpec> = HasKeys<PathParams<S>> extends true ? true : [BodyInput<S>] extends [never] ? false : true;

interface CallOptions {
  signal?: AbortSignal;
  /** Upload progress, 0–1 (photo uploads). */
  onProgress?: (fraction: number) => void;
}

/** A derived client method: a call that answers the row's answer, or (for file rows) the address to open. */
export type ClientMethod<S extends EndpointSpec> = S["answer"] extends FileAnswer
  ? NeedsInput<S> extends true
    ? (input: CallInput<S>) => string
    : (input?: CallInput<S>) => string
  : NeedsInput<S> extends true
    ? (input: CallInput<S>, options?: CallOptions) => Promise<Answer<S>>
    : (input?: CallInput<S>, options?: CallOptions) => Promise<Answer<S>>;

const MUTATING_METHODS = new Set(["POST", "PATCH", "PUT", "DELETE"]);

async function readJson(response: Response): Promise<unknown> {
  const text = await response.text();
  if (!text) return undefined;
  try {
    return JSON.parse(text) as unknown;
  } catch {
    return undefined;
  }
}

function errorFrom(status: number, payload: unknown): ApiRequestError {
  const parsed = apiErrorSchema.safeParse(payload);
  if (parsed.success) {
    const { code, message, fields } = parsed.data.error;
    return new ApiRequestError(status, code, message, fields ?? {}, parsed.data.error);
  }
  if (status >= 500 || status === 0) return new ApiRequestError(status, clientErrorCodes.unavailable, UNAVAILABLE_MESSAGE);
  return new ApiRequestError(status, clientErrorCodes.unexpectedResponse, UNEXPECTED_MESSAGE);
}

/** The address of a call: the path with its parameters, and the query without empty values. */
export function urlOf(spec: EndpointSpec, input: Record<string, unknown> = {}): string {
  const params: Record<string, string> = {};
  for (const [key, value] of Object.entries(input)) if (typeof value === "string") params[key] = value;
  let url = pathOf(spec, params);
  const query = input.query as Record<string, unknown> | undefined;
  if (query) {
    const search = new URLSearchParams();
    for (const [key, value] of Object.entries(query)) {
      if (value === undefined || value === null || value === "") continue;
      search.set(key, String(value));
    }
    const text = search.toString();
    if (text) url += `?${text}`;
  }
  return url;
}

/**
 * A transport: how calls reach the API. The browser has one (`transport`); the server's render makes
 * one per request with its own `fetch` (loopback, no cookies), so a rendered page is always anonymous.
 */
export function createTransport(options: { fetch?: typeof fetch } = {}) {
  let fetchImpl: typeof fetch | undefined = options.fetch;
  let csrfToken: () => string | null | undefined = () => null;
  let xhrFactory: () => XMLHttpRequest = () => new XMLHttpRequest();

  function checked(spec: EndpointSpec, status: number, payload: unknown): unknown {
    if (spec.answer === null || "file" in spec.answer) return undefined;
    const parsed = (spec.answer as { safeParse(value: unknown): { success: boolean; data?: unknown } }).safeParse(payload);
    if (!parsed.success) throw new ApiRequestError(status, clientErrorCodes.unexpectedResponse, UNEXPECTED_MESSAGE);
    return parsed.data;
  }

  /** Sends raw bytes with XMLHttpRequest, reporting upload progress. */
  function upload(spec: EndpointSpec, url: string, file: Blob, options: CallOptions): Promise<unknown> {
    return new Promise((resolve, reject) => {
      const xhr = xhrFactory();
      xhr.open(spec.method, url);
      xhr.withCredentials = true;
      xhr.setRequestHeader("accept", "application/json");
      xhr.setRequestHeader("content-type", file.type || "application/octet-stream");
      const token = csrfToken();
      if (token) xhr.setRequestHeader(CSRF_HEADER, token);
      xhr.upload.onprogress = (event) => {
        if (event.lengthComputable && event.total > 0) options.onProgress?.(event.loaded / event.total);
      };
      xhr.onerror = () => reject(new ApiRequestError(0, clientErrorCodes.offline, OFFLINE_MESSAGE));
      xhr.ontimeout = xhr.onerror;
      xhr.onabort = () => reject(new DOMException("The upload was stopped.", "AbortError"));
      xhr.onload = () => {
        let payload: unknown;
        try {
          payload = xhr.responseText ? (JSON.parse(xhr.responseText) as unknown) : undefined;
        } catch {
          payload = undefined;
        }
        if (xhr.status < 200 || xhr.status >= 300) return reject(errorFrom(xhr.status, payload));
        try {
          const answer = checked(spec, xhr.status, payload);
          options.onProgress?.(1);
          resolve(answer);
        } catch (error) {
          reject(error);
        }
      };
      options.signal?.addEventListener("abort", () => xhr.abort(), { once: true });
      xhr.send(file);
    });
  }

  async function send(spec: EndpointSpec, input: Record<string, unknown> = {}, options: CallOptions = {}): Promise<unknown> {
    const url = urlOf(spec, input);
    if (spec.body === "photo_bytes") return upload(spec, url, input.body as Blob, options);

    const headers: Record<string, string> = { accept: "application/json" };
    let body: BodyInit | undefined;
    if (spec.body === "csv_text") {
      headers["content-type"] = "text/csv";
      body = input.body as string;
    } else if (spec.method !== "GET" && spec.method !== "DELETE") {
      headers["content-type"] = "application/json";
      body = JSON.stringify(input.body ?? {});
    }
    if (MUTATING_METHODS.has(spec.method)) {
      const token = csrfToken();
      if (token) headers[CSRF_HEADER] = token;
    }

    let response: Response;
    try {
      const doFetch = fetchImpl ?? globalThis.fetch.bind(globalThis);
      response = await doFetch(url, { method: spec.method, headers, body, credentials: "same-origin", signal: options.signal });
    } catch (error) {
      if (options.signal?.aborted) throw error;
      throw new ApiRequestError(0, clientErrorCodes.offline, OFFLINE_MESSAGE);
    }
    const payload = await readJson(response);
    if (!response.ok) throw errorFrom(response.status, payload);
    return checked(spec, response.status, payload);
  }

  return {
    send,
    /** Where the anti-forgery token comes from (the session store). */
    useCsrfToken(provider: () => string | null | undefined) {
      csrfToken = provider;
    },
    /** For tests: swap the fetch implementation. */
    useFetch(impl: typeof fetch | undefined) {
      fetchImpl = impl;
    },
    /** For tests: swap how upload requests are made. */
    useXhr(factory: (() => XMLHttpRequest) | undefined) {
      xhrFactory = factory ?? (() => new XMLHttpRequest());
    },
  };
}

export type Transport = ReturnType<typeof createTransport>;

/** The browser's one transport; entry-client.ts wires its anti-forgery token to the session store. */
export const transport = createTransport();

/**
 * A typed client for one domain table: a method per row, named as in the table. File rows (CSV
 * downloads, images) give the address to open instead of calling.
 */
export function clientFor<T extends Record<string, EndpointSpec>>(
  table: T,
  via: Transport = transport,
): { [K in keyof T]: ClientMethod<T[K]> } {
  const client: Record<string, unknown> = {};
  for (const [name, spec] of Object.entries(table)) {
    client[name] =
      spec.answer !== null && "file" in spec.answer
        ? (input?: Record<string, unknown>) => urlOf(spec, input)
        : (input?: Record<string, unknown>, options?: CallOptions) => via.send(spec, input, options);
  }
  return client as { [K in keyof T]: ClientMethod<T[K]> };
}
