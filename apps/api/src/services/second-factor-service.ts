import { randomInt } from "node:crypto";
import {
  RECOVERY_CODE_COUNT,
  TOTP_CODE_PATTERN,
  type SecondFactorRecoveryCodes,
  type SecondFactorRemovalInput,
  type SecondFactorSetUp,
  type SecondFactorStatus,
} from "@grainyard/contracts";
import { generate, generateSecret, generateURI, verify } from "otplib";
import QRCode from "qrcode";
import { IsNull, type DataSource, type EntityManager } from "typeorm";
import type { AppConfig } from "../config.ts";
import { AccountEntity, RecoveryCodeEntity } from "../entities/index.ts";
import { Conflict, Forbidden, Invalid, Unauthorized } from "../errors.ts";
import { recoveryCodeUsedMail, secondFactorOffMail, secondFactorOnMail } from "../mail-templates-security.ts";
import { recordAudit } from "./audit-log.ts";
import { requireSignedIn, type Actor, type SignedInActor } from "./actor.ts";
import type { MailQueue } from "./mail-outbox.ts";
import { hashPassword, passwordMatches } from "./passwords.ts";

/**
 * The second factor (RFC 6238 TOTP through otplib: SHA-1, six digits, 30-second steps, the defaults
 * every authenticator app reads from the QR code). Offered to sawyers, required for admins.
 *
 * - A code is taken for the current step or one step either side (a phone's clock drifts), and only
 *   for a step later than the account's last accepted one, so a code (or an earlier one) is never
 *   taken twice. The account row is locked while a code is checked, so two tries cannot both pass.
 * - Ten recovery codes are made at set-up, shown once, kept as bcrypt hashes; each works once.
 * - Set-up, removal and the use of a recovery code are audited and e-mailed in their transaction.
 */

const PERIOD_SECONDS = 30;
const ISSUER = "Grainyard";
/** How long the sign-in waits for the code after a right password. */
export const SECOND_STEP_MINUTES = 5;
/** Recovery codes avoid look-alikes (0/o, 1/l/i). */
const RECOVERY_ALPHABET = "abcdefghjkmnpqrstuvwxyz23456789";

/** The current six-digit code of a secret at a moment (what an authenticator app shows then). */
export function codeAt(secret: string, at: Date): Promise<string> {
  return generate({ secret, epoch: Math.floor(at.getTime() / 1000), period: PERIOD_SECONDS });
}

/** A new random secret (160 bits, Base32), as otplib makes it. */
export function newTotpSecret(): string {
  return generateSecret();
}

/** The otpauth:// address an authenticator app reads from the QR code. */
export function otpauthUrl(secret: string, email: string): string {
  return generateURI({ issuer: ISSUER, label: email, secret, period: PERIOD_SECONDS });
}

function newRecoveryCode(): string {
  const letters = Array.from({ length: 10 }, () => RECOVERY_ALPHABET[randomInt(RECOVERY_ALPHABET.length)]).join("");
  return `${letters.slice(0, 5)}-${letters.slice(5)}`;
}

/** A recovery code as stored and compared: lower case, no dash. */
const recoveryKey = (code: string) => code.replace(/[\s-]/g, "").toLowerCase();

export interface SecondFactorDependencies {
  dataSource: DataSource;
  mail: MailQueue;
  config: Pick<AppConfig, "bcryptCost" | "publicUrl">;
  /**
   * The time codes are checked against: the real clock of the authenticator on the person's phone
   * (tests inject theirs). The end-to-end stack's movable clock is not used here: moving it days ahead
   * for a hold period must not make every phone's code wrong.
   */
  now?: () => Date;
}

/** How the code was given: from the app, or a recovery code (with the number left). */
export type CodeUse = { kind: "app" } | { kind: "recovery"; left: number };

