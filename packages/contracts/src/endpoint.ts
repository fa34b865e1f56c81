import type { z } from "zod";
import type { Role } from "./accounts.ts";
import type { ErrorCode } from "./errors.ts";

/**
 * One row of the endpoint table: everything web and API must agree on about one HTTP endpoint.
 * The API mounts its routes from these rows (one parse step, one respond step, the access check),
 * the web derives its typed clients from them, and the role matrix test needs a sample per row.
 */
export type HttpMethod = "GET" | "POST" | "PATCH" | "PUT" | "DELETE";

/** Who may call it: everyone (signed in or not), anyone signed in, or only these roles. */
export type Access = "anyone" | "signed_in" | readonly Role[];

/** Bodies that are not JSON: a photo's raw bytes, a CSV file's text, the payment provider's signed event. */
export type RawBody = "photo_bytes" | "csv_text" | "provider_event";

/** Answers that are not JSON: a CSV download, a WebP image, a small HTML page (opened by a link). */
export interface FileAnswer {
  file: "csv" | "webp" | "html";
}

export interface EndpointSpec {
  method: HttpMethod;
  /** The full path, with `:name` for each path parameter. */
  path: string;
  /** What it does, in a line. */
  summary: string;
  access: Access;
  query?: z.ZodType;
  body?: z.ZodType | RawBody;
  /** The answer's schema; null when the answer has no body (202/204). */
  answer: z.ZodType | FileAnswer | null;
  /** Success status; 200 when not given. */
  status?: 200 | 201 | 202 | 204;
  /** Error codes it may answer beyond those every endpoint may (see `everyEndpointErrors`). */
  errors?: readonly ErrorCode[];
  /** Answers the same for everyone: served before the session is read. */
  sessionFree?: true;
  /** A named rate limit the API puts in front of it. */
  limit?: "sign_in" | "password_reset" | "second_factor";
  /**
   * Open to an admin who has not switched on a second factor yet (the set-up itself). Every other
   * row that needs a signed-in account answers such an admin 403 `second_factor_setup_required`.
   */
  beforeSecondFactor?: true;
  /** Not called by a browser (the provider's signature is its proof): no anti-forgery token. */
  csrfFree?: true;
  /** Mounted only on the end-to-end stack (NODE_ENV=test with the test clock). */
  testOnly?: true;
}

/** Declares one endpoint; `const` keeps the literal path, method and schemas in the type. */
export function endpoint<const S extends EndpointSpec>(spec: S): S {
  return spec;
}

/** A domain's endpoints, keyed by the name web clients and API handlers use. */
export type EndpointTable = Record<string, EndpointSpec>;

// Path parameters from the path's text: "/a/:listingId/photos/:photoId" → "listingId" | "photoId".
type ParamName<Segment extends string> = Segment extends `${infer Name}.${string}` ? Name : Segment;
export type PathParamNames<P extends string> = P extends `${string}:${infer Name}/${infer Rest}`
  ? ParamName<Name> | PathParamNames<`/${Rest}`>
  : P extends `${string}:${infer Name}`
    ? ParamName<Name>
    : never;
export type PathParams<S extends EndpointSpec> = { [K in PathParamNames<S["path"]>]: string };

export type QueryInput<S extends EndpointSpec> = S["query"] extends z.ZodType ? z.input<S["query"]> : never;
export type QueryOutput<S extends EndpointSpec> = S["query"] extends z.ZodType ? z.output<S["query"]> : Record<string, never>;
export type BodyInput<S extends EndpointSpec> = S["body"] extends z.ZodType
  ? z.input<S["body"]>
  : S["body"] extends "photo_bytes"
    ? Blob
    : S["body"] extends "csv_text"
      ? string
      : never;
export type BodyOutput<S extends EndpointSpec> = S["body"] extends z.ZodType
  ? z.output<S["body"]>
  : S["body"] extends "photo_bytes" | "provider_event"
    ? Buffer
    : S["body"] extends "csv_text"
      ? string
      : undefined;
/** What a successful call gives the caller. */
export type Answer<S extends EndpointSpec> = S["answer"] extends z.ZodType ? z.output<S["answer"]> : void;
/** What the API may hand to the respond step (before JSON encoding). */
export type AnswerInput<S extends EndpointSpec> = S["answer"] extends z.ZodType ? z.input<S["answer"]> : void;

/** The path with its parameters filled in (each encoded). */
export function pathOf(spec: EndpointSpec, params: Record<string, string> = {}): string {
  return spec.path.replace(/:([A-Za-z_$][\w$]*)/g, (_match, name: string) => {
    const value = params[name];
    if (value === undefined) throw new Error(`pathOf: ${spec.method} ${spec.path} needs "${name}".`);
    return encodeURIComponent(value);
  });
}

/** The parameter names in a path, in order. */
export function pathParamNames(path: string): string[] {
  return [...path.matchAll(/:([A-Za-z_$][\w$]*)/g)].map((m) => m[1]!);
}

/** Whether `role` (undefined: anonymous) may call an endpoint with this access. */
export function mayCall(access: Access, role: Role | undefined): boolean {
  if (access === "anyone") return true;
  if (role === undefined) return false;
  return access === "signed_in" || access.includes(role);
}
