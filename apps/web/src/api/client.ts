/**
 * A small typed client for Grainyard's API, built on the shared contracts.
 * - Same-origin cookies, JSON bodies.
 * - Every POST/PATCH/PUT/DELETE carries the anti-forgery token (CSRF_HEADER) from the session store.
 * - Every failure becomes an ApiRequestError with status, code, message and per-field messages.
 */
import {
  CSRF_HEADER,
  accountListSchema,
  accountEnvelopeSchema,
  emailVerifiedSchema,
  apiErrorSchema,
  apiPaths,
  sessionSchema,
  type Account,
  type AccountList,
  type PasswordResetInput,
  type PasswordResetRequestInput,
  type Role,
  type SessionState,
  type SignInInput,
  type SignUpInput,
  type VerifyEmailInput,
  type YardProfileUpdateInput,
} from "@grainyard/contracts";

/** Codes the client itself produces when no API answer could be read. */
export const clientErrorCodes = {
  offline: "offline",
  unavailable: "unavailable",
  unexpectedResponse: "unexpected_response",
} as const;

export const OFFLINE_MESSAGE = "You seem to be offline. Check your connection and try again.";
export const UNAVAILABLE_MESSAGE = "Grainyard can't be reached right now. Please try again in a moment.";
const UNEXPECTED_MESSAGE = "The server sent an answer we did not understand. Please try again.";

export class ApiRequestError extends Error {
  readonly status: number;
  readonly code: string;
  readonly fields: Record<string, string>;

  constructor(status: number, code: string, message: string, fields: Record<string, string> = {}) {
    super(message);
    this.name = "ApiRequestError";
    this.status = status;
    this.code = code;
    this.fields = fields;
  }

  /** True when no answer came back at all (no network, or the server is down). */
  get isOffline(): boolean {
    return this.code === clientErrorCodes.offline;
  }

  get hasFieldMessages(): boolean {
    return Object.keys(this.fields).length > 0;
  }
}

/** Turns anything thrown into an ApiRequestError so views can always show a message. */
export function toApiRequestError(error: unknown): ApiRequestError {
  if (error instanceof ApiRequestError) return error;
  const message = error instanceof Error && error.message ? error.message : UNEXPECTED_MESSAGE;
  return new ApiRequestError(0, clientErrorCodes.unexpectedResponse, message);
}

const MUTATING_METHODS = new Set(["POST", "PATCH", "PUT", "DELETE"]);

type Method = "GET" | "POST" | "PATCH" | "PUT" | "DELETE";

/** Anything that can check an answer: the contracts' zod schemas, or a small hand-made parser. */
export interface ResponseParser<T> {
  safeParse(input: unknown): { success: true; data: T } | { success: false };
}

interface RequestOptions<T> {
  body?: unknown;
  query?: Record<string, string | undefined>;
  /** Schema the success body must match; omit for answers without a body (202, 204). */
  schema?: ResponseParser<T>;
  signal?: AbortSignal;
}

export interface ApiClientOptions {
  fetch?: typeof fetch;
  csrfToken?: () => string | null | undefined;
}

const accountEnvelope: ResponseParser<{ account: Account }> = accountEnvelopeSchema;
const verifiedSchema: ResponseParser<{ verified: true }> = emailVerifiedSchema;

async function readJson(response: Response): Promise<unknown> {
  const text = await response.text();
  if (!text) return undefined;
  try {
    return JSON.parse(text) as unknown;
  } catch {
    return undefined;
  }
}