export function createSecondFactorService(deps: SecondFactorDependencies) {
  const { dataSource, mail, config } = deps;
  const now = deps.now ?? (() => new Date());
  const securityLink = `${config.publicUrl}/account/security`;

  /** Sawyers and admins (an admin without a second factor too: this is the way to one). */
  function requireEligible(actor: Actor): SignedInActor {
    const signedIn = requireSignedIn(actor);
    if (signedIn.role === "buyer") throw new Forbidden("A second factor is for sawyer and admin accounts.");
    return signedIn;
  }

  async function statusOf(manager: EntityManager, account: AccountEntity): Promise<SecondFactorStatus> {
    const left = account.totpOnAt
      ? await manager.getRepository(RecoveryCodeEntity).countBy({ accountId: account.id, usedAt: IsNull() })
      : 0;
    return {
      on: account.totpOnAt !== null,
      since: account.totpOnAt?.toISOString() ?? null,
      required: account.role === "admin",
      recoveryCodesLeft: left,
    };
  }

  const lockedAccount = (manager: EntityManager, id: string) =>
    manager.getRepository(AccountEntity).findOneOrFail({ where: { id }, lock: { mode: "pessimistic_write" } });

  /** A code from the app against a secret at `at`: its time step, or why not. */
  async function appCodeStep(secret: string, code: string, at: Date): Promise<number | null> {
    const result = await verify({
      secret,
      token: code,
      epoch: Math.floor(at.getTime() / 1000),
      period: PERIOD_SECONDS,
      epochTolerance: PERIOD_SECONDS,
    });
    return result.valid && "timeStep" in result ? result.timeStep : null;
  }

  const wrongCode = () =>
    new Invalid(
      "That code is not right. Enter the 6-digit code your app shows now, or an unused recovery code.",
      { code: "That code is not right." },
      "second_factor_wrong",
    );

  /**
   * Takes a code for an account whose row the caller has locked in this transaction: a code from the
   * app (current step ± 1, later than the last accepted step) or an unused recovery code (spent).
   */
  async function takeCode(manager: EntityManager, account: AccountEntity, code: string): Promise<CodeUse> {
    if (!account.totpSecret) throw new Conflict("This account has no second factor on.", "second_factor_off");
    if (TOTP_CODE_PATTERN.test(code)) {
      const step = await appCodeStep(account.totpSecret, code, now());
      if (step === null) throw wrongCode();
      if (account.totpLastStep !== null && step <= account.totpLastStep)
        throw new Conflict("That code was used already. Wait for your app to show the next one.", "second_factor_used");
      await manager.getRepository(AccountEntity).update({ id: account.id }, { totpLastStep: step });
      account.totpLastStep = step;
      return { kind: "app" };
    }
    const codes = manager.getRepository(RecoveryCodeEntity);
    const unused = await codes.findBy({ accountId: account.id, usedAt: IsNull() });
    for (const candidate of unused) {
      if (!(await passwordMatches(recoveryKey(code), candidate.codeHash))) continue;
      const spent = await codes.update({ id: candidate.id, usedAt: IsNull() }, { usedAt: now() });
      if (spent.affected !== 1) break;
      return { kind: "recovery", left: unused.length - 1 };
    }
    throw wrongCode();
  }

  return {
    async status(actor: Actor): Promise<SecondFactorStatus> {
      const signedIn = requireEligible(actor);
      return statusOf(dataSource.manager, await dataSource.getRepository(AccountEntity).findOneByOrFail({ id: signedIn.accountId }));
    },

    /** A new secret for the set-up (replacing one not yet confirmed); nothing changes for sign-in until it is confirmed. */
    async startSetUp(actor: Actor): Promise<SecondFactorSetUp> {
      const signedIn = requireEligible(actor);
      const secret = newTotpSecret();
      const email = await dataSource.transaction(async (manager) => {
        const account = await lockedAccount(manager, signedIn.accountId);
        if (account.totpOnAt)
          throw new Conflict("Your second factor is on already. Remove it first to move it to a new phone.", "second_factor_on");
        await manager.getRepository(AccountEntity).update({ id: account.id }, { totpPendingSecret: secret });
        return account.email;
      });
      const url = otpauthUrl(secret, email);
      const svg = await QRCode.toString(url, { type: "svg", margin: 1, errorCorrectionLevel: "M" });
      return {
        secret: secret.match(/.{1,4}/g)!.join(" "),
        otpauthUrl: url,
        qrCode: `data:image/svg+xml;base64,${Buffer.from(svg).toString("base64")}`,
      };
    },

    /** The first code from the app switches it on; answers ten new recovery codes (shown this once; stored hashed). */
    async confirmSetUp(actor: Actor, code: string): Promise<SecondFactorRecoveryCodes> {
      const signedIn = requireEligible(actor);
      // Hashing ten codes takes a while at production cost: before the transaction, not inside it.
      const recoveryCodes = Array.from({ length: RECOVERY_CODE_COUNT }, newRecoveryCode);
      const hashes = await Promise.all(recoveryCodes.map((recovery) => hashPassword(recoveryKey(recovery), config.bcryptCost)));
      const status = await dataSource.transaction(async (manager) => {
        const account = await lockedAccount(manager, signedIn.accountId);
        if (account.totpOnAt) throw new Conflict("Your second factor is on already.", "second_factor_on");
        if (!account.totpPendingSecret)
          throw new Conflict("Start the set-up first: it shows the QR code to scan.", "second_factor_not_started");
        const step = await appCodeStep(account.totpPendingSecret, code, now());
        if (step === null)
          throw new Invalid(
            "That code does not match. Check that the app scanned this page's QR code and that your phone's clock is right.",
            { code: "That code does not match." },
            "second_factor_wrong",
          );
        const at = now();
        await manager
          .getRepository(AccountEntity)
          .update({ id: account.id }, { totpSecret: account.totpPendingSecret, totpPendingSecret: null, totpOnAt: at, totpLastStep: step });
        await manager.getRepository(RecoveryCodeEntity).delete({ accountId: account.id });
        await manager
          .getRepository(RecoveryCodeEntity)
          .insert(hashes.map((codeHash) => ({ accountId: account.id, codeHash, usedAt: null })));
        await recordAudit(manager, signedIn, { action: "second_factor.on", targetKind: "account", targetId: account.id }, at);
        await mail.queue(manager, "second_factor_on", secondFactorOnMail(account.email, account.displayName, securityLink));
        return statusOf(manager, { ...account, totpOnAt: at } as AccountEntity);
      });
      return { status, recoveryCodes };
    },

    /** Off, with the password and a current code (or a recovery code); an admin must set it up again before using the desk. */
    async remove(actor: Actor, input: SecondFactorRemovalInput): Promise<SecondFactorStatus> {
      const signedIn = requireEligible(actor);
      return dataSource.transaction(async (manager) => {
        const account = await lockedAccount(manager, signedIn.accountId);
        if (!account.totpOnAt) throw new Conflict("Your account has no second factor to remove.", "second_factor_off");
        if (!(await passwordMatches(input.password, account.passwordHash)))
          throw new Invalid("That password is not right.", { password: "That password is not right." }, "wrong_password");
        await takeCode(manager, account, input.code);
        const at = now();
        await manager
          .getRepository(AccountEntity)
          .update({ id: account.id }, { totpSecret: null, totpPendingSecret: null, totpOnAt: null, totpLastStep: null });
        await manager.getRepository(RecoveryCodeEntity).delete({ accountId: account.id });
        await recordAudit(manager, signedIn, { action: "second_factor.off", targetKind: "account", targetId: account.id }, at);
        await mail.queue(
          manager,
          "second_factor_off",
          secondFactorOffMail(account.email, account.displayName, securityLink, account.role === "admin"),
        );
        return statusOf(manager, { ...account, totpOnAt: null } as AccountEntity);
      });
    },

    /**
     * The second sign-in step for the account whose password was right: takes the code, then
     * `openSession` (in the same transaction, so a refused code opens nothing). A recovery code's use is
     * audited and e-mailed.
     */
    async completeSignIn<T>(
      accountId: string,
      code: string,
      openSession: (manager: EntityManager, account: AccountEntity) => Promise<T>,
    ): Promise<{ opened: T; account: AccountEntity; used: CodeUse }> {
      return dataSource.transaction(async (manager) => {
        const account = await manager
          .getRepository(AccountEntity)
          .findOne({ where: { id: accountId }, lock: { mode: "pessimistic_write" } });
        if (!account?.totpOnAt) throw new Unauthorized("Sign in again with your password.", "second_step_expired");
        if (account.suspendedAt)
          throw new Forbidden(
            "This account is suspended, so it cannot sign in. Reply to the e-mail we sent you to talk to us about it.",
            "account_suspended",
          );
        const used = await takeCode(manager, account, code);
        if (used.kind === "recovery") {
          const actor: SignedInActor = {
            kind: "account",
            accountId: account.id,
            role: account.role,
            emailVerified: true,
            sessionKeyHash: "",
          };
          await recordAudit(
            manager,
            actor,
            { action: "second_factor.recovery_code_used", targetKind: "account", targetId: account.id, after: { left: used.left } },
            now(),
          );
          await mail.queue(
            manager,
            "recovery_code_used",
            recoveryCodeUsedMail(account.email, account.displayName, used.left, securityLink),
          );
        }
        return { opened: await openSession(manager, account), account, used };
      });
    },
  };
}

export type SecondFactorService = ReturnType<typeof createSecondFactorService>;
