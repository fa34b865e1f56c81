import { randomUUID } from "node:crypto";
import type {
  Account,
  PasswordResetInput,
  PasswordResetRequestInput,
  SignInInput,
  SignUpInput,
  VerifyEmailInput,
  YardProfileUpdateInput,
} from "@grainyard/contracts";
import { IsNull, type DataSource, type EntityManager } from "typeorm";
import type { AppConfig } from "../config.ts";
import { AccountEntity, EmailTokenEntity, SessionRecordEntity } from "../entities/index.ts";
import type { EmailTokenPurpose } from "../entities/email-token.ts";
import { Conflict, Forbidden, Gone, Invalid, NotFound, Unauthorized } from "../errors.ts";
import { freeYardSlug } from "./yard-slugs.ts";
import { recordAudit } from "./audit-log.ts";
import { joinAttemptMail, passwordResetMail, signInAttemptsMail, verificationMail } from "../mail-templates.ts";
import { requireRole, requireSignedIn, type Actor } from "./actor.ts";
import type { BackgroundWork } from "./background-work.ts";
import type { MailQueue } from "./mail-outbox.ts";
import { decoyPasswordCheck, hashPassword, isCommonPassword, passwordMatches } from "./passwords.ts";
import { findPlace } from "./places.ts";
import { newToken, tokenHash } from "./tokens.ts";
import type { DomainEventBus } from "../events.ts";
import { SECOND_STEP_MINUTES, type SecondFactorService } from "./second-factor-service.ts";

export const SESSION_DAYS = 14;
const VERIFY_HOURS = 48;
const RESET_HOURS = 1;

/** The outcome of one sign-in try, told to the sign-in limit that admitted it (see http/rate-limits.ts). */
export interface SignInAttempt {
  /** The password was right: the try is handed back, and the address becomes known to the account. */
  succeeded(): Promise<void>;
  /** A wrong password: it stays counted; `hammered` once the account's failures reach the slow-down point. */
  failed(): Promise<{ failures: number; hammered: boolean }>;
}

/** A password step's outcome: signed in, or the account's second factor is awaited (no session yet). */
export type SignInOutcome =
  { kind: "signed_in"; account: Account; sessionKey: string } | { kind: "code_needed"; secondStep: PendingSecondStep };

/** What the session cookie keeps between the password and the code (signed; a few minutes). */
export interface PendingSecondStep {
  accountId: string;
  email: string;
  /** Epoch milliseconds. */
  until: number;
}

/** Whether to e-mail an owner about something happening to their account: at most once an hour per account and kind. */
export interface OwnerNotices {
  firstInAWhile(kind: "sign_in_attempts" | "join_attempt", email: string): Promise<boolean>;
}

export interface AccountServiceDependencies {
  dataSource: DataSource;
  /** E-mails go into the outbox inside the transaction that causes them. */
  mail: MailQueue;
  config: Pick<AppConfig, "bcryptCost" | "publicUrl">;
  log: { error(object: object, message: string): void; info(object: object, message: string): void };
  /** Work whose timing must not depend on whether an address has an account runs after the answer. */
  background: BackgroundWork;
  notices: OwnerNotices;
  now?: () => Date;
  /** Codes for accounts with a second factor (the sign-in's second step). */
  secondFactor: SecondFactorService;
  /** Where the service announces what changed (the catalogue and alerts listen). */
  events?: DomainEventBus;
}

/** Where a pickup town lies, from the places dataset; nulls when the town is not found. */
export function pickupPosition(town: string | null): { pickupLatitude: number | null; pickupLongitude: number | null } {
  const place = town ? findPlace(town) : null;
  return { pickupLatitude: place?.latitude ?? null, pickupLongitude: place?.longitude ?? null };
}

export function toAccount(entity: AccountEntity): Account {
  return {
    id: entity.id,
    email: entity.email,
    displayName: entity.displayName,
    role: entity.role,
    emailVerified: entity.emailVerifiedAt !== null,
    yardName: entity.yardName,
    yardSlug: entity.yardSlug,
    yardStory: entity.yardStory,
    pickupTown: entity.pickupTown,
    createdAt: entity.createdAt.toISOString(),
  };
}

/** MariaDB's duplicate-key error (the unique index on the account's e-mail). */
function isDuplicateKey(error: unknown): boolean {
  const driverError = (error as { driverError?: { code?: string; errno?: number } }).driverError;
  return driverError?.code === "ER_DUP_ENTRY" || driverError?.errno === 1062;
}

const COMMON_PASSWORD_MESSAGE = "That password is on a list of common passwords. Choose one that is harder to guess.";