export function createApiClient(options: ApiClientOptions = {}) {
  let fetchImpl = options.fetch;
  let csrfToken = options.csrfToken ?? (() => null);

  async function request<T>(method: Method, path: string, opts: RequestOptions<T> = {}): Promise<T> {
    const headers: Record<string, string> = { accept: "application/json" };
    if (opts.body !== undefined) headers["content-type"] = "application/json";
    if (MUTATING_METHODS.has(method)) {
      const token = csrfToken();
      if (token) headers[CSRF_HEADER] = token;
    }

    let url = path;
    if (opts.query) {
      const params = new URLSearchParams();
      for (const [key, value] of Object.entries(opts.query)) {
        if (value !== undefined && value !== "") params.set(key, value);
      }
      const search = params.toString();
      if (search) url += `?${search}`;
    }

    let response: Response;
    try {
      const doFetch = fetchImpl ?? globalThis.fetch.bind(globalThis);
      response = await doFetch(url, {
        method,
        headers,
        credentials: "same-origin",
        body: opts.body === undefined ? undefined : JSON.stringify(opts.body),
        signal: opts.signal,
      });
    } catch (error) {
      if (error instanceof DOMException && error.name === "AbortError") throw error;
      throw new ApiRequestError(0, clientErrorCodes.offline, OFFLINE_MESSAGE);
    }

    const payload = await readJson(response);

    if (!response.ok) {
      const parsed = apiErrorSchema.safeParse(payload);
      if (parsed.success) {
        const { code, message, fields } = parsed.data.error;
        throw new ApiRequestError(response.status, code, message, fields ?? {});
      }
      // No JSON error body: a proxy or gateway answered instead of the API.
      if (response.status >= 500) {
        throw new ApiRequestError(response.status, clientErrorCodes.unavailable, UNAVAILABLE_MESSAGE);
      }
      throw new ApiRequestError(response.status, clientErrorCodes.unexpectedResponse, UNEXPECTED_MESSAGE);
    }

    if (!opts.schema) return undefined as T;
    const parsed = opts.schema.safeParse(payload);
    if (!parsed.success) {
      throw new ApiRequestError(response.status, clientErrorCodes.unexpectedResponse, UNEXPECTED_MESSAGE);
    }
    return parsed.data;
  }

  return {
    request,

    /** Where the anti-forgery token comes from (the session store). */
    useCsrfToken(provider: () => string | null | undefined) {
      csrfToken = provider;
    },
    /** For tests: swap the fetch implementation. */
    useFetch(impl: typeof fetch | undefined) {
      fetchImpl = impl;
    },

    getSession: (): Promise<SessionState> => request("GET", apiPaths.session, { schema: sessionSchema }),
    signIn: (input: SignInInput): Promise<SessionState> =>
      request("POST", apiPaths.session, { body: input, schema: sessionSchema }),
    signOut: (): Promise<SessionState> => request("DELETE", apiPaths.session, { schema: sessionSchema }),

    signUp: (input: SignUpInput): Promise<{ account: Account }> =>
      request("POST", apiPaths.accounts, { body: input, schema: accountEnvelope }),
    verifyEmail: (input: VerifyEmailInput): Promise<{ verified: true }> =>
      request("POST", apiPaths.emailVerification, { body: input, schema: verifiedSchema }),
    resendVerification: (): Promise<void> => request("POST", apiPaths.emailVerificationResend, { body: {} }),

    requestPasswordReset: (input: PasswordResetRequestInput): Promise<void> =>
      request("POST", apiPaths.passwordResetRequests, { body: input }),
    resetPassword: (input: PasswordResetInput): Promise<void> =>
      request("POST", apiPaths.passwordResets, { body: input }),

    getYard: (): Promise<{ account: Account }> => request("GET", apiPaths.yard, { schema: accountEnvelope }),
    updateYard: (sawyerId: string, input: YardProfileUpdateInput): Promise<{ account: Account }> =>
      request("PATCH", apiPaths.yardById(sawyerId), { body: input, schema: accountEnvelope }),

    listAccounts: (filter: { query?: string; role?: Role }, signal?: AbortSignal): Promise<AccountList> =>
      request("GET", apiPaths.adminAccounts, {
        query: { query: filter.query?.trim(), role: filter.role },
        schema: accountListSchema,
        signal,
      }),
  };
}

export type ApiClient = ReturnType<typeof createApiClient>;

/** The app's one client; main.ts wires its CSRF token to the session store. */
export const api = createApiClient();
