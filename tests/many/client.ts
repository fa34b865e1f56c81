import { readFileSync } from "node:fs";
import { request } from "node:http";
import { generate } from "otplib";

export interface Answer {
  status: number;
  instance: string;
  body: Record<string, unknown> & { error?: { code: string; message: string } };
}

function required(name: string): string {
  const value = process.env[name];
  if (!value) throw new Error(`${name} is not set: this suite runs inside \`npm test\`, which starts the instances behind HAProxy.`);
  return value;
}

/** HAProxy on the app port, and each instance's own address behind it. */
export const balancerUrl = () => required("APP_URL");
export const instanceUrls = () => required("INSTANCE_URLS").split(",");
/** The seeded demo admin's second-factor secret (the test runner passes it on as `npm start` prints it). */
export const demoAdminSecret = () => required("DEMO_ADMIN_TOTP_SECRET");

/**
 * A browser-like HTTP client on loopback: keeps its cookies, sends the anti-forgery token on
 * changes, and leaves from its own loopback address (`from`), which HAProxy passes on to the API.
 */
export function client(options: { from?: string } = {}) {
  const cookies = new Map<string, string>();
  let csrf = "";
  function send(baseUrl: string, method: string, path: string, body?: Buffer | object, type = "application/json"): Promise<Answer> {
    const url = new URL(path, baseUrl);
    const payload = body === undefined ? undefined : Buffer.isBuffer(body) ? body : Buffer.from(JSON.stringify(body));
    return new Promise((resolvePromise, reject) => {
      const req = request(
        {
          host: url.hostname,
          port: url.port,
          path: url.pathname + url.search,
          method,
          agent: false,
          localAddress: options.from,
          headers: {
            ...(cookies.size ? { cookie: [...cookies].map(([k, v]) => `${k}=${v}`).join("; ") } : {}),
            ...(method !== "GET" ? { "x-csrf-token": csrf } : {}),
            ...(payload ? { "content-type": type, "content-length": payload.length } : {}),
          },
        },
        (res) => {
          for (const line of res.headers["set-cookie"] ?? []) {
            const [pair] = line.split(";");
            const at = pair!.indexOf("=");
            cookies.set(pair!.slice(0, at), pair!.slice(at + 1));
          }
          const chunks: Buffer[] = [];
          res.on("data", (chunk: Buffer) => chunks.push(chunk));
          res.on("end", () => {
            const text = Buffer.concat(chunks).toString("utf8");
            let parsed: Answer["body"];
            try {
              parsed = text ? (JSON.parse(text) as Answer["body"]) : {};
            } catch {
              parsed = { text };
            }
            if (typeof parsed.csrfToken === "string") csrf = parsed.csrfToken;
            resolvePromise({ status: res.statusCode ?? 0, instance: String(res.headers["x-grainyard-instance"] ?? ""), body: parsed });
          });
        },
      );
      req.on("error", reject);
      req.end(payload);
    });
  }
  return {
    send,
    get: (path: string, baseUrl = balancerUrl()) => send(baseUrl, "GET", path),
    post: (path: string, body?: object, baseUrl = balancerUrl()) => send(baseUrl, "POST", path, body ?? {}),
    /** Reads the session's anti-forgery token (and cookie) first, as the web app does. */
    async start(baseUrl = balancerUrl()) {
      const answer = await send(baseUrl, "GET", "/api/v1/session");
      if (answer.status !== 200) throw new Error(`session: ${answer.status}`);
      return this;
    },
    /** Signs in; an account with a second factor (give its secret) through the code step with the code its app shows now. */
    async signIn(email: string, password: string, baseUrl = balancerUrl(), totpSecret?: string) {
      await this.start(baseUrl);
      let answer = await send(baseUrl, "POST", "/api/v1/session", { email, password });
      if (answer.status === 200 && answer.body.secondStep && totpSecret) {
        const code = await generate({ secret: totpSecret, epoch: Math.floor(Date.now() / 1000) });
        answer = await send(baseUrl, "POST", "/api/v1/session/second-factor", { code });
      }
      if (answer.status !== 200 || !answer.body.account)
        throw new Error(`sign-in of ${email}: ${answer.status} ${JSON.stringify(answer.body)}`);
      return this;
    },
    photo: (path: string, file: string, baseUrl = balancerUrl()) => send(baseUrl, "POST", path, readFileSync(file), "image/png"),
  };
}
export type Client = ReturnType<typeof client>;
