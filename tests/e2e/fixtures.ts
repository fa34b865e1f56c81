/**
 * Fixture builders: each end-to-end test makes the people and slabs it needs through the API, as
 * a sawyer and the desk would (sign-up, the e-mailed confirmation link, slab, reading, listing,
 * photo, submission, approval), so no test depends on another having run first or on a seeded
 * slab still being for sale. Every call is a row of the endpoint table in packages/contracts.
 */
import { request as httpRequest } from "node:http";
import {
  accountEndpoints,
  CSRF_HEADER,
  listingEndpoints,
  pathOf,
  reviewEndpoints,
  secondFactorEndpoints,
  yardEndpoints,
  type EndpointSpec,
} from "@grainyard/contracts";
import type { Browser, Page } from "playwright-core";
import { appUrl, codeFor, mailsTo, type SignInAs } from "./browser.ts";

interface Answer {
  status: number;
  body: unknown;
}

interface CallInput {
  params?: Record<string, string>;
  query?: Record<string, string>;
  body?: unknown;
  /** Raw bytes instead of JSON (a photo). */
  bytes?: { data: Buffer; contentType: string };
}

/**
 * An API client that behaves like one browser: it keeps the session cookies and sends the
 * anti-forgery token on every call that changes something. Through node:http, since Node's fetch
 * refuses a few ports a test port base may land on.
 */
export class ApiSession {
  private readonly cookies = new Map<string, string>();
  private csrfToken = "";

  static async open(): Promise<ApiSession> {
    const session = new ApiSession();
    await session.call(accountEndpoints.getSession);
    return session;
  }

  /** Calls one endpoint; a status other than the row's (200 unless it says otherwise) throws with the answer. */
  async call<T = Record<string, unknown>>(spec: EndpointSpec, input: CallInput = {}): Promise<T> {
    const answer = await this.send(spec, input);
    const expected = spec.status ?? 200;
    if (answer.status !== expected) {
      throw new Error(`${spec.method} ${spec.path}: expected ${expected}, got ${answer.status} ${JSON.stringify(answer.body)}`);
    }
    return answer.body as T;
  }

  /** Calls one endpoint and gives back whatever it answered. */
  send(spec: EndpointSpec, input: CallInput = {}): Promise<Answer> {
    let path = pathOf(spec, input.params);
    if (input.query) path += `?${new URLSearchParams(input.query).toString()}`;
    const payload = input.bytes?.data ?? (input.body === undefined ? undefined : Buffer.from(JSON.stringify(input.body)));
    const headers: Record<string, string | number> = { accept: "application/json" };
    if (payload) {
      headers["content-type"] = input.bytes?.contentType ?? "application/json";
      headers["content-length"] = payload.length;
    }
    if (spec.method !== "GET") headers[CSRF_HEADER] = this.csrfToken;
    if (this.cookies.size) headers.cookie = [...this.cookies].map(([name, value]) => `${name}=${value}`).join("; ");
    return new Promise((resolve, reject) => {
      const request = httpRequest(new URL(path, appUrl), { method: spec.method, headers, timeout: 30_000 }, (response) => {
        for (const line of response.headers["set-cookie"] ?? []) {
          const [pair] = line.split(";");
          const at = pair!.indexOf("=");
          this.cookies.set(pair!.slice(0, at).trim(), pair!.slice(at + 1).trim());
        }
        const chunks: Buffer[] = [];
        response.on("data", (chunk: Buffer) => chunks.push(chunk));
        response.on("end", () => {
          const text = Buffer.concat(chunks).toString("utf8");
          let body: unknown = text;
          try {
            body = text ? JSON.parse(text) : undefined;
          } catch {
            // not JSON: kept as text for the error message
          }
          const token = (body as { csrfToken?: unknown } | undefined)?.csrfToken;
          if (typeof token === "string") this.csrfToken = token;
          resolve({ status: response.statusCode ?? 0, body });
        });
        response.on("error", reject);
      });
      request.on("timeout", () => request.destroy(new Error(`${spec.method} ${path} timed out`)));
      request.on("error", reject);
      request.end(payload);
    });
  }
}

