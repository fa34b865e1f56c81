import { spawnSync } from "node:child_process";
import { mkdtempSync, rmSync } from "node:fs";
import { createServer } from "node:net";
import { connect } from "node:net";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, describe, expect, it } from "vitest";
import { startMailSink, type StoredMessage } from "./mail-sink.ts";
import { assertPortFree } from "./ports.ts";
import { readEnvironmentFile, writeEnvironmentFile } from "./stack.ts";

const dir = mkdtempSync(join(tmpdir(), "devstack-"));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

async function freePort(): Promise<number> {
  return new Promise((resolvePromise) => {
    const server = createServer().listen(0, "127.0.0.1", () => {
      const { port } = server.address() as { port: number };
      server.close(() => resolvePromise(port));
    });
  });
}

/** Speaks plain SMTP to the sink, line by line, as any mail client would. */
async function sendBySmtp(port: number, from: string, to: string, body: string): Promise<string[]> {
  const socket = connect(port, "127.0.0.1");
  const replies: string[] = [];
  let buffer = "";
  const nextReply = () =>
    new Promise<string>((resolvePromise) => {
      const check = () => {
        const match = /^(\d{3}) .*\r\n/m.exec(buffer);
        if (match) {
          const end = buffer.indexOf(match[0]) + match[0].length;
          const reply = buffer.slice(0, end);
          buffer = buffer.slice(end);
          resolvePromise(reply);
        } else socket.once("data", (d) => ((buffer += d.toString()), check()));
      };
      check();
    });
  replies.push(await nextReply());
  for (const line of ["EHLO test.local", `MAIL FROM:<${from}>`, `RCPT TO:<${to}>`, "DATA"]) {
    socket.write(`${line}\r\n`);
    replies.push(await nextReply());
  }
  socket.write(`${body}\r\n.\r\n`);
  replies.push(await nextReply());
  socket.write("QUIT\r\n");
  socket.end();
  return replies;
}

describe("mail sink", () => {
  it("accepts SMTP mail and shows it in the inbox page and JSON", async () => {
    const smtpPort = await freePort();
    const inboxPort = await freePort();
    const sink = await startMailSink({ dir: join(dir, "mail"), smtpPort, inboxPort });
    try {
      const replies = await sendBySmtp(
        smtpPort,
        "hello@grainyard.test",
        "Ana@Lakemont.test",
        [
          "From: Grainyard <hello@grainyard.test>",
          "To: ana@lakemont.test",
          "Subject: Your slab <is> ready",
          "",
          "Visit http://127.0.0.1:5080/verify-email?token=abc",
        ].join("\r\n"),
      );
      expect(replies.at(-1)).toMatch(/^250/);
      const json = (await (await fetch(`${sink.inboxUrl}/api/messages?to=ana@lakemont.test`)).json()) as { messages: StoredMessage[] };
      expect(json.messages).toHaveLength(1);
      expect(json.messages[0]).toMatchObject({ subject: "Your slab <is> ready", to: ["ana@lakemont.test"] });
      expect(json.messages[0]!.text).toContain("verify-email?token=abc");
      const page = await (await fetch(sink.inboxUrl)).text();
      expect(page).toContain("Your slab &lt;is&gt; ready"); // escaped, never raw HTML
      const message = await (await fetch(`${sink.inboxUrl}/messages/${json.messages[0]!.id}`)).text();
      expect(message).toContain('<a href="http://127.0.0.1:5080/verify-email?token=abc">');
      const other = (await (await fetch(`${sink.inboxUrl}/api/messages?to=nobody@lakemont.test`)).json()) as { messages: StoredMessage[] };
      expect(other.messages).toHaveLength(0);
    } finally {
      await sink.stop();
    }
  });
});

describe("ports", () => {
  it("says which port is taken and what it was meant for", async () => {
    const server = createServer().listen(0, "127.0.0.1");
    await new Promise((r) => server.once("listening", r));
    const { port } = server.address() as { port: number };
    try {
      await expect(assertPortFree(port, "MariaDB")).rejects.toThrow(`port ${port} on 127.0.0.1 (MariaDB) is already in use`);
    } finally {
      server.close();
    }
    await expect(assertPortFree(port, "MariaDB")).resolves.toBeUndefined();
  });
});

describe("environment file", () => {
  it("is read back by a shell exactly as written, quotes and angle brackets included", () => {
    const file = join(dir, "api.env");
    writeEnvironmentFile(file, { MAIL_FROM: "Grainyard <hello@grainyard.test>", TRICKY: "it's $HOME `x`" });
    const result = spawnSync("bash", ["-c", `set -a; . '${file}'; printf '%s|%s' "$MAIL_FROM" "$TRICKY"`], { encoding: "utf8" });
    expect(result.stdout).toBe("Grainyard <hello@grainyard.test>|it's $HOME `x`");
  });

  it("is read back by the runner (npm run backup beside a running stack) exactly as written", () => {
    const file = join(dir, "api-read.env");
    const written = { MAIL_FROM: "Grainyard <hello@grainyard.test>", TRICKY: "it's $HOME `x` ''", EMPTY: "" };
    writeEnvironmentFile(file, written);
    expect(readEnvironmentFile(file)).toEqual(written);
  });
});
