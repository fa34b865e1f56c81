import { hostname } from "node:os";
import { randomUUID } from "node:crypto";
import type { OutboxEmail, OutboxPage, OutboxQuery } from "@grainyard/contracts";
import { In, type DataSource, type EntityManager, type EntitySubscriberInterface, type QueryRunner } from "typeorm";
import { OutboxEmailEntity } from "../entities/index.ts";
import { Conflict, NotFound } from "../errors.ts";
import type { Mailer, OutgoingMail } from "../integrations/mail.ts";
import { requireRole, type Actor } from "./actor.ts";
import { recordAudit } from "./audit-log.ts";
import type { BackgroundWork } from "./background-work.ts";

/** What a service needs to send an e-mail: write it into the outbox with the change that causes it. */
export interface MailQueue {
  /**
   * Writes the e-mail into the outbox with `manager`, so it exists exactly when the caller's
   * transaction commits (a rollback leaves no e-mail). Once the transaction commits, delivery is
   * tried at once after the answer; the outbox job retries what did not go out.
   */
  queue(manager: EntityManager, kind: string, mail: OutgoingMail): Promise<void>;
}

export interface OutboxSettings {
  /** Wait before the first retry; each further retry waits twice as long, up to an hour. */
  retryFirstMs: number;
  /** Attempts before an e-mail is marked failed (a permanent refusal fails it at once). */
  maxAttempts: number;
}

/** How long one claimed attempt may take before another instance may take the e-mail again. */
const CLAIM_SECONDS = 120;
const LONGEST_WAIT_MS = 3_600_000;
const ROUND_SIZE = 50;

export type DeliveryOutcome = "sent" | "retry" | "failed" | "taken";

/** The wait before the next try after `attempts` failed tries: first, doubling, at most an hour. */
export function retryDelayMs(attempts: number, firstMs: number): number {
  return Math.min(LONGEST_WAIT_MS, firstMs * 2 ** Math.max(0, attempts - 1));
}

/** Why an attempt failed, in words an operator can act on; the driver's own text goes to the log. */
export function plainReason(error: unknown): { reason: string; permanent: boolean } {
  const { code, responseCode } = (error ?? {}) as { code?: string; responseCode?: number };
  if (typeof responseCode === "number" && responseCode >= 500)
    return { reason: `The mail server refused this e-mail (SMTP ${responseCode}).`, permanent: true };
  if (typeof responseCode === "number" && responseCode >= 400)
    return { reason: `The mail server asked us to try again later (SMTP ${responseCode}).`, permanent: false };
  if (code && ["ECONNECTION", "ESOCKET", "ETIMEDOUT", "EDNS", "ECONNREFUSED", "ECONNRESET", "EGREETING"].includes(code))
    return { reason: "The mail server could not be reached.", permanent: false };
  return { reason: "Sending failed; the API log has the details.", permanent: false };
}

/**
 * The transactional e-mail outbox. Services `queue` e-mails inside their own transactions; after
 * the commit the new rows are handed to background work for a prompt first attempt, and the
 * outbox job (`deliverDue`, through the job runner) sends whatever is due. Each attempt first
 * claims its row with a conditional update, so two instances (or the job and a prompt attempt)
 * never send the same e-mail twice; a sender that dies mid-attempt leaves a claim that expires
 * after CLAIM_SECONDS, and the e-mail is tried again (at least once, then).
 */
