import { createHash } from "node:crypto";
import { setTimeout as sleep } from "node:timers/promises";
import type { NextFunction, Request, RequestHandler, Response } from "express";
import { RateLimiterMemory, RateLimiterMySQL, RateLimiterRes } from "rate-limiter-flexible";
import type { DataSource } from "typeorm";
import type { AppConfig } from "../config.ts";
import { TooManyRequests } from "../errors.ts";
import type { OwnerNotices, SignInAttempt } from "../services/account-service.ts";
import { sessionOf } from "./context.ts";

/**
 * Limits on sign-in and password reset, counted in MariaDB (rate-limiter-flexible's MySQL store,
 * table `rate_limit`) so that every API instance sees the same counts. Each store limiter has an
 * in-memory twin that takes over, per instance, while the database does not answer.
 *
 * Sign-in is limited so that an attacker cannot lock the owner out:
 * - per address, failed tries across accounts (SIGN_IN_LIMIT_PER_IP): that address gets 429;
 * - per account AND address, failed tries (SIGN_IN_LIMIT_PER_ACCOUNT): that address gets 429 for
 *   that account only — the owner elsewhere is not touched;
 * - per account, failed tries from all addresses are counted but never blocked: past
 *   SIGN_IN_SLOW_AFTER every try for the account waits (1×, 2×, 4×, at most 8× SIGN_IN_SLOWDOWN_MS)
 *   before its password is checked, except from an address that signed in to the account before,
 *   and the account service e-mails the owner (once an hour).
 * Every try is counted before the password is checked (so parallel tries cannot slip past a
 * limit) and handed back when the password was right.
 *
 * Codes of the second factor (the sign-in's code step, its set-up and removal) are counted the same
 * way, per account (SECOND_FACTOR_LIMIT_PER_ACCOUNT wrong codes in 15 minutes, from any address, then
 * 429 for that account's codes: a six-digit code cannot be guessed in a few tries) and per address
 * (SIGN_IN_LIMIT_PER_IP). A right code clears the account's count. Someone who has the password can
 * hold the code step shut for a while this way, never open it.
 */

const RATE_LIMIT_TABLE = "rate_limit";
/** How long an address that signed in to an account counts as known to it. */
const KNOWN_ADDRESS_SECONDS = 30 * 86_400;
/** An owner is told about failed sign-ins (or a join with their address) at most this often. */
const NOTICE_INTERVAL_SECONDS = 3_600;
const RESET_ACCOUNT_WINDOW_SECONDS = 3_600;
/** The per-account counter never blocks: it only counts. */
const COUNT_ONLY = 1_000_000_000;

/** The client's address as the socket (or, in production, the one trusted proxy) gives it; IPv4 without its IPv6 prefix. */
function clientAddress(req: Request): string {
  const address = req.ip ?? req.socket.remoteAddress ?? "unknown";
  return address.startsWith("::ffff:") ? address.slice(7) : address;
}

/** Accounts are counted by a hash of the address as the schema normalises it: no e-mail addresses in the limit table. */
function accountKey(email: unknown): string {
  const normalised = typeof email === "string" ? email.trim().toLowerCase() : "";
  return createHash("sha256").update(normalised).digest("base64url").slice(0, 32);
}

const attempts = new WeakMap<Request, SignInAttempt>();
const codeAttempts = new WeakMap<Request, { succeeded(): Promise<void> }>();

/** The code try the `second_factor` limit step admitted for this request: told when the code was right. */
export function secondFactorAttemptOf(req: Request): { succeeded(): Promise<void> } | undefined {
  return codeAttempts.get(req);
}

/** The sign-in try the `sign_in` limit step admitted for this request (none outside that step, e.g. in unit tests). */
export function signInAttemptOf(req: Request): SignInAttempt | undefined {
  return attempts.get(req);
}

function minutesText(ms: number): string {
  const minutes = Math.max(1, Math.ceil(ms / 60_000));
  return minutes === 1 ? "a minute" : `${minutes} minutes`;
}

export interface RateLimitDependencies {
  limits: AppConfig["limits"];
  dataSource: DataSource;
  log: { error(object: object, message: string): void };
}

