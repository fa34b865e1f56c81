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
  yardPaths,
  cataloguePaths,
  catalogueResultSchema,
  catalogueDetailSchema,
  placeListSchema,
  marketplaceFeesSchema,
  buyerPaths,
  savedSearchEnvelopeSchema,
  savedSearchListSchema,
  favouriteEnvelopeSchema,
  favouriteListSchema,
  threadListSchema,
  threadDetailSchema,
  messagePostedSchema,
  sessionSchema,
  logSchema,
  logListSchema,
  logDetailSchema,
  slabSchema,
  slabListSchema,
  slabDetailSchema,
  moistureReadingSchema,
  listingListSchema,
  listingEnvelopeSchema,
  listingPhotoSchema,
  csvImportResultSchema,
  csvRowErrorSchema,
  orderPaths,
  orderEnvelopeSchema,
  orderListSchema,
  checkoutResultSchema,
  checkoutQuoteSchema,
  type CheckoutInput,
  type CheckoutQuote,
  type Order,
  type PickupWindowsInput,
  type ShipmentInput,
  type CatalogueDetail,
  type Favourite,
  type FavouriteList,
  type MessagePosted,
  type SavedSearch,
  type SavedSearchInput,
  type SavedSearchUpdate,
  type ThreadDetail,
  type ThreadSummary,
  type CatalogueResult,
  type CsvRowError,
  type Place,
  type MarketplaceFees,
  type DryingProjectionView,
  type Listing,
  type ListingInput,
  type ListingPhoto,
  type ListingUpdate,
  type Log,
  type LogInput,
  type LogUpdate,
  type MoistureReading,
  type MoistureReadingInput,
  type Slab,
  type SlabInput,
  type SlabUpdate,
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

import {
  ApiRequestError,
  clientErrorCodes,
  OFFLINE_MESSAGE,
  toApiRequestError,
  UNAVAILABLE_MESSAGE,
  UNEXPECTED_MESSAGE,
} from "./errors.ts";

export { ApiRequestError, clientErrorCodes, OFFLINE_MESSAGE, toApiRequestError };

const MUTATING_METHODS = new Set(["POST", "PATCH", "PUT", "DELETE"]);

type Method = "GET" | "POST" | "PATCH" | "PUT" | "DELETE";

/** Anything that can check an answer: the contracts' zod schemas, or a small hand-made parser. */
export interface ResponseParser<T> {
  safeParse(input: unknown): { success: true; data: T } | { success: false };
}

