import { hostname } from "node:os";
import { z } from "zod";

/**
 * Everything the API needs from outside comes from environment variables, read and checked once
 * here. The same names configure the local stack, the tests and the Docker image.
 */
const environmentSchema = z.object({
  NODE_ENV: z.enum(["production", "development", "test"]).default("development"),
  PORT: z.coerce.number().int().min(1).max(65535).default(5080),
  HOST: z.string().default("127.0.0.1"),
  PUBLIC_URL: z.url().default("http://127.0.0.1:5080"),
  SESSION_SECRET: z.string().min(32, "SESSION_SECRET must be at least 32 characters."),
  DATABASE_HOST: z.string().default("127.0.0.1"),
  DATABASE_PORT: z.coerce.number().int().default(3306),
  DATABASE_USER: z.string().default("grainyard"),
  DATABASE_PASSWORD: z.string().default(""),
  DATABASE_NAME: z.string().default("grainyard"),
  /** A MariaDB read replica of the primary (same user, password and database): the catalogue's public pages read from it. */
  DATABASE_REPLICA_HOST: z.string().optional(),
  DATABASE_REPLICA_PORT: z.coerce.number().int().optional(),
  S3_ENDPOINT: z.url().optional(),
  S3_REGION: z.string().default("us-east-1"),
  S3_BUCKET: z.string().default("grainyard-photos"),
  S3_ACCESS_KEY_ID: z.string().default(""),
  S3_SECRET_ACCESS_KEY: z.string().default(""),
  S3_FORCE_PATH_STYLE: z.enum(["true", "false"]).default("true"),
  SMTP_HOST: z.string().default("127.0.0.1"),
  SMTP_PORT: z.coerce.number().int().default(25),
  SMTP_SECURE: z.enum(["true", "false"]).default("false"),
  SMTP_USER: z.string().optional(),
  SMTP_PASSWORD: z.string().optional(),
  MAIL_FROM: z.string().default("Grainyard <hello@grainyard.test>"),
  /** Seconds before an undelivered e-mail's first retry; each further retry waits twice as long (at most an hour). */
  MAIL_RETRY_FIRST_SECONDS: z.coerce.number().int().min(1).max(3600).default(30),
  /** Delivery attempts before an e-mail is marked failed for the operator desk. */
  MAIL_MAX_ATTEMPTS: z.coerce.number().int().min(1).max(30).default(8),
  PAYMENTS_HOST: z.string().default("127.0.0.1"),
  PAYMENTS_PORT: z.coerce.number().int().default(443),
  PAYMENTS_PROTOCOL: z.enum(["http", "https"]).default("https"),
  PAYMENTS_SECRET_KEY: z.string().default("sk_test_grainyard_local"),
  PAYMENTS_WEBHOOK_SECRET: z.string().default("whsec_grainyard_local"),
  RESERVATION_MINUTES: z.coerce.number().int().min(1).max(240).default(15),
  TAX_RATE_BPS: z.coerce.number().int().min(0).max(5000).default(0),
  /** Days after hand-over when an order the buyer has not confirmed completes by itself. */
  AUTO_COMPLETE_DAYS: z.coerce.number().int().min(1).max(90).default(14),
  BCRYPT_COST: z.coerce.number().int().min(4).max(15).default(12),
  WEB_DIST: z.string().optional(),
  /** Development only: the web app's source folder; pages are rendered through Vite (hot reload). */
  WEB_DEV_ROOT: z.string().optional(),
  /** Development only: the port of Vite's hot-reload socket. */
  WEB_DEV_HMR_PORT: z.coerce.number().int().min(1).max(65535).optional(),
  LOG_LEVEL: z.enum(["fatal", "error", "warn", "info", "debug", "trace", "silent"]).default("info"),
  /** Failed sign-ins for one account from one address (15 minutes) before that address gets 429 for that account. */
  SIGN_IN_LIMIT_PER_ACCOUNT: z.coerce.number().int().min(1).default(5),
  /** Failed sign-ins from one address across accounts (15 minutes) before that address gets 429. */
  SIGN_IN_LIMIT_PER_IP: z.coerce.number().int().min(1).default(30),
  /** Failed sign-ins for one account from all addresses (15 minutes) after which its tries slow down and its owner is warned. */
  SIGN_IN_SLOW_AFTER: z.coerce.number().int().min(1).default(10),
  /** The first slow-down, ms; it doubles with each further failure, up to 8 times this. */
  SIGN_IN_SLOWDOWN_MS: z.coerce.number().int().min(0).max(10_000).default(1000),
  /** Wrong second-factor codes for one account (15 minutes, any address) before its codes get 429. */
  SECOND_FACTOR_LIMIT_PER_ACCOUNT: z.coerce.number().int().min(1).default(5),
  RESET_LIMIT_PER_ACCOUNT: z.coerce.number().int().min(1).default(3),
  RESET_LIMIT_PER_IP: z.coerce.number().int().min(1).default(20),
  CATALOGUE_CACHE: z.enum(["on", "off"]).default("on"),
  /** This API process's name in the `x-grainyard-instance` answer header (the machine's name and the process id by default). */
  GRAINYARD_INSTANCE: z
    .string()
    .regex(/^[\w.:-]{1,64}$/, "GRAINYARD_INSTANCE: letters, digits, '.', ':', '_' or '-', at most 64.")
    .optional(),
  /** "loopback": the client's address comes from X-Forwarded-For set by a load balancer on loopback (the local stack's HAProxy). */
  TRUST_PROXY: z.enum(["loopback"]).optional(),
  /** "1" gives the end-to-end API a clock the test can move forward (only with NODE_ENV=test). */
  GRAINYARD_TEST_CLOCK: z.enum(["0", "1"]).default("0"),
  /** Tests only: every scheduled job ticks this often (seconds) instead of its own period, so a test need not wait minutes. */
  JOB_EVERY_SECONDS: z.coerce.number().int().min(1).max(3600).optional(),
});