export function createRateLimits({ limits, dataSource, log }: RateLimitDependencies) {
  // The primary's pool: the driver's own, or with a read replica (db/data-source.ts) the MASTER node of its pool cluster.
  const driver = dataSource.driver as unknown as { pool?: unknown; poolCluster?: { of(pattern: string): unknown } };
  const pool = driver.pool ?? driver.poolCluster?.of("MASTER");
  if (!pool) throw new Error("rate limits: the data source must be initialised first (its connection pool is the limit store)");
  const dbName = dataSource.options.database as string;
  const windowSeconds = Math.round(limits.windowMs / 1000);
  let first = true;
  const limiter = (keyPrefix: string, points: number, duration: number) => {
    const options = {
      storeClient: pool,
      storeType: "pool",
      dbName,
      tableName: RATE_LIMIT_TABLE,
      tableCreated: true,
      keyPrefix,
      points,
      duration,
      insuranceLimiter: new RateLimiterMemory({ keyPrefix, points, duration }),
      // One limiter is enough to clear the shared table's expired rows (every 5 minutes, the library's own timer).
      clearExpiredByTimeout: first,
    };
    first = false;
    return new RateLimiterMySQL(options);
  };

  const signInAddress = limiter("signin_ip", limits.signInPerIp, windowSeconds);
  const signInPair = limiter("signin_pair", limits.signInPerPair, windowSeconds);
  const signInAccount = limiter("signin_account", COUNT_ONLY, windowSeconds);
  const knownAddress = limiter("signin_known", 1, KNOWN_ADDRESS_SECONDS);
  const ownerNotice = limiter("owner_notice", 1, NOTICE_INTERVAL_SECONDS);
  const codeAccount = limiter("code_account", limits.codePerAccount, windowSeconds);
  const codeAddress = limiter("code_ip", limits.signInPerIp, windowSeconds);
  const resetAddress = limiter("reset_ip", limits.resetPerIp, windowSeconds);
  const resetAccount = limiter("reset_account", limits.resetPerAccount, RESET_ACCOUNT_WINDOW_SECONDS);

  /** Runs a store call whose failure must not fail the request (the insurance limiter covers counting). */
  const quietly = async <T>(what: string, call: () => Promise<T>): Promise<T | null> => {
    try {
      return await call();
    } catch (error) {
      if (!(error instanceof RateLimiterRes)) log.error({ err: error, what }, "rate limit store call failed");
      return null;
    }
  };

  /** Consumes a point; a refusal becomes 429 with Retry-After. */
  async function take(res: Response, limiterOf: RateLimiterMySQL, key: string, message: (wait: string) => string): Promise<void> {
    try {
      await limiterOf.consume(key);
    } catch (rejection) {
      if (!(rejection instanceof RateLimiterRes)) throw rejection;
      res.setHeader("retry-after", String(Math.max(1, Math.ceil(rejection.msBeforeNext / 1000))));
      throw new TooManyRequests(message(minutesText(rejection.msBeforeNext)));
    }
  }

  const slowdownFor = (failuresBefore: number) =>
    limits.signInSlowdownMs * Math.min(8, 2 ** Math.max(0, failuresBefore - limits.signInSlowAfter));

  const admitSignIn: RequestHandler = async (req: Request, res: Response, next: NextFunction) => {
    try {
      const address = clientAddress(req);
      const account = accountKey((req.body as { email?: unknown } | undefined)?.email);
      const pair = `${account}|${address}`;
      await take(res, signInAddress, address, (wait) => `Too many failed sign-ins from your network. Try again in ${wait}.`);
      await take(
        res,
        signInPair,
        pair,
        (wait) => `Too many sign-in attempts for this account from here. Try again in ${wait}, or reset your password.`,
      );
      const counted = await quietly("count sign-in", () => signInAccount.consume(account));
      const failuresBefore = counted ? counted.consumedPoints - 1 : 0;
      // A hammered account slows down rather than locks: every try waits, except from an address it signed in from before.
      if (failuresBefore >= limits.signInSlowAfter && !(await quietly("known address", () => knownAddress.get(pair)))) {
        await sleep(slowdownFor(failuresBefore));
      }
      attempts.set(req, {
        async succeeded() {
          await Promise.all([
            quietly("reward address", () => signInAddress.reward(address)),
            quietly("reward account", () => signInAccount.reward(account)),
            quietly("clear pair", () => signInPair.delete(pair)),
            quietly("remember address", () => knownAddress.set(pair, 1, KNOWN_ADDRESS_SECONDS)),
          ]);
        },
        async failed() {
          const failures = failuresBefore + 1;
          return { failures, hammered: failures >= limits.signInSlowAfter };
        },
      });
      next();
    } catch (error) {
      next(error);
    }
  };

  const admitCode: RequestHandler = async (req: Request, res: Response, next: NextFunction) => {
    try {
      const address = clientAddress(req);
      // Whose code: the signed-in account's (set-up, removal) or the one whose password was just right (sign-in).
      const actor = req.actor;
      const accountId = actor?.kind === "account" ? actor.accountId : sessionOf(req).pending?.accountId;
      await take(res, codeAddress, address, (wait) => `Too many wrong codes from your network. Try again in ${wait}.`);
      if (accountId) await take(res, codeAccount, accountId, (wait) => `Too many wrong codes for this account. Try again in ${wait}.`);
      codeAttempts.set(req, {
        async succeeded() {
          await Promise.all([
            quietly("reward code address", () => codeAddress.reward(address)),
            accountId ? quietly("clear code account", () => codeAccount.delete(accountId)) : null,
          ]);
        },
      });
      next();
    } catch (error) {
      next(error);
    }
  };

  const admitReset: RequestHandler = async (req: Request, res: Response, next: NextFunction) => {
    try {
      const message = (wait: string) => `Too many reset requests. Try again in ${wait}.`;
      await take(res, resetAddress, clientAddress(req), message);
      await take(res, resetAccount, accountKey((req.body as { email?: unknown } | undefined)?.email), message);
      next();
    } catch (error) {
      next(error);
    }
  };

  const notices: OwnerNotices = {
    async firstInAWhile(kind, email) {
      return (await quietly("owner notice", () => ownerNotice.consume(`${kind}|${accountKey(email)}`))) !== null;
    },
  };

  return { steps: { sign_in: [admitSignIn], password_reset: [admitReset], second_factor: [admitCode] }, notices };
}