interface RequestOptions<T> {
  body?: unknown;
  /** A body sent as it is (CSV text), with its own content type. */
  rawBody?: { contentType: string; data: string | Blob };
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

/** `{ <key>: <schema> }` without a zod import of our own: checks the one key with the contract's schema. */
export function envelope<K extends string, T>(key: K, schema: ResponseParser<T>): ResponseParser<Record<K, T>> {
  return {
    safeParse(input: unknown) {
      if (typeof input !== "object" || input === null || !(key in input)) return { success: false };
      const inner = schema.safeParse((input as Record<string, unknown>)[key]);
      if (!inner.success) return { success: false };
      return { success: true, data: { [key]: inner.data } as Record<K, T> };
    },
  };
}

const logEnvelope = envelope("log", logSchema as ResponseParser<Log>);
const slabEnvelope = envelope("slab", slabSchema as ResponseParser<Slab>);
const readingEnvelope = envelope("reading", moistureReadingSchema as ResponseParser<MoistureReading>);
const photoEnvelope = envelope("photo", listingPhotoSchema as ResponseParser<ListingPhoto>);
const countEnvelope: ResponseParser<{ count: number }> = {
  safeParse(input) {
    const count = (input as { count?: unknown } | null)?.count;
    return typeof count === "number" ? { success: true, data: { count } } : { success: false };
  },
};
const logList: ResponseParser<{ logs: Log[] }> = logListSchema;
const logDetail: ResponseParser<{ log: Log; slabs: Slab[]; photos: ListingPhoto[] }> = logDetailSchema;
const slabList: ResponseParser<{ slabs: Slab[] }> = slabListSchema;
const slabDetail: ResponseParser<{ slab: Slab; readings: MoistureReading[]; projection: DryingProjectionView }> = slabDetailSchema;
const listingList: ResponseParser<{ listings: Listing[] }> = listingListSchema;
const listingEnvelope: ResponseParser<{ listing: Listing }> = listingEnvelopeSchema;
const csvImportResult: ResponseParser<{ created: number }> = csvImportResultSchema;
const catalogueResult: ResponseParser<CatalogueResult> = catalogueResultSchema;
const catalogueDetail: ResponseParser<CatalogueDetail> = catalogueDetailSchema;
const placeList: ResponseParser<{ places: Place[] }> = placeListSchema;
const marketplaceFees: ResponseParser<{ fees: MarketplaceFees }> = marketplaceFeesSchema;
const csvRowError: ResponseParser<CsvRowError> = csvRowErrorSchema;
const orderEnvelope: ResponseParser<{ order: Order }> = orderEnvelopeSchema;
const orderList: ResponseParser<{ orders: Order[] }> = orderListSchema;
const checkoutResult: ResponseParser<{ order: Order; checkoutUrl: string }> = checkoutResultSchema;
const checkoutQuote: ResponseParser<{ quote: CheckoutQuote }> = checkoutQuoteSchema;
const savedSearchEnvelope: ResponseParser<{ savedSearch: SavedSearch }> = savedSearchEnvelopeSchema;
const savedSearchList: ResponseParser<{ savedSearches: SavedSearch[] }> = savedSearchListSchema;
const favouriteEnvelope: ResponseParser<{ favourite: Favourite }> = favouriteEnvelopeSchema;
const favouriteList: ResponseParser<FavouriteList> = favouriteListSchema;
const threadList: ResponseParser<{ threads: ThreadSummary[] }> = threadListSchema;
const threadDetail: ResponseParser<ThreadDetail> = threadDetailSchema;
const messagePosted: ResponseParser<MessagePosted> = messagePostedSchema;

/** The CSV import said no: every row message, and nothing was saved. */
export class CsvImportError extends ApiRequestError {
  readonly rows: CsvRowError[];
  constructor(source: ApiRequestError, rows: CsvRowError[]) {
    super(source.status, source.code, source.message, source.fields, source.detail);
    this.name = "CsvImportError";
    this.rows = rows;
  }
}

/** Reads `rows` from a csv_rows_invalid answer (rows that do not match the contract are left out). */
function csvRowsFrom(error: ApiRequestError): CsvRowError[] {
  const rows = (error.detail as { rows?: unknown } | undefined)?.rows;
  if (!Array.isArray(rows)) return [];
  return rows.flatMap((row) => {
    const parsed = csvRowError.safeParse(row);
    return parsed.success ? [parsed.data] : [];
  });
}

/** Progress of one upload, 0–1. */
type UploadProgress = (fraction: number) => void;

export interface PhotoUploadOptions {
  altText?: string;
  onProgress?: UploadProgress;
  signal?: AbortSignal;
}
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
  let xhrFactory: () => XMLHttpRequest = () => new XMLHttpRequest();

  /**
   * Sends the raw bytes of one photo with XMLHttpRequest (fetch cannot report upload progress).
   * Answers 201 `{ photo }`; an error answer becomes an ApiRequestError like every other call.
   */
  function uploadPhoto(listingId: string, file: Blob, opts: PhotoUploadOptions = {}): Promise<{ photo: ListingPhoto }> {
    return uploadPhotoTo(yardPaths.listingPhotos(listingId), file, opts);
  }