export function createMailOutbox(deps: {
  dataSource: DataSource;
  mailer: Mailer;
  background: BackgroundWork;
  settings: OutboxSettings;
  log: { error(object: object, message: string): void; warn(object: object, message: string): void };
  now?: () => Date;
  holder?: string;
}) {
  const { dataSource, mailer, settings, log } = deps;
  const holder = deps.holder ?? `${hostname()}:${process.pid}:${randomUUID().slice(0, 8)}`;
  const now = deps.now ?? (() => new Date());
  const rows = () => dataSource.getRepository(OutboxEmailEntity);
  /** E-mails written in a transaction still open, by its query runner: handed to delivery on commit. */
  const pendingByTransaction = new WeakMap<QueryRunner, string[]>();

  function deliverSoon(ids: string[]) {
    if (ids.length) deps.background.run("mail_outbox", async () => void (await deliverEach(ids)));
  }

  const subscriber: EntitySubscriberInterface = {
    afterTransactionCommit({ queryRunner }) {
      if (queryRunner.isTransactionActive) return; // a savepoint inside a transaction still open
      const ids = pendingByTransaction.get(queryRunner);
      pendingByTransaction.delete(queryRunner);
      if (ids) deliverSoon(ids);
    },
    afterTransactionRollback({ queryRunner }) {
      if (!queryRunner.isTransactionActive) pendingByTransaction.delete(queryRunner);
    },
  };
  dataSource.subscribers.push(subscriber);

  async function deliverEach(ids: string[]): Promise<DeliveryOutcome[]> {
    const outcomes: DeliveryOutcome[] = [];
    for (const id of ids) outcomes.push(await deliverOne(id));
    return outcomes;
  }

  /** One attempt at one e-mail, if this instance wins its claim. */
  async function deliverOne(id: string): Promise<DeliveryOutcome> {
    const claimed = await rows()
      .createQueryBuilder()
      .update()
      .set({
        status: "sending",
        claimedBy: holder,
        attempts: () => "attempts + 1",
        nextAttemptAt: () => `NOW(3) + INTERVAL ${CLAIM_SECONDS} SECOND`,
      })
      .where("id = :id AND status IN ('waiting', 'sending') AND next_attempt_at <= NOW(3)", { id })
      .execute();
    if (claimed.affected !== 1) return "taken";
    const email = await rows().findOneByOrFail({ id });
    const mine = { id, status: "sending" as const, claimedBy: holder };
    try {
      await mailer.send({ to: email.recipient, subject: email.subject, text: email.textBody, html: email.htmlBody ?? undefined });
    } catch (error) {
      const { reason, permanent } = plainReason(error);
      const givingUp = permanent || email.attempts >= settings.maxAttempts;
      log.warn({ err: error, emailId: id, kind: email.kind, attempt: email.attempts, givingUp }, "e-mail not delivered");
      const waitMs = retryDelayMs(email.attempts, settings.retryFirstMs);
      await rows()
        .createQueryBuilder()
        .update()
        .set(
          givingUp
            ? { status: "failed", lastError: reason }
            : { status: "waiting", lastError: reason, nextAttemptAt: () => `NOW(3) + INTERVAL ${waitMs * 1000} MICROSECOND` },
        )
        .where(mine)
        .execute();
      return givingUp ? "failed" : "retry";
    }
    await rows()
      .createQueryBuilder()
      .update()
      .set({ status: "sent", sentAt: () => "NOW(3)", lastError: null })
      .where(mine)
      .execute();
    return "sent";
  }

  function view(row: OutboxEmailEntity): OutboxEmail {
    return {
      id: String(row.id),
      kind: row.kind,
      to: row.recipient,
      subject: row.subject,
      status: row.status,
      attempts: row.attempts,
      nextAttemptAt: row.status === "waiting" || row.status === "sending" ? row.nextAttemptAt.toISOString() : null,
      lastError: row.lastError,
      sentAt: row.sentAt?.toISOString() ?? null,
      createdAt: row.createdAt.toISOString(),
    };
  }

  return {
    holder,

    async queue(manager: EntityManager, kind: string, mail: OutgoingMail): Promise<void> {
      if (!mail.to) return;
      const inserted = await manager
        .getRepository(OutboxEmailEntity)
        .createQueryBuilder()
        .insert()
        .values({
          kind,
          recipient: mail.to,
          subject: mail.subject,
          textBody: mail.text,
          htmlBody: mail.html ?? null,
          status: "waiting",
          attempts: 0,
          nextAttemptAt: () => "NOW(3)",
        })
        .execute();
      const id = String(inserted.identifiers[0]!.id);
      const runner = manager.queryRunner;
      if (runner?.isTransactionActive) {
        const ids = pendingByTransaction.get(runner) ?? [];
        ids.push(id);
        pendingByTransaction.set(runner, ids);
      } else {
        deliverSoon([id]); // no transaction: the row is committed already
      }
    },

    /** The outbox job: one attempt at each e-mail that is due (oldest first), ROUND_SIZE at a time. */
    async deliverDue(): Promise<Record<DeliveryOutcome, number>> {
      const due = await rows()
        .createQueryBuilder("email")
        .select("email.id", "id")
        .where("email.status IN ('waiting', 'sending') AND email.next_attempt_at <= NOW(3)")
        .orderBy("email.id", "ASC")
        .limit(ROUND_SIZE)
        .getRawMany<{ id: string }>();
      const counts: Record<DeliveryOutcome, number> = { sent: 0, retry: 0, failed: 0, taken: 0 };
      for (const outcome of await deliverEach(due.map((row) => String(row.id)))) counts[outcome] += 1;
      return counts;
    },

    /** The desk's view: still to go out (default), failed, or the latest sent; newest first. */
    async list(actor: Actor, query: OutboxQuery): Promise<OutboxPage> {
      requireRole(actor, "admin");
      const wanted = query.status ?? "waiting";
      const statuses = wanted === "waiting" ? (["waiting", "sending"] as const) : ([wanted] as const);
      const found = await rows().find({ where: { status: In([...statuses]) }, order: { id: "DESC" }, take: 200 });
      const [waiting, failed] = await Promise.all([
        rows().countBy({ status: In(["waiting", "sending"]) }),
        rows().countBy({ status: "failed" }),
      ]);
      return { emails: found.map(view), counts: { waiting, failed } };
    },

    /** An admin sends a failed (or waiting) e-mail again now: a fresh round of attempts, audited. */
    async resend(actor: Actor, emailId: string): Promise<OutboxEmail> {
      const admin = requireRole(actor, "admin");
      if (!/^\d{1,20}$/.test(emailId)) throw new NotFound("No e-mail with that id.");
      // The answer is the row as this resend left it (waiting, no attempts yet): read inside the
      // transaction, since delivery may claim it the moment the transaction commits.
      const queued = await dataSource.transaction(async (manager) => {
        const email = await manager
          .getRepository(OutboxEmailEntity)
          .findOne({ where: { id: emailId }, lock: { mode: "pessimistic_write" } });
        if (!email) throw new NotFound("No e-mail with that id.");
        if (email.status === "sent" || email.status === "sending")
          throw new Conflict(
            email.status === "sent" ? "That e-mail went out already." : "That e-mail is going out right now.",
            "email_already_sent",
          );
        await manager
          .getRepository(OutboxEmailEntity)
          .createQueryBuilder()
          .update()
          .set({ status: "waiting", attempts: 0, nextAttemptAt: () => "NOW(3)", claimedBy: null })
          .where({ id: emailId })
          .execute();
        await recordAudit(
          manager,
          admin,
          {
            action: "email.resend",
            targetKind: "email",
            targetId: emailId,
            before: { status: email.status, attempts: email.attempts, lastError: email.lastError },
            after: { status: "waiting" },
          },
          now(),
        );
        const runner = manager.queryRunner!;
        pendingByTransaction.set(runner, [...(pendingByTransaction.get(runner) ?? []), emailId]);
        return manager.getRepository(OutboxEmailEntity).findOneByOrFail({ id: emailId });
      });
      return view(queued);
    },
  };
}

export type MailOutbox = ReturnType<typeof createMailOutbox>;