export function createAccountService(deps: AccountServiceDependencies) {
  const { dataSource, mail, config, log, background, notices } = deps;
  const now = deps.now ?? (() => new Date());
  const accounts = () => dataSource.getRepository(AccountEntity);

  async function issueToken(manager: EntityManager, accountId: string, purpose: EmailTokenPurpose, hours: number): Promise<string> {
    const token = newToken();
    await manager.getRepository(EmailTokenEntity).insert({
      accountId,
      purpose,
      tokenHash: tokenHash(token),
      expiresAt: new Date(now().getTime() + hours * 3600_000),
      usedAt: null,
    });
    return token;
  }

  /** Marks a token used exactly once; explains clearly when it is unknown, used or expired. */
  async function consumeToken(manager: EntityManager, token: string, purpose: EmailTokenPurpose): Promise<EmailTokenEntity> {
    const repository = manager.getRepository(EmailTokenEntity);
    const hash = tokenHash(token);
    const found = await repository.findOne({ where: { tokenHash: hash, purpose }, lock: { mode: "pessimistic_write" } });
    const noun = purpose === "verify_email" ? "confirmation" : "reset";
    if (!found)
      throw new Invalid(`That ${noun} link is not valid. Copy the whole link from the e-mail.`, { token: "Unknown link." }, "link_invalid");
    if (found.usedAt) throw new Gone(`That ${noun} link has already been used.`, "link_used");
    if (found.expiresAt.getTime() <= now().getTime()) throw new Gone(`That ${noun} link has expired. Ask for a new one.`, "link_expired");
    const result = await repository.update({ id: found.id, usedAt: IsNull() }, { usedAt: now() });
    if (result.affected !== 1) throw new Gone(`That ${noun} link has already been used.`, "link_used");
    return found;
  }

  /** A new session for an account; its key goes into the cookie, only its hash into the table. */
  async function openSession(manager: EntityManager, accountId: string): Promise<string> {
    const sessionKey = newToken();
    await manager.getRepository(SessionRecordEntity).insert({
      keyHash: tokenHash(sessionKey),
      accountId,
      expiresAt: new Date(now().getTime() + SESSION_DAYS * 86400_000),
      revokedAt: null,
    });
    return sessionKey;
  }

  return {
    /**
     * Makes a buyer or sawyer account (never an admin) and mails a confirmation link. The request
     * checks the input and hashes the password, then hands the rest to background work, so an
     * address that has an account already gets the same answer in the same time; the unique index
     * decides (no check-then-insert race), and that address's owner gets an e-mail saying someone
     * tried to join with it instead of a confirmation link.
     */
    async signUp(actor: Actor, input: SignUpInput): Promise<void> {
      if (actor.kind === "account")
        throw new Conflict("You are already signed in. Sign out to create another account.", "already_signed_in");
      if ((input.role as string) === "admin") throw new Forbidden("Admin accounts cannot be created here.");
      if (isCommonPassword(input.password)) throw new Invalid(COMMON_PASSWORD_MESSAGE, { password: COMMON_PASSWORD_MESSAGE });
      const passwordHash = await hashPassword(input.password, config.bcryptCost);
      background.run("sign_up", async () => {
        let created: AccountEntity | null;
        try {
          created = await dataSource.transaction(async (manager) => {
            const repository = manager.getRepository(AccountEntity);
            const id = randomUUID();
            const entity = repository.create({
              id,
              email: input.email,
              passwordHash,
              role: input.role,
              displayName: input.displayName,
              yardName: input.role === "sawyer" ? input.yardName : null,
              yardSlug: input.role === "sawyer" ? await freeYardSlug(manager, input.yardName, id) : null,
              pickupTown: input.role === "sawyer" ? input.pickupTown : null,
              ...pickupPosition(input.role === "sawyer" ? input.pickupTown : null),
              emailVerifiedAt: null,
            });
            await repository.insert(entity);
            const token = await issueToken(manager, entity.id, "verify_email", VERIFY_HOURS);
            await mail.queue(
              manager,
              "verify_email",
              verificationMail(entity.email, entity.displayName, `${config.publicUrl}/verify-email?token=${token}`),
            );
            return entity;
          });
        } catch (error) {
          if (!isDuplicateKey(error)) throw error;
          created = null;
        }
        if (!created) {
          if (!(await notices.firstInAWhile("join_attempt", input.email))) return;
          const owner = await accounts().findOneBy({ email: input.email });
          if (owner)
            await mail.queue(
              dataSource.manager,
              "join_attempt",
              joinAttemptMail(owner.email, owner.displayName, `${config.publicUrl}/sign-in`, `${config.publicUrl}/forgot-password`),
            );
          return;
        }
        log.info({ accountId: created.id, role: created.role }, "account created");
      });
    },

    /**
     * Checks the password and opens a session; returns the session key for the cookie. `attempt` is
     * the try the sign-in limit admitted: told whether the password was right, and when an account
     * is being hammered its owner is e-mailed (after the answer, so its timing tells nothing).
     */
    async signIn(input: SignInInput, attempt?: SignInAttempt): Promise<SignInOutcome> {
      const entity = await accounts().findOne({ where: { email: input.email } });
      const matches = entity
        ? await passwordMatches(input.password, entity.passwordHash)
        : await decoyPasswordCheck(input.password, config.bcryptCost);
      if (!entity || !matches) {
        const outcome = await attempt?.failed();
        if (entity && outcome?.hammered) {
          const { failures } = outcome;
          background.run("sign_in_warning", async () => {
            if (!(await notices.firstInAWhile("sign_in_attempts", entity.email))) return;
            log.info({ accountId: entity.id, failures }, "wrong passwords tried on an account; owner warned");
            await mail.queue(
              dataSource.manager,
              "sign_in_attempts",
              signInAttemptsMail(entity.email, entity.displayName, failures, `${config.publicUrl}/forgot-password`),
            );
          });
        }
        throw new Unauthorized("That e-mail and password do not match an account.", "wrong_credentials");
      }
      await attempt?.succeeded();
      if (entity.suspendedAt)
        throw new Forbidden(
          "This account is suspended, so it cannot sign in. Reply to the e-mail we sent you to talk to us about it.",
          "account_suspended",
        );
      // With a second factor on, the right password only opens the code step (kept in the signed cookie for a few minutes).
      if (entity.totpOnAt)
        return {
          kind: "code_needed",
          secondStep: { accountId: entity.id, email: entity.email, until: now().getTime() + SECOND_STEP_MINUTES * 60_000 },
        };
      const sessionKey = await openSession(dataSource.manager, entity.id);
      return { kind: "signed_in", account: toAccount(entity), sessionKey };
    },

    /** The code step: a code from the app or a recovery code for the account whose password was right a moment ago. */
    async signInSecondStep(pending: PendingSecondStep | undefined, code: string): Promise<{ account: Account; sessionKey: string }> {
      if (!pending || pending.until <= now().getTime())
        throw new Unauthorized("That sign-in waited too long for its code. Enter your password again.", "second_step_expired");
      const { opened, account } = await deps.secondFactor.completeSignIn(pending.accountId, code, (manager, found) =>
        openSession(manager, found.id),
      );
      return { account: toAccount(account), sessionKey: opened };
    },

    /** Finds the account behind a session key, if the session is live. */
    async actorForSession(sessionKey: string | undefined): Promise<{ actor: Actor; account: AccountEntity | null }> {
      if (!sessionKey) return { actor: { kind: "anonymous" }, account: null };
      const keyHash = tokenHash(sessionKey);
      const record = await dataSource
        .getRepository(SessionRecordEntity)
        .findOne({ where: { keyHash, revokedAt: IsNull() }, relations: { account: true } });
      if (!record?.account || record.expiresAt.getTime() <= now().getTime() || record.account.suspendedAt)
        return { actor: { kind: "anonymous" }, account: null };
      const account = record.account;
      return {
        actor: {
          kind: "account",
          accountId: account.id,
          role: account.role,
          emailVerified: account.emailVerifiedAt !== null,
          sessionKeyHash: keyHash,
          // An admin without a second factor may only set one up (and sign out) until it is on.
          ...(account.role === "admin" && !account.totpOnAt ? { secondFactorSetUpNeeded: true as const } : {}),
        },
        account,
      };
    },

    /** Ends this session for good: the stored record is revoked, so the old cookie no longer works. */
    async signOut(actor: Actor): Promise<void> {
      if (actor.kind !== "account") return;
      await dataSource.getRepository(SessionRecordEntity).update({ keyHash: actor.sessionKeyHash }, { revokedAt: now() });
    },

    async verifyEmail(input: VerifyEmailInput): Promise<{ verified: true }> {
      await dataSource.transaction(async (manager) => {
        const token = await consumeToken(manager, input.token, "verify_email");
        await manager.getRepository(AccountEntity).update({ id: token.accountId, emailVerifiedAt: IsNull() }, { emailVerifiedAt: now() });
      });
      return { verified: true };
    },

    async resendVerification(actor: Actor): Promise<void> {
      const signedIn = requireSignedIn(actor);
      const account = await accounts().findOneByOrFail({ id: signedIn.accountId });
      if (account.emailVerifiedAt) throw new Conflict("Your e-mail is already confirmed.", "already_verified");
      await dataSource.transaction(async (manager) => {
        const token = await issueToken(manager, account.id, "verify_email", VERIFY_HOURS);
        await mail.queue(
          manager,
          "verify_email",
          verificationMail(account.email, account.displayName, `${config.publicUrl}/verify-email?token=${token}`),
        );
      });
    },

    /**
     * Answers the same, after the same work, whether or not the address has an account: the request
     * only hands the lookup, the link and the e-mail to background work, so its answer time says
     * nothing about the account. A link is mailed only when there is one.
     */
    requestPasswordReset(input: PasswordResetRequestInput): void {
      background.run("reset_password", async () => {
        const account = await accounts().findOne({ where: { email: input.email } });
        if (!account) return;
        await dataSource.transaction(async (manager) => {
          const token = await issueToken(manager, account.id, "reset_password", RESET_HOURS);
          await mail.queue(
            manager,
            "password_reset",
            passwordResetMail(account.email, account.displayName, `${config.publicUrl}/reset-password?token=${token}`),
          );
        });
      });
    },

    /** Sets a new password from a mailed token, ends every open session and spends other reset links. */
    async resetPassword(input: PasswordResetInput): Promise<void> {
      if (isCommonPassword(input.password)) throw new Invalid(COMMON_PASSWORD_MESSAGE, { password: COMMON_PASSWORD_MESSAGE });
      const passwordHash = await hashPassword(input.password, config.bcryptCost);
      await dataSource.transaction(async (manager) => {
        const token = await consumeToken(manager, input.token, "reset_password");
        const at = now();
        const account = await manager.getRepository(AccountEntity).findOneByOrFail({ id: token.accountId });
        // The link reached the inbox, which also proves the address.
        await manager
          .getRepository(AccountEntity)
          .update({ id: account.id }, { passwordHash, emailVerifiedAt: account.emailVerifiedAt ?? at });
        await manager.getRepository(SessionRecordEntity).update({ accountId: account.id, revokedAt: IsNull() }, { revokedAt: at });
        await manager
          .getRepository(EmailTokenEntity)
          .update({ accountId: account.id, purpose: "reset_password", usedAt: IsNull() }, { usedAt: at });
      });
    },

    async currentAccount(actor: Actor): Promise<Account | null> {
      if (actor.kind !== "account") return null;
      const entity = await accounts().findOneBy({ id: actor.accountId });
      return entity ? toAccount(entity) : null;
    },

    /** A sawyer's own yard profile. */
    async ownYard(actor: Actor): Promise<Account> {
      const sawyer = requireRole(actor, "sawyer");
      return toAccount(await accounts().findOneByOrFail({ id: sawyer.accountId }));
    },

    /** Changes a yard's name or pickup town: its own sawyer, or an admin. */
    async updateYard(actor: Actor, sawyerId: string, input: YardProfileUpdateInput): Promise<Account> {
      const signedIn = requireRole(actor, "sawyer", "admin");
      if (signedIn.role === "sawyer" && signedIn.accountId !== sawyerId) throw new Forbidden("You can only change your own yard.");
      const yard = await accounts().findOneBy({ id: sawyerId, role: "sawyer" });
      if (!yard) throw new NotFound("No yard with that id.");
      await dataSource.transaction(async (manager) => {
        await manager.getRepository(AccountEntity).update(
          { id: yard.id },
          {
            ...input,
            ...(input.pickupTown !== undefined ? pickupPosition(input.pickupTown) : {}),
            // The page's address follows the name (an old link to the page then finds nothing).
            ...(input.yardName !== undefined ? { yardSlug: await freeYardSlug(manager, input.yardName, yard.id) } : {}),
          },
        );
        await deps.events?.emitSerial("yardChanged", { manager, sawyerId: yard.id });
        // An admin changing someone's yard is an admin action: audited in the same transaction.
        if (signedIn.role === "admin") {
          const before = Object.fromEntries(Object.keys(input).map((key) => [key, yard[key as keyof typeof yard] ?? null]));
          await recordAudit(
            manager,
            signedIn,
            { action: "yard.update", targetKind: "account", targetId: yard.id, before, after: input },
            now(),
          );
        }
      });
      return toAccount(await accounts().findOneByOrFail({ id: yard.id }));
    },
  };
}

export type AccountService = ReturnType<typeof createAccountService>;
