import type { AddressInfo } from "node:net";
import type { Server } from "node:http";
import sharp from "sharp";
import { SMTPServer } from "smtp-server";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { createDataSource } from "../db/data-source.ts";
import { OrderEntity, OutboxEmailEntity } from "../entities/index.ts";
import { createMailer } from "../integrations/mail.ts";
import { createJobRunner } from "../jobs/job-runner.ts";
import { createLogger } from "../logger.ts";
import { createBackgroundWork } from "../services/background-work.ts";
import { createMailOutbox } from "../services/mail-outbox.ts";
import { listenForWebhooks, startPaymentsFake, until, type TestPaymentsFake } from "../test-support/payments-harness.ts";
import { createTestContext, type BrowserClient, type TestContext } from "../test-support/test-context.ts";
import { payOnHostedPage } from "../test-support/hosted-payment.ts";

/*
 * The e-mail outbox on the real stack: MariaDB, real SMTP (this file's own small SMTP server, so it
 * can be stopped without touching the shared mail sink), the payments fake through the official SDK.
 */

interface Received {
  to: string[];
  subject: string;
}

/** A real SMTP server on 127.0.0.1 that keeps what it receives; `stop` and `start` again on the same port. */
function ownMailServer() {
  const received: Received[] = [];
  let server: SMTPServer | null = null;
  let port = 0;
  return {
    received,
    get port() {
      return port;
    },
    to: (address: string) => received.filter((m) => m.to.includes(address.toLowerCase())),
    async start() {
      server = new SMTPServer({
        authOptional: true,
        disabledCommands: ["STARTTLS"],
        logger: false,
        onData(stream, session, callback) {
          let raw = "";
          stream.on("data", (chunk: Buffer) => (raw += chunk.toString("utf8")));
          stream.on("end", () => {
            const subject = /^Subject: (.*)$/im.exec(raw)?.[1]?.trim() ?? "";
            received.push({ to: session.envelope.rcptTo.map((r) => r.address.toLowerCase()), subject });
            callback();
          });
        },
      });
      const running = server;
      await new Promise<void>((resolve, reject) => {
        running.once("error", reject);
        running.listen(port, "127.0.0.1", () => resolve());
      });
      port = (running.server.address() as AddressInfo).port;
    },
    async stop() {
      const running = server;
      server = null;
      if (running) await new Promise<void>((resolve) => running.close(() => resolve()));
    },
  };
}

let ctx: TestContext;
let payments: TestPaymentsFake;
let apiServer: Server;
let sawyer: BrowserClient & { account: { id: string; email: string } };
let admin: BrowserClient;
const smtp = ownMailServer();

const outboxRows = () => ctx.dataSource.getRepository(OutboxEmailEntity).find({ order: { id: "ASC" } });
const rowsTo = async (address: string) => (await outboxRows()).filter((row) => row.recipient === address);

async function liveListing(): Promise<string> {
  const slab = (
    await sawyer.post("/api/v1/yard/slabs", {
      speciesSlug: "black-walnut",
      lengthMm: 2100,
      thicknessMm: 50,
      widthStationsMm: [620, 600],
      liveEdge: "both",
      surfacing: "sanded",
      dryingMethod: "kiln",
    })
  ).body.slab;
  const listing = (
    await sawyer.post("/api/v1/yard/listings", { title: "Walnut outbox top", slabIds: [slab.id], priceMode: "fixed", rateMinor: 90_000 })
  ).body.listing;
  const photo = await sharp({ create: { width: 640, height: 480, channels: 3, background: "#6b4a2f" } })
    .jpeg()
    .toBuffer();
  await sawyer.agent
    .post(`/api/v1/yard/listings/${listing.id}/photos`)
    .set("x-csrf-token", sawyer.csrfToken)
    .set("content-type", "image/jpeg")
    .send(photo);
  await sawyer.post(`/api/v1/yard/listings/${listing.id}/submit`);
  expect((await admin.post(`/api/v1/admin/listings/${listing.id}/approve`)).status).toBe(200);
  return listing.id as string;
}

