import type { NextFunction, Request, RequestHandler, Response, Router } from "express";
import {
  everyEndpointErrors,
  mayCall,
  type AnswerInput,
  type BodyOutput,
  type EndpointSpec,
  type EndpointTable,
  type FileAnswer,
  type PathParams,
  type QueryOutput,
  type RawBody,
} from "@grainyard/contracts";
import type { z } from "zod";
import { AppError, Forbidden, Unauthorized } from "../errors.ts";
import { secondFactorSetUpFirst, type Actor } from "../services/actor.ts";
import { requireCsrfToken } from "./csrf.ts";
import { parse } from "./context.ts";

/**
 * Mounts routes from the endpoint table in packages/contracts: for each row, one parse step
 * (path parameters, query and body through the row's schemas), the access check of the row (the
 * services check again, against the acting user), the handler, and one respond step (the row's
 * status and answer kind). A route cannot exist without its row, and a row cannot go unhandled:
 * `Handlers<T>` needs a handler for every endpoint of a domain.
 */

/** What a handler gets: the acting user and the parsed input (the raw request only for sessions and headers). */
interface EndpointCall<S extends EndpointSpec> {
  actor: Actor;
  params: PathParams<S>;
  query: QueryOutput<S>;
  body: BodyOutput<S>;
  req: Request;
  res: Response;
}

/** A file answer: a download, an image or a page. */
export interface FileReply {
  body: Buffer | string;
  contentType: string;
  /** Offer it as a download under this name. */
  filename?: string;
  cacheControl?: string;
  status?: number;
}

/** A JSON answer with a status other than the row's (the health check's 503). */
export interface StatusReply<T> {
  status: number;
  answer: T;
}
export const withStatus = <T>(status: number, answer: T): StatusReply<T> => ({ status, answer });
const isStatusReply = (value: unknown): value is StatusReply<unknown> =>
  typeof value === "object" && value !== null && Object.keys(value).length === 2 && "status" in value && "answer" in value;

/** The handler wrote the answer itself (the catalogue search's cached, pre-compressed bytes). */
class Answered {
  private readonly answered = true;
}
export const ANSWERED = new Answered();

type Reply<S extends EndpointSpec> = S["answer"] extends FileAnswer
  ? FileReply
  : S["answer"] extends null
    ? void
    : AnswerInput<S> | StatusReply<AnswerInput<S>>;

type Handler<S extends EndpointSpec> = (call: EndpointCall<S>) => Promise<Reply<S> | Answered> | Reply<S> | Answered;
export type Handlers<T extends EndpointTable> = { [K in keyof T]: Handler<T[K]> };

export interface MountOptions {
  /** Body readers: JSON for schema bodies, and one per raw kind. */
  bodyReaders: Record<"json" | RawBody, RequestHandler>;
  /** Rate limits by the name rows give them. */
  limits?: Partial<Record<NonNullable<EndpointSpec["limit"]>, RequestHandler[]>>;
  /**
   * Check every JSON answer against the row's schema and every error code against the row's list
   * (tests): a drift between the API and the contract becomes a 500 that names it.
   */
  strict?: boolean;
}

const literalFirst = (a: EndpointSpec, b: EndpointSpec) => {
  // A total order (segment by segment: literal before parameter, literals alphabetically), so the sort
  // is the same whatever rows the table holds; an order that compared unrelated paths was not one.
  const sa = a.path.split("/");
  const sb = b.path.split("/");
  for (let i = 0; i < Math.min(sa.length, sb.length); i++) {
    const pa = sa[i]!.startsWith(":");
    const pb = sb[i]!.startsWith(":");
    if (pa !== pb) return pa ? 1 : -1;
    if (!pa && sa[i] !== sb[i]) return sa[i]! < sb[i]! ? -1 : 1;
  }
  return sa.length - sb.length;
};