const STEP_MS = 30_000;

/**
 * Signs in through the API; for an account with a second factor, with the code its app shows. A code
 * works once per account: when a sign-in elsewhere (a browser in the same test) used this step's
 * code, the next step's is tried, then the clock's next step is awaited.
 */
export async function apiSignIn(who: SignInAs): Promise<ApiSession> {
  const session = await ApiSession.open();
  const state = await session.call<{ secondStep: unknown }>(accountEndpoints.signIn, {
    body: { email: who.email, password: who.password },
  });
  if (!state.secondStep) return session;
  if (!who.totpSecret) throw new Error(`${who.email} asks for a second factor and the fixture has no secret for it`);
  for (let attempt = 0; attempt < 3; attempt++) {
    const step = Math.floor(Date.now() / STEP_MS);
    for (const ahead of [0, 1]) {
      const code = await codeFor(who.totpSecret, (step + ahead) * STEP_MS);
      const answer = await session.send(secondFactorEndpoints.signInSecondStep, { body: { code } });
      if (answer.status === 200) return session;
      const refused = (answer.body as { error?: { code?: string } }).error?.code;
      if (refused !== "second_factor_used") throw new Error(`the code step refused the code: ${answer.status} ${refused}`);
    }
    while (Math.floor(Date.now() / STEP_MS) <= step) await new Promise((resolve) => setTimeout(resolve, 250));
  }
  throw new Error(`no code was taken for ${who.email}`);
}

/** A made-up person, unique per run (names and addresses show up in lists and e-mails that earlier runs left). */
function uniquePerson(label: string): { email: string; password: string; displayName: string } {
  const tag = `${Date.now().toString(36).slice(-4)}${Math.random().toString(36).slice(2, 5)}`;
  return {
    email: `${label}-${tag}@lakemont-fixtures.test`,
    password: `${label}-fixture-password`,
    displayName: `${label[0]!.toUpperCase()}${label.slice(1)} ${tag.toUpperCase()}`,
  };
}

/** Waits for the confirmation link the sign-up mailed and follows it. */
async function confirmEmail(session: ApiSession, email: string): Promise<void> {
  const deadline = Date.now() + 30_000;
  while (Date.now() < deadline) {
    for (const message of await mailsTo(email)) {
      const token = /\/verify-email\?token=([A-Za-z0-9_-]+)/.exec(message.text)?.[1];
      if (token) {
        await session.call(accountEndpoints.verifyEmail, { body: { token } });
        return;
      }
    }
    await new Promise((resolve) => setTimeout(resolve, 200));
  }
  throw new Error(`no confirmation link reached ${email}`);
}

export interface Person extends SignInAs {
  displayName: string;
  /** Signed in through the API (the browser signs in on its own). */
  api: ApiSession;
}

export interface Sawyer extends Person {
  yardName: string;
}

/** A new sawyer with a confirmed address and a yard in an invented Lakemont town (yard time: America/Detroit). */
export async function newSawyer(label: string, pickupTown = "Lakemont"): Promise<Sawyer> {
  const { email, password, displayName } = uniquePerson(label);
  const yardName = `${displayName} Slabs`;
  const session = await ApiSession.open();
  await session.call(accountEndpoints.signUp, { body: { role: "sawyer", email, password, displayName, yardName, pickupTown } });
  await confirmEmail(session, email);
  return { email, password, displayName, yardName, api: await apiSignIn({ email, password }) };
}

/** A new buyer with a confirmed address. */
export async function newBuyer(label: string): Promise<Person> {
  const { email, password, displayName } = uniquePerson(label);
  const session = await ApiSession.open();
  await session.call(accountEndpoints.signUp, { body: { role: "buyer", email, password, displayName } });
  await confirmEmail(session, email);
  return { email, password, displayName, api: await apiSignIn({ email, password }) };
}

