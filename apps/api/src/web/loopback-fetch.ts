import { request as httpRequest, type IncomingMessage } from "node:http";
import type { Request } from "express";

/** How long one API call of a server render may take before the render gives up on it. */
const CALL_TIMEOUT_MS = 15_000;

/**
 * A `fetch` for the server's render: it calls this same server over the connection's own local
 * address (so it works on any port, in tests on an ephemeral one) with no cookie and no
 * authorisation, so every answer is the one anyone not signed in would get. node:http, not
 * Node's fetch, which refuses a few "unsafe" ports (10080 among them).
 */
export function loopbackFetch(req: Request): typeof fetch {
  const raw = req.socket.localAddress ?? "127.0.0.1";
  const host = raw.startsWith("::ffff:") ? raw.slice(7) : raw;
  const port = req.socket.localPort;

  return ((input: string | URL | globalThis.Request, init: RequestInit = {}) =>
    new Promise<Response>((resolve, reject) => {
      const path = typeof input === "string" ? input : input instanceof URL ? `${input.pathname}${input.search}` : input.url;
      if (!path.startsWith("/")) {
        reject(new TypeError(`The server's render only calls its own API, not ${path}.`));
        return;
      }
      const headers: Record<string, string> = {};
      new Headers(init.headers).forEach((value, key) => {
        if (key !== "cookie" && key !== "authorization") headers[key] = value;
      });
      headers["x-grainyard-render"] = "1";
      const call = httpRequest(
        { host, port, path, method: init.method ?? "GET", headers, timeout: CALL_TIMEOUT_MS },
        (answer: IncomingMessage) => {
          const chunks: Buffer[] = [];
          answer.on("data", (chunk: Buffer) => chunks.push(chunk));
          answer.on("error", reject);
          answer.on("end", () => {
            const responseHeaders = new Headers();
            for (const [key, value] of Object.entries(answer.headers)) {
              if (typeof value === "string") responseHeaders.set(key, value);
            }
            const status = answer.statusCode ?? 502;
            const body = status === 204 || status === 304 ? null : Buffer.concat(chunks);
            resolve(new Response(body, { status, headers: responseHeaders }));
          });
        },
      );
      call.on("timeout", () => call.destroy(new Error(`The API did not answer ${path} within ${CALL_TIMEOUT_MS / 1000} s.`)));
      call.on("error", reject);
      init.signal?.addEventListener("abort", () => call.destroy(new DOMException("The call was stopped.", "AbortError")), { once: true });
      call.end(typeof init.body === "string" ? init.body : undefined);
    })) as typeof fetch;
}