export interface AppConfig {
  environment: "production" | "development" | "test";
  port: number;
  host: string;
  publicUrl: string;
  sessionSecret: string;
  database: {
    host: string;
    port: number;
    user: string;
    password: string;
    database: string;
    /** A read replica for the catalogue, search, slab, yard and sitemap pages (db/read-replica.ts); null: the primary only. */
    replica: { host: string; port: number } | null;
  };
  storage: { endpoint?: string; region: string; bucket: string; accessKeyId: string; secretAccessKey: string; forcePathStyle: boolean };
  mail: { host: string; port: number; secure: boolean; user?: string; password?: string; from: string };
  /** The e-mail outbox's retries (see services/mail-outbox.ts). */
  outbox: { retryFirstMs: number; maxAttempts: number };
  payments: { host: string; port: number; protocol: "http" | "https"; secretKey: string; webhookSecret: string };
  checkout: { reservationMinutes: number; taxRateBps: number; autoCompleteDays: number };
  bcryptCost: number;
  webDist?: string;
  /** Vite in middleware mode instead of the built app (`npm run dev` only). */
  webDev?: { root: string; hmrPort?: number };
  logLevel: string;
  /** Short-lived cache of repeated catalogue searches (see catalogue-service.ts). */
  catalogueCache: boolean;
  /** This process's name among several API instances, sent on every answer (`x-grainyard-instance`). */
  instanceName: string;
  /** Which proxies' X-Forwarded-For to believe (Express's "trust proxy"); unset: one hop in production, none elsewhere. */
  trustProxy?: "loopback";
  /** A movable clock with POST /api/_test/clock: only ever true when NODE_ENV=test. */
  testClock: boolean;
  /** Tests only: one period for every scheduled job instead of each job's own (null: their own). */
  jobEveryMs: number | null;
  limits: {
    /** Failed sign-ins per account and address pair before 429 (that address, that account only). */
    signInPerPair: number;
    /** Failed sign-ins per address across accounts before 429. */
    signInPerIp: number;
    /** Failed sign-ins per account (any address) after which its tries slow down and the owner is e-mailed. */
    signInSlowAfter: number;
    signInSlowdownMs: number;
    /** Wrong second-factor codes per account (any address) before its codes get 429. */
    codePerAccount: number;
    resetPerAccount: number;
    resetPerIp: number;
    windowMs: number;
  };
}

export class ConfigError extends Error {}