/** A phone photo of a slab painted by the browser itself on a canvas (a live-edged board on gravel), as JPEG bytes. */
export async function paintedSlabPhoto(page: Page, hue = 28): Promise<Buffer> {
  const dataUrl = await page.evaluate((h) => {
    const canvas = document.createElement("canvas");
    canvas.width = 1200;
    canvas.height = 800;
    const context = canvas.getContext("2d")!;
    context.fillStyle = "#8d8a83";
    context.fillRect(0, 0, 1200, 800);
    context.fillStyle = `hsl(${h}, 45%, 45%)`;
    context.beginPath();
    context.moveTo(60, 260);
    context.bezierCurveTo(400, 200, 800, 300, 1140, 240);
    context.lineTo(1140, 560);
    context.bezierCurveTo(800, 600, 400, 520, 60, 580);
    context.fill();
    return canvas.toDataURL("image/jpeg", 0.85);
  }, hue);
  return Buffer.from(dataUrl.split(",")[1]!, "base64");
}

/** The same photo from a page of its own (for fixtures made before any page is open). */
export async function slabPhoto(browser: Browser, hue = 28): Promise<Buffer> {
  const page = await browser.newPage();
  try {
    return await paintedSlabPhoto(page, hue);
  } finally {
    await page.close();
  }
}

export interface ListingSpec {
  title: string;
  speciesSlug: string;
  /** One slab, or a set of this many neighbouring slabs (sequential unless said). */
  slabs?: number;
  setKind?: "sequential" | "bookmatched";
  lengthMm?: number;
  thicknessMm?: number;
  widthStationsMm?: number[];
  priceMode?: "fixed" | "per_board_foot";
  rateMinor: number;
  freight?: boolean;
  description?: string;
}

/**
 * A live listing of the sawyer's, made the way a sawyer makes one (slabs with a moisture reading,
 * the listing, a photo, submission) and approved by the desk. Answers the listing's id.
 */
export async function liveListing(sawyer: Sawyer, desk: ApiSession, photo: Buffer, spec: ListingSpec): Promise<string> {
  const count = spec.slabs ?? 1;
  // The slabs of a set are neighbours cut from one log.
  const logId =
    count > 1
      ? (
          await sawyer.api.call<{ log: { id: string } }>(yardEndpoints.createLog, {
            body: { speciesSlug: spec.speciesSlug, siteTown: "Lakemont", siteKind: "street", fellingReason: "storm" },
          })
        ).log.id
      : null;
  const slabIds: string[] = [];
  for (let n = 0; n < count; n++) {
    const { slab } = await sawyer.api.call<{ slab: { id: string } }>(yardEndpoints.createSlab, {
      body: {
        logId,
        sequenceInLog: logId ? n + 1 : null,
        speciesSlug: spec.speciesSlug,
        lengthMm: spec.lengthMm ?? 2440,
        thicknessMm: spec.thicknessMm ?? 51,
        widthStationsMm: spec.widthStationsMm ?? [560, 540, 520],
        liveEdge: "both",
        surfacing: "flattened",
        dryingMethod: "air_then_kiln",
      },
    });
    await sawyer.api.call(yardEndpoints.addReading, {
      params: { slabId: slab.id },
      body: { readOn: "2026-01-10", moistureContentPct: 8, method: "pin_meter" },
    });
    slabIds.push(slab.id);
  }
  const { listing } = await sawyer.api.call<{ listing: { id: string } }>(listingEndpoints.createListing, {
    body: {
      title: spec.title,
      description: spec.description ?? "",
      slabIds,
      setKind: slabIds.length > 1 ? (spec.setKind ?? "sequential") : "single",
      priceMode: spec.priceMode ?? "fixed",
      rateMinor: spec.rateMinor,
      freight: spec.freight ?? true,
    },
  });
  await sawyer.api.call(listingEndpoints.uploadListingPhoto, {
    params: { listingId: listing.id },
    query: { altText: `${spec.title}, top face` },
    bytes: { data: photo, contentType: "image/jpeg" },
  });
  await sawyer.api.call(listingEndpoints.submitListing, { params: { listingId: listing.id } });
  await desk.call(reviewEndpoints.approveListing, { params: { listingId: listing.id } });
  return listing.id;
}