beforeAll(async () => {
  await smtp.start();
  payments = await startPaymentsFake({ secretKey: "sk_test_outbox", webhookSecret: "whsec_outbox_test" });
  ctx = await createTestContext({
    environment: {
      ...payments.environment,
      SMTP_HOST: "127.0.0.1",
      SMTP_PORT: String(smtp.port),
      MAIL_RETRY_FIRST_SECONDS: "1",
      MAIL_MAX_ATTEMPTS: "3",
      SIGN_IN_LIMIT_PER_IP: "1000",
    },
  });
  let webhookUrl: string;
  ({ server: apiServer, webhookUrl } = await listenForWebhooks(ctx.app));
  payments.fake.webhooks.options.url = webhookUrl;
  sawyer = await ctx.signedInClient("sawyer");
  admin = await ctx.signedInClient("admin");
}, 60_000);

afterAll(async () => {
  await new Promise((r) => apiServer?.close(r));
  await payments?.close();
  await ctx?.close();
  await smtp.stop();
});

describe("the e-mail outbox", () => {
  it("keeps a paid order's and a sign-up's e-mails while SMTP is down, and delivers each once when it is back", async () => {
    const listingId = await liveListing();
    await ctx.settled();
    const before = (await outboxRows()).length;
    await smtp.stop(); // nothing listens on the port now

    // A sign-up (join confirmation, written in the account's own transaction)…
    const joiner = `joiner-${Date.now()}@lakemont.test`;
    const anonymous = await ctx.client();
    const joined = await anonymous.post("/api/v1/accounts", {
      email: joiner,
      password: "outbox-join-passphrase-2026",
      role: "buyer",
      displayName: "Ivo Outbox",
    });
    expect(joined.status).toBe(202);

    // …and a checkout paid through the payments fake (the "paid" e-mails come with the webhook's transaction).
    const buyer = await ctx.signedInClient("buyer");
    const started = await buyer.post(`/api/v1/listings/${listingId}/checkout`, { handover: "pickup" });
    expect(started.status).toBe(201);
    const paid = await payOnHostedPage(started.body.checkoutUrl);
    expect(paid.status).toBe(303);
    const orderId = started.body.order.id as string;
    await until(async () => (await ctx.dataSource.getRepository(OrderEntity).findOneByOrFail({ id: orderId })).status === "paid");
    // The first attempts are made right after each commit, in the background: wait until each e-mail had its try
    // (seeing the order paid can come a moment before the webhook's commit hands its e-mails to the background).
    const recipients = [joiner, buyer.account.email, sawyer.account.email];
    await until(async () => {
      const mine = (await outboxRows()).slice(before).filter((row) => recipients.includes(row.recipient));
      return recipients.every((address) => mine.some((row) => row.recipient === address)) && mine.every((row) => row.attempts >= 1);
    });
    await ctx.settled();

    const written = (await outboxRows()).slice(before);
    for (const address of [joiner, buyer.account.email, sawyer.account.email]) {
      const rows = written.filter((row) => row.recipient === address);
      expect(rows.length, address).toBeGreaterThan(0);
      for (const row of rows) {
        expect(row.status).toBe("waiting");
        expect(row.attempts).toBe(1);
        expect(row.lastError).toBe("The mail server could not be reached.");
      }
    }
    expect(smtp.received).toHaveLength(before);

    // The desk sees them waiting, without their bodies (links in them are the recipients' alone).
    const desk = await admin.get("/api/v1/admin/outbox");
    expect(desk.status).toBe(200);
    expect(desk.body.counts.waiting).toBeGreaterThanOrEqual(3);
    expect(desk.body.emails.map((e: { to: string }) => e.to)).toContain(joiner);
    expect(JSON.stringify(desk.body)).not.toContain("verify-email?token=");

    // The mail server comes back on the same port; the outbox job (through the job runner) sends what is due.
    await smtp.start();
    const jobs = createJobRunner({ dataSource: ctx.dataSource, logger: createLogger("silent") });
    await until(async () => {
      await jobs.tick({ name: "mail-outbox", everyMs: 200, run: () => ctx.app.outbox.deliverDue().then(() => undefined) });
      return (await outboxRows()).every((row) => row.status === "sent");
    }, 20_000);
    expect(smtp.to(joiner).map((m) => m.subject)).toEqual([expect.stringMatching(/confirm/i)]);
    expect(smtp.to(buyer.account.email).filter((m) => /your order/i.test(m.subject))).toHaveLength(1);
    expect(smtp.to(sawyer.account.email).filter((m) => /^sold/i.test(m.subject))).toHaveLength(1);
    expect(smtp.received).toHaveLength((await outboxRows()).length);
  }, 60_000);

  it("leaves no e-mail when the change that causes it rolls back", async () => {
    const before = (await outboxRows()).length;
    await expect(
      ctx.dataSource.transaction(async (manager) => {
        await ctx.app.outbox.queue(manager, "message_notice", { to: "rolled-back@lakemont.test", subject: "Never sent", text: "No." });
        throw new Error("the change failed");
      }),
    ).rejects.toThrow("the change failed");
    await ctx.settled();
    expect((await outboxRows()).length).toBe(before);
    expect(smtp.to("rolled-back@lakemont.test")).toHaveLength(0);
  });

  it("delivers each e-mail once when two instances run the outbox job at the same moment", async () => {
    const second = createDataSource(ctx.config.database);
    await second.initialize();
    const secondMailer = createMailer(ctx.config.mail);
    const log = createLogger("silent");
    const otherInstance = createMailOutbox({
      dataSource: second,
      mailer: secondMailer,
      background: createBackgroundWork(log),
      settings: ctx.config.outbox,
      log,
    });
    try {
      // Twenty e-mails written straight into the outbox (no prompt attempt: both instances find them due).
      const addresses = Array.from({ length: 20 }, (_, i) => `twice-${i}-${Date.now()}@lakemont.test`);
      await ctx.dataSource.getRepository(OutboxEmailEntity).insert(
        addresses.map((to) => ({
          kind: "message_notice",
          recipient: to,
          subject: "Once only",
          textBody: "Once.",
          htmlBody: null,
          status: "waiting" as const,
          attempts: 0,
          nextAttemptAt: new Date(),
          lastError: null,
        })),
      );
      await ctx.dataSource.query("UPDATE outbox_email SET next_attempt_at = NOW(3) - INTERVAL 1 SECOND WHERE subject = 'Once only'");
      // Both deliver at once, without a lease between them: the per-e-mail claim alone must keep each to one send.
      const [one, two] = await Promise.all([ctx.app.outbox.deliverDue(), otherInstance.deliverDue()]);
      expect(one.sent + two.sent).toBe(20);
      expect(one.retry + two.retry + one.failed + two.failed).toBe(0);
      // An instance that lists the due e-mails after the other has sent some finds fewer, so the
      // "taken" answers are at most one per e-mail (never a second send), not always twenty.
      expect(one.taken + two.taken).toBeLessThanOrEqual(20);
      for (const address of addresses) expect(smtp.to(address), address).toHaveLength(1);
    } finally {
      secondMailer.close();
      await second.destroy();
    }
  });

  it("marks an e-mail failed after the attempt limit, and an admin's resend delivers it", async () => {
    await smtp.stop();
    const address = `later-${Date.now()}@lakemont.test`;
    await ctx.dataSource.transaction((manager) =>
      ctx.app.outbox.queue(manager, "message_notice", { to: address, subject: "Try me again", text: "Hello." }),
    );
    await ctx.settled();
    await until(async () => {
      await ctx.app.outbox.deliverDue();
      return (await rowsTo(address))[0]!.status === "failed";
    }, 20_000);
    const [failed] = await rowsTo(address);
    expect(failed!.attempts).toBe(3);
    const listed = await admin.get("/api/v1/admin/outbox?status=failed");
    expect(listed.body.emails.map((e: { id: string }) => e.id)).toContain(failed!.id);
    expect(listed.body.counts.failed).toBeGreaterThanOrEqual(1);

    await smtp.start();
    const resent = await admin.post(`/api/v1/admin/outbox/${failed!.id}/resend`);
    expect(resent.status).toBe(200);
    expect(resent.body.email).toMatchObject({ id: failed!.id, status: "waiting", attempts: 0 });
    await ctx.settled();
    expect((await rowsTo(address))[0]!.status).toBe("sent");
    expect(smtp.to(address)).toHaveLength(1);
    // Sent is final: a second resend is refused, and the first one is in the audit log.
    expect((await admin.post(`/api/v1/admin/outbox/${failed!.id}/resend`)).body.error.code).toBe("email_already_sent");
    const audit = await admin.get(`/api/v1/admin/audit?action=email.resend`);
    expect(audit.body.entries.map((e: { targetId: string }) => e.targetId)).toContain(failed!.id);
  }, 40_000);
});