  function uploadPhotoTo(path: string, file: Blob, opts: PhotoUploadOptions = {}): Promise<{ photo: ListingPhoto }> {
    return new Promise((resolve, reject) => {
      const xhr = xhrFactory();
      const alt = opts.altText?.trim();
      const url = path + (alt ? `?${new URLSearchParams({ altText: alt }).toString()}` : "");
      xhr.open("POST", url);
      xhr.withCredentials = true;
      xhr.setRequestHeader("accept", "application/json");
      xhr.setRequestHeader("content-type", file.type || "application/octet-stream");
      const token = csrfToken();
      if (token) xhr.setRequestHeader(CSRF_HEADER, token);
      xhr.upload.onprogress = (event) => {
        if (event.lengthComputable && event.total > 0) opts.onProgress?.(event.loaded / event.total);
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
        if (xhr.status >= 200 && xhr.status < 300) {
          const parsed = photoEnvelope.safeParse(payload);
          if (parsed.success) {
            opts.onProgress?.(1);
            resolve(parsed.data);
          } else reject(new ApiRequestError(xhr.status, clientErrorCodes.unexpectedResponse, UNEXPECTED_MESSAGE));
          return;
        }
        const parsed = apiErrorSchema.safeParse(payload);
        if (parsed.success) {
          const { code, message, fields } = parsed.data.error;
          reject(new ApiRequestError(xhr.status, code, message, fields ?? {}, (payload as { error?: unknown }).error));
        } else if (xhr.status >= 500 || xhr.status === 0) {
          reject(new ApiRequestError(xhr.status, clientErrorCodes.unavailable, UNAVAILABLE_MESSAGE));
        } else {
          reject(new ApiRequestError(xhr.status, clientErrorCodes.unexpectedResponse, UNEXPECTED_MESSAGE));
        }
      };
      opts.signal?.addEventListener("abort", () => xhr.abort(), { once: true });
      xhr.send(file);
    });
  }

