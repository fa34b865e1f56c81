import escapeHtml from "escape-html";
import { randomUUID } from "node:crypto";
import { mkdirSync, readdirSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { createServer, type IncomingMessage, type ServerResponse } from "node:http";
import { join } from "node:path";
import { simpleParser } from "mailparser";
import { SMTPServer } from "smtp-server";

/** One message as the sink keeps it (a JSON file under the data folder). */
export interface StoredMessage {
  id: string;
  receivedAt: string;
  from: string;
  to: string[];
  subject: string;
  text: string;
  html: string | null;
}

export interface RunningMailSink {
  smtp: { host: string; port: number };
  inboxUrl: string;
  stop(): Promise<void>;
}

function readMessages(dir: string): StoredMessage[] {
  return readdirSync(dir)
    .filter((name) => name.endsWith(".json"))
    .map((name) => JSON.parse(readFileSync(join(dir, name), "utf8")) as StoredMessage)
    .sort((a, b) => b.receivedAt.localeCompare(a.receivedAt));
}

function page(title: string, body: string): string {
  return `<!doctype html><html lang="en"><head><meta charset="utf-8"><meta name="viewport" content="width=device-width, initial-scale=1"><title>${escapeHtml(title)}</title>
<style>body{font:16px/1.5 system-ui,sans-serif;margin:0;background:#f6f2ea;color:#2b241c}main{max-width:860px;margin:0 auto;padding:1rem}
h1{font-size:1.3rem}a{color:#6b3f1d}li{list-style:none;border-bottom:1px solid #e1d7c6;padding:.6rem 0}small{color:#6d6256}
pre{white-space:pre-wrap;background:#fff;border:1px solid #e1d7c6;padding:1rem;border-radius:6px}.tag{background:#2f4a3a;color:#fff;border-radius:4px;padding:0 .4rem;font-size:.8rem}</style></head>
<body><main>${body}</main></body></html>`;
}

/**
 * The development mail sink: an SMTP server on 127.0.0.1 that accepts every message and keeps it
 * as a file, plus an inbox page (HTML for people, JSON at /api/messages for tests).
 */
export async function startMailSink(options: { dir: string; smtpPort: number; inboxPort: number }): Promise<RunningMailSink> {
  const { dir } = options;
  mkdirSync(dir, { recursive: true });

  const smtp = new SMTPServer({
    authOptional: true,
    disabledCommands: ["STARTTLS"],
    logger: false,
    banner: "Grainyard development mail sink",
    size: 25 * 1024 * 1024,
    onData(stream, session, callback) {
      simpleParser(stream)
        .then((parsed) => {
          const message: StoredMessage = {
            id: randomUUID(),
            receivedAt: new Date().toISOString(),
            from: parsed.from?.text ?? session.envelope.mailFrom?.toString() ?? "",
            to: session.envelope.rcptTo.map((r) => r.address.toLowerCase()),
            subject: parsed.subject ?? "(no subject)",
            text: parsed.text ?? "",
            html: typeof parsed.html === "string" ? parsed.html : null,
          };
          writeFileSync(join(dir, `${message.receivedAt.replace(/[:.]/g, "-")}-${message.id}.json`), JSON.stringify(message, null, 2));
          callback();
        })
        .catch((error: Error) => callback(error));
    },
  });
  await new Promise<void>((resolvePromise, reject) => {
    smtp.once("error", reject);
    smtp.listen(options.smtpPort, "127.0.0.1", () => resolvePromise());
  });

  const inbox = createServer((req: IncomingMessage, res: ServerResponse) => {
    const url = new URL(req.url ?? "/", "http://127.0.0.1");
    const send = (status: number, type: string, body: string) => {
      res.writeHead(status, { "content-type": `${type}; charset=utf-8`, "cache-control": "no-store" });
      res.end(body);
    };
    try {
      if (url.pathname === "/api/messages" && req.method === "GET") {
        const to = url.searchParams.get("to")?.toLowerCase();
        const messages = readMessages(dir).filter((m) => !to || m.to.includes(to));
        return send(200, "application/json", JSON.stringify({ messages }));
      }
      if (url.pathname === "/api/messages" && req.method === "DELETE") {
        for (const name of readdirSync(dir)) rmSync(join(dir, name));
        return send(200, "application/json", JSON.stringify({ deleted: true }));
      }
      if (url.pathname === "/" && req.method === "GET") {
        const messages = readMessages(dir);
        const items = messages.length
          ? messages
              .map(
                (m) =>
                  `<li><a href="/messages/${m.id}">${escapeHtml(m.subject)}</a><br><small>to ${escapeHtml(m.to.join(", "))} · ${escapeHtml(new Date(m.receivedAt).toLocaleString("en-GB"))}</small></li>`,
              )
              .join("")
          : "<li>No mail yet. Sign up in Grainyard and the verification e-mail lands here.</li>";
        return send(
          200,
          "text/html",
          page("Grainyard inbox", `<h1>Grainyard development inbox <span class="tag">local only</span></h1><ul>${items}</ul>`),
        );
      }
      const match = /^\/messages\/([0-9a-f-]{36})$/.exec(url.pathname);
      if (match && req.method === "GET") {
        const message = readMessages(dir).find((m) => m.id === match[1]);
        if (!message) return send(404, "text/html", page("Not found", "<p>No such message. <a href='/'>Back to the inbox</a></p>"));
        const linked = escapeHtml(message.text).replace(/(https?:\/\/[^\s<]+)/g, '<a href="$1">$1</a>');
        return send(
          200,
          "text/html",
          page(
            message.subject,
            `<p><a href="/">← Inbox</a></p><h1>${escapeHtml(message.subject)}</h1><p><small>From ${escapeHtml(message.from)} to ${escapeHtml(message.to.join(", "))}</small></p><pre>${linked}</pre>`,
          ),
        );
      }
      send(404, "application/json", JSON.stringify({ error: "not found" }));
    } catch (error) {
      send(500, "application/json", JSON.stringify({ error: (error as Error).message }));
    }
  });
  await new Promise<void>((resolvePromise, reject) => {
    inbox.once("error", reject);
    inbox.listen(options.inboxPort, "127.0.0.1", () => resolvePromise());
  });

  return {
    smtp: { host: "127.0.0.1", port: options.smtpPort },
    inboxUrl: `http://127.0.0.1:${options.inboxPort}`,
    async stop() {
      const closed = new Promise<void>((r) => inbox.close(() => r()));
      inbox.closeAllConnections(); // an open browser tab keeps a connection alive
      await closed;
      await new Promise<void>((r) => smtp.close(() => r()));
    },
  };
}