export function loadConfig(environment: NodeJS.ProcessEnv = process.env): AppConfig {
  const parsed = environmentSchema.safeParse(environment);
  if (!parsed.success) {
    const first = parsed.error.issues[0]!;
    throw new ConfigError(`configuration: ${first.path.join(".")}: ${first.message}`);
  }
  const env = parsed.data;
  // Cost 12 or more outside tests: weaker hashing is only for fast test runs.
  if (env.NODE_ENV !== "test" && env.BCRYPT_COST < 12) {
    throw new ConfigError("configuration: BCRYPT_COST below 12 is allowed only when NODE_ENV=test.");
  }
  if (env.WEB_DEV_ROOT && env.NODE_ENV !== "development") {
    throw new ConfigError("configuration: WEB_DEV_ROOT (Vite inside the API) is allowed only when NODE_ENV=development.");
  }
  if (env.JOB_EVERY_SECONDS !== undefined && env.NODE_ENV !== "test") {
    throw new ConfigError("configuration: JOB_EVERY_SECONDS is allowed only when NODE_ENV=test.");
  }
  if (env.GRAINYARD_TEST_CLOCK === "1" && env.NODE_ENV !== "test") {
    throw new ConfigError("configuration: GRAINYARD_TEST_CLOCK is allowed only when NODE_ENV=test.");
  }
  return {
    environment: env.NODE_ENV,
    port: env.PORT,
    host: env.HOST,
    publicUrl: env.PUBLIC_URL.replace(/\/$/, ""),
    sessionSecret: env.SESSION_SECRET,
    database: {
      host: env.DATABASE_HOST,
      port: env.DATABASE_PORT,
      user: env.DATABASE_USER,
      password: env.DATABASE_PASSWORD,
      database: env.DATABASE_NAME,
      replica: env.DATABASE_REPLICA_HOST ? { host: env.DATABASE_REPLICA_HOST, port: env.DATABASE_REPLICA_PORT ?? env.DATABASE_PORT } : null,
    },
    storage: {
      endpoint: env.S3_ENDPOINT,
      region: env.S3_REGION,
      bucket: env.S3_BUCKET,
      accessKeyId: env.S3_ACCESS_KEY_ID,
      secretAccessKey: env.S3_SECRET_ACCESS_KEY,
      forcePathStyle: env.S3_FORCE_PATH_STYLE === "true",
    },
    mail: {
      host: env.SMTP_HOST,
      port: env.SMTP_PORT,
      secure: env.SMTP_SECURE === "true",
      user: env.SMTP_USER,
      password: env.SMTP_PASSWORD,
      from: env.MAIL_FROM,
    },
    outbox: { retryFirstMs: env.MAIL_RETRY_FIRST_SECONDS * 1000, maxAttempts: env.MAIL_MAX_ATTEMPTS },
    payments: {
      host: env.PAYMENTS_HOST,
      port: env.PAYMENTS_PORT,
      protocol: env.PAYMENTS_PROTOCOL,
      secretKey: env.PAYMENTS_SECRET_KEY,
      webhookSecret: env.PAYMENTS_WEBHOOK_SECRET,
    },
    checkout: { reservationMinutes: env.RESERVATION_MINUTES, taxRateBps: env.TAX_RATE_BPS, autoCompleteDays: env.AUTO_COMPLETE_DAYS },
    bcryptCost: env.BCRYPT_COST,
    webDist: env.WEB_DIST,
    webDev: env.WEB_DEV_ROOT ? { root: env.WEB_DEV_ROOT, hmrPort: env.WEB_DEV_HMR_PORT } : undefined,
    logLevel: env.LOG_LEVEL,
    catalogueCache: env.CATALOGUE_CACHE === "on",
    instanceName: env.GRAINYARD_INSTANCE ?? `${hostname()}-${process.pid}`,
    trustProxy: env.TRUST_PROXY,
    testClock: env.NODE_ENV === "test" && env.GRAINYARD_TEST_CLOCK === "1",
    jobEveryMs: env.JOB_EVERY_SECONDS === undefined ? null : env.JOB_EVERY_SECONDS * 1000,
    limits: {
      signInPerPair: env.SIGN_IN_LIMIT_PER_ACCOUNT,
      signInPerIp: env.SIGN_IN_LIMIT_PER_IP,
      signInSlowAfter: env.SIGN_IN_SLOW_AFTER,
      signInSlowdownMs: env.SIGN_IN_SLOWDOWN_MS,
      codePerAccount: env.SECOND_FACTOR_LIMIT_PER_ACCOUNT,
      resetPerAccount: env.RESET_LIMIT_PER_ACCOUNT,
      resetPerIp: env.RESET_LIMIT_PER_IP,
      windowMs: 15 * 60 * 1000,
    },
  };
}