  async function request<T>(method: Method, path: string, opts: RequestOptions<T> = {}): Promise<T> {
    const headers: Record<string, string> = { accept: "application/json" };
    if (opts.body !== undefined) headers["content-type"] = "application/json";
    if (opts.rawBody) headers["content-type"] = opts.rawBody.contentType;
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
        body: opts.rawBody ? opts.rawBody.data : opts.body === undefined ? undefined : JSON.stringify(opts.body),
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
        const detail = (payload as { error?: unknown }).error;
        throw new ApiRequestError(response.status, code, message, fields ?? {}, detail);
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
    /** For tests: swap how upload requests are made. */
    useXhr(factory: (() => XMLHttpRequest) | undefined) {
      xhrFactory = factory ?? (() => new XMLHttpRequest());
    },

    getSession: (): Promise<SessionState> => request("GET", apiPaths.session, { schema: sessionSchema }),
    signIn: (input: SignInInput): Promise<SessionState> => request("POST", apiPaths.session, { body: input, schema: sessionSchema }),
    signOut: (): Promise<SessionState> => request("DELETE", apiPaths.session, { schema: sessionSchema }),

    signUp: (input: SignUpInput): Promise<{ account: Account }> =>
      request("POST", apiPaths.accounts, { body: input, schema: accountEnvelope }),
    verifyEmail: (input: VerifyEmailInput): Promise<{ verified: true }> =>
      request("POST", apiPaths.emailVerification, { body: input, schema: verifiedSchema }),
    resendVerification: (): Promise<void> => request("POST", apiPaths.emailVerificationResend, { body: {} }),

    requestPasswordReset: (input: PasswordResetRequestInput): Promise<void> =>
      request("POST", apiPaths.passwordResetRequests, { body: input }),
    resetPassword: (input: PasswordResetInput): Promise<void> => request("POST", apiPaths.passwordResets, { body: input }),

    getYard: (): Promise<{ account: Account }> => request("GET", apiPaths.yard, { schema: accountEnvelope }),
    updateYard: (sawyerId: string, input: YardProfileUpdateInput): Promise<{ account: Account }> =>
      request("PATCH", apiPaths.yardById(sawyerId), { body: input, schema: accountEnvelope }),

    listAccounts: (filter: { query?: string; role?: Role }, signal?: AbortSignal): Promise<AccountList> =>
      request("GET", apiPaths.adminAccounts, {
        query: { query: filter.query?.trim(), role: filter.role },
        schema: accountListSchema,
        signal,
      }),

    // The sawyer's yard: logs, slabs, moisture readings.
    listLogs: (signal?: AbortSignal) => request("GET", yardPaths.logs, { schema: logList, signal }),
    createLog: (input: LogInput) => request("POST", yardPaths.logs, { body: input, schema: logEnvelope }),
    getLog: (logId: string, signal?: AbortSignal) => request("GET", yardPaths.log(logId), { schema: logDetail, signal }),
    updateLog: (logId: string, input: LogUpdate) => request("PATCH", yardPaths.log(logId), { body: input, schema: logEnvelope }),
    deleteLog: (logId: string): Promise<void> => request("DELETE", yardPaths.log(logId)),
    recordLogReadings: (logId: string, input: MoistureReadingInput) =>
      request("POST", yardPaths.logReadings(logId), { body: input, schema: countEnvelope }),

    listSlabs: (signal?: AbortSignal) => request("GET", yardPaths.slabs, { schema: slabList, signal }),
    createSlab: (input: SlabInput) => request("POST", yardPaths.slabs, { body: input, schema: slabEnvelope }),
    getSlab: (slabId: string, signal?: AbortSignal) => request("GET", yardPaths.slab(slabId), { schema: slabDetail, signal }),
    updateSlab: (slabId: string, input: SlabUpdate) => request("PATCH", yardPaths.slab(slabId), { body: input, schema: slabEnvelope }),
    deleteSlab: (slabId: string): Promise<void> => request("DELETE", yardPaths.slab(slabId)),
    addReading: (slabId: string, input: MoistureReadingInput) =>
      request("POST", yardPaths.slabReadings(slabId), { body: input, schema: readingEnvelope }),
    deleteReading: (readingId: string): Promise<void> => request("DELETE", yardPaths.reading(readingId)),

    /** Sends a CSV file's text; a 422 with row messages becomes a CsvImportError (nothing was saved). */
    importSlabsCsv: async (text: string): Promise<{ created: number }> => {
      try {
        return await request("POST", yardPaths.slabsImport, {
          rawBody: { contentType: "text/csv", data: text },
          schema: csvImportResult,
        });
      } catch (error) {
        if (error instanceof ApiRequestError && error.code === "csv_rows_invalid") {
          throw new CsvImportError(error, csvRowsFrom(error));
        }
        throw error;
      }
    },

    // Listings.
    listListings: (signal?: AbortSignal) => request("GET", yardPaths.listings, { schema: listingList, signal }),
    createListing: (input: ListingInput) => request("POST", yardPaths.listings, { body: input, schema: listingEnvelope }),
    getListing: (listingId: string, signal?: AbortSignal) =>
      request("GET", yardPaths.listing(listingId), { schema: listingEnvelope, signal }),
    updateListing: (listingId: string, input: ListingUpdate) =>
      request("PATCH", yardPaths.listing(listingId), { body: input, schema: listingEnvelope }),
    submitListing: (listingId: string) => request("POST", yardPaths.listingSubmit(listingId), { body: {}, schema: listingEnvelope }),
    withdrawListing: (listingId: string) => request("POST", yardPaths.listingWithdraw(listingId), { body: {}, schema: listingEnvelope }),
    uploadListingPhoto: uploadPhoto,
    /** A photo of a log (the tree as felled, the cut ends): same upload, its own address. */
    uploadLogPhoto: (logId: string, file: Blob, opts: PhotoUploadOptions = {}) => uploadPhotoTo(yardPaths.logPhotos(logId), file, opts),
    deleteLogPhoto: (logId: string, photoId: string): Promise<void> => request("DELETE", yardPaths.logPhoto(logId, photoId)),
    /** The answer's body is not needed: the photo keeps the text the sawyer typed. */
    updatePhotoAltText: (listingId: string, photoId: string, altText: string): Promise<void> =>
      request("PATCH", yardPaths.listingPhoto(listingId, photoId), { body: { altText } }),
    setPhotoOrder: (listingId: string, photoIds: string[]): Promise<void> =>
      request("PUT", yardPaths.listingPhotoOrder(listingId), { body: { photoIds } }),
    deletePhoto: (listingId: string, photoId: string): Promise<void> => request("DELETE", yardPaths.listingPhoto(listingId, photoId)),

    // The public catalogue. The query is the URL's own text (mm, minor units), passed as it is.
    searchCatalogue: (query: Record<string, string | undefined>, signal?: AbortSignal): Promise<CatalogueResult> =>
      request("GET", cataloguePaths.search, { query, schema: catalogueResult, signal }),
    getCatalogueListing: (listingId: string, signal?: AbortSignal): Promise<CatalogueDetail> =>
      request("GET", cataloguePaths.detail(listingId), { schema: catalogueDetail, signal }),
    findPlaces: (query: string, signal?: AbortSignal): Promise<{ places: Place[] }> =>
      request("GET", cataloguePaths.places, { query: { query: query.trim() }, schema: placeList, signal }),
    getMarketplaceFees: (signal?: AbortSignal): Promise<{ fees: MarketplaceFees }> =>
      request("GET", cataloguePaths.fees, { schema: marketplaceFees, signal }),

    // Buying and the steps of an order.
    getCheckoutQuote: (listingId: string, signal?: AbortSignal) =>
      request("GET", orderPaths.quote(listingId), { schema: checkoutQuote, signal }),
    checkout: (listingId: string, input: CheckoutInput) =>
      request("POST", orderPaths.checkout(listingId), { body: input, schema: checkoutResult }),
    listOrders: (signal?: AbortSignal) => request("GET", orderPaths.orders, { schema: orderList, signal }),
    getOrder: (orderId: string, signal?: AbortSignal) => request("GET", orderPaths.order(orderId), { schema: orderEnvelope, signal }),
    proposePickupWindows: (orderId: string, input: PickupWindowsInput) =>
      request("POST", orderPaths.pickupWindows(orderId), { body: input, schema: orderEnvelope }),
    choosePickupWindow: (orderId: string, startsAt: string) =>
      request("POST", orderPaths.pickupChoice(orderId), { body: { startsAt }, schema: orderEnvelope }),
    markShipped: (orderId: string, input: ShipmentInput) =>
      request("POST", orderPaths.shipment(orderId), { body: input, schema: orderEnvelope }),
    markHandedOver: (orderId: string) => request("POST", orderPaths.handedOver(orderId), { body: {}, schema: orderEnvelope }),
    confirmReceipt: (orderId: string) => request("POST", orderPaths.completion(orderId), { body: {}, schema: orderEnvelope }),
    cancelOrder: (orderId: string, reason: string) =>
      request("POST", orderPaths.cancellation(orderId), { body: { reason }, schema: orderEnvelope }),
    // Buyer tools: saved searches (with e-mail alerts), favourites, messages about a listing.
    listSavedSearches: (signal?: AbortSignal) => request("GET", buyerPaths.savedSearches, { schema: savedSearchList, signal }),
    saveSearch: (input: SavedSearchInput) => request("POST", buyerPaths.savedSearches, { body: input, schema: savedSearchEnvelope }),
    updateSavedSearch: (savedSearchId: string, input: SavedSearchUpdate) =>
      request("PATCH", buyerPaths.savedSearch(savedSearchId), { body: input, schema: savedSearchEnvelope }),
    deleteSavedSearch: (savedSearchId: string): Promise<void> => request("DELETE", buyerPaths.savedSearch(savedSearchId)),
    listFavourites: (signal?: AbortSignal) => request("GET", buyerPaths.favourites, { schema: favouriteList, signal }),
    addFavourite: (listingId: string) => request("PUT", buyerPaths.favourite(listingId), { schema: favouriteEnvelope }),
    removeFavourite: (listingId: string): Promise<void> => request("DELETE", buyerPaths.favourite(listingId)),
    askAboutListing: (listingId: string, body: string) =>
      request("POST", buyerPaths.listingMessages(listingId), { body: { body }, schema: messagePosted }),
    listThreads: (signal?: AbortSignal) => request("GET", buyerPaths.threads, { schema: threadList, signal }),
    getThread: (threadId: string, signal?: AbortSignal) => request("GET", buyerPaths.thread(threadId), { schema: threadDetail, signal }),
    replyInThread: (threadId: string, body: string) =>
      request("POST", buyerPaths.threadMessages(threadId), { body: { body }, schema: messagePosted }),

    // Admin review.
    reviewQueue: (signal?: AbortSignal) => request("GET", yardPaths.reviewQueue, { schema: listingList, signal }),
    approveListing: (listingId: string) => request("POST", yardPaths.reviewApprove(listingId), { body: {}, schema: listingEnvelope }),
    sendBackListing: (listingId: string, reason: string) =>
      request("POST", yardPaths.reviewSendBack(listingId), { body: { reason }, schema: listingEnvelope }),
  };
}

export type ApiClient = ReturnType<typeof createApiClient>;

/** The app's one client; main.ts wires its CSRF token to the session store. */
export const api = createApiClient();