function accessCheck(spec: EndpointSpec): RequestHandler {
  return (req, _res, next) => {
    const actor = req.actor ?? { kind: "anonymous" };
    const role = actor.kind === "account" ? actor.role : undefined;
    // An admin without a second factor reaches only the open rows and the set-up until it is on.
    if (actor.kind === "account" && actor.secondFactorSetUpNeeded && spec.access !== "anyone" && !spec.beforeSecondFactor)
      return next(secondFactorSetUpFirst());
    if (mayCall(spec.access, role)) return next();
    if (!role) return next(new Unauthorized());
    const roles = spec.access === "signed_in" || spec.access === "anyone" ? [] : spec.access;
    next(new Forbidden(`This needs a ${roles.join(" or ")} account.`));
  };
}

function respond(spec: EndpointSpec, reply: unknown, res: Response, strict: boolean): void {
  if (spec.answer === null) {
    res.status(spec.status ?? 204).end();
    return;
  }
  if ("file" in spec.answer) {
    const file = reply as FileReply;
    res.status(file.status ?? spec.status ?? 200);
    res.setHeader("content-type", file.contentType);
    if (file.filename) res.attachment(file.filename);
    if (file.cacheControl) res.setHeader("cache-control", file.cacheControl);
    if (spec.answer.file === "webp") res.setHeader("x-content-type-options", "nosniff");
    res.send(file.body);
    return;
  }
  const { status, answer } = isStatusReply(reply) ? reply : { status: spec.status ?? 200, answer: reply };
  if (strict) {
    const checked = (spec.answer as z.ZodType).safeParse(JSON.parse(JSON.stringify(answer)));
    if (!checked.success) {
      throw new Error(`${spec.method} ${spec.path} answered outside its contract: ${checked.error.message}`);
    }
  }
  res.status(status).json(answer);
}

/** One row of the table with its handler, ready to mount. */
export interface MountableRow {
  key: string;
  spec: EndpointSpec;
  handler: Handler<EndpointSpec>;
}

/** Every row of a table of tables (by domain) with its handler, keyed "domain.name". */
export function rowsOf<T extends Record<string, EndpointTable>>(tables: T, handlers: { [D in keyof T]?: Handlers<T[D]> }): MountableRow[] {
  return Object.entries(tables).flatMap(([domain, table]) => {
    const domainHandlers = handlers[domain] as Record<string, Handler<EndpointSpec>> | undefined;
    if (!domainHandlers) return [];
    return Object.entries(table).map(([name, spec]) => ({ key: `${domain}.${name}`, spec, handler: domainHandlers[name]! }));
  });
}

/** Mounts rows on `router` at their full paths, literal segments before parameters (so `/payouts/due` wins over `/payouts/:id`). */
export function mountEndpoints(router: Router, rows: readonly MountableRow[], options: MountOptions): void {
  for (const { spec, handler } of [...rows].sort((a, b) => literalFirst(a.spec, b.spec))) {
    const allowed = new Set<string>([...everyEndpointErrors, ...(spec.errors ?? [])]);
    const steps: RequestHandler[] = [];
    if (!spec.csrfFree) steps.push(requireCsrfToken);
    steps.push(accessCheck(spec));
    // The body first: a rate limit may count per account, by the e-mail in it.
    if (spec.body !== undefined) steps.push(options.bodyReaders[typeof spec.body === "string" ? spec.body : "json"]);
    if (spec.limit) steps.push(...(options.limits?.[spec.limit] ?? []));

    const run = async (req: Request, res: Response, next: NextFunction) => {
      try {
        const call: EndpointCall<EndpointSpec> = {
          actor: req.actor ?? { kind: "anonymous" },
          params: req.params as PathParams<EndpointSpec>,
          query: (spec.query ? parse(spec.query, req.query) : {}) as QueryOutput<EndpointSpec>,
          body: (spec.body === undefined ? undefined : typeof spec.body === "string" ? req.body : parse(spec.body, req.body)) as never,
          req,
          res,
        };
        const reply = await handler(call);
        if (reply === ANSWERED) return;
        respond(spec, reply, res, options.strict ?? false);
      } catch (error) {
        if (options.strict && error instanceof AppError && !allowed.has(error.code)) {
          next(new Error(`${spec.method} ${spec.path} answered the error code "${error.code}", which its row does not list.`));
          return;
        }
        next(error);
      }
    };
    router[spec.method.toLowerCase() as "get" | "post" | "patch" | "put" | "delete"](spec.path, ...steps, run);
  }
}
