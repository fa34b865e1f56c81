import { randomBytes } from "node:crypto";
import { existsSync, mkdirSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import type { Server } from "node:http";
import { join, relative } from "node:path";
import { createPaymentsFakeApp } from "@grainyard/payments-fake";
import { say, StackError } from "./log.ts";
import { startMailSink } from "./mail-sink.ts";
import { startMariadb, stopLeftoverMariadb, type RunningMariadb } from "./mariadb.ts";
import { startObjectStorage } from "./object-storage.ts";
import { assertPortFree } from "./ports.ts";
import { repoRoot, type Profile } from "./profile.ts";

interface Secrets {
  sessionSecret: string;
  databasePassword: string;
  paymentsSecretKey: string;
  paymentsWebhookSecret: string;
}

/** Secrets generated once on first start and kept in the data folder (never committed). */
function secretsFor(dataDir: string): Secrets {
  const file = join(dataDir, "secrets.json");
  const stored = existsSync(file) ? (JSON.parse(readFileSync(file, "utf8")) as Partial<Secrets>) : {};
  const secrets: Secrets = {
    sessionSecret: stored.sessionSecret ?? randomBytes(32).toString("hex"),
    databasePassword: stored.databasePassword ?? randomBytes(18).toString("base64url"),
    paymentsSecretKey: stored.paymentsSecretKey ?? `sk_test_${randomBytes(12).toString("hex")}`,
    paymentsWebhookSecret: stored.paymentsWebhookSecret ?? `whsec_${randomBytes(18).toString("hex")}`,
  };
  if (Object.keys(stored).length === Object.keys(secrets).length) return secrets;
  mkdirSync(dataDir, { recursive: true });
  writeFileSync(file, JSON.stringify(secrets, null, 2), { mode: 0o600 });
  return secrets;
}

export interface RunningStack {
  profile: Profile;
  mariadb: RunningMariadb;
  /** The app's database password (the same on every MariaDB the runner starts). */
  databasePassword: string;
  inboxUrl: string;
  /** Environment for the API (and its CLI commands) pointed at this stack. */
  apiEnvironment(database: string, extra?: Record<string, string>): Record<string, string>;
  stop(): Promise<void>;
}

/**
 * Starts the services the API needs, all on 127.0.0.1: MariaDB (a child process), and, inside
 * this process, the S3 fake, the mail sink and the payments fake. If any step fails, what already
 * started is stopped before the error goes up.
 */
export async function startStack(
  profile: Profile,
  options: {
    fresh: boolean;
    extraPorts?: { port: number; purpose: string }[];
    signal?: AbortSignal;
    /** The primary keeps a binary log with GTIDs for a read replica (GRAINYARD_REPLICA=1). */
    replicated?: boolean;
    /** Registers how to stop a child process the moment it exists (see Lifecycle.onStop). */
    track?: (name: string, stop: () => Promise<void>) => void;
  },
): Promise<RunningStack> {
  await stopLeftoverMariadb(join(profile.dataDir, "mariadb"));
  if (options.fresh) {
    const outside = relative(profile.dataDir, repoRoot);
    if (profile.dataDir === "/" || outside === "" || !outside.startsWith(".."))
      throw new StackError(`refusing to wipe ${profile.dataDir} for a fresh start: point GRAINYARD_DATA_DIR at a folder of its own.`);
    rmSync(profile.dataDir, { recursive: true, force: true });
  }
  mkdirSync(profile.dataDir, { recursive: true });
  const { ports } = profile;
  const wanted = [
    { port: ports.app, purpose: "Grainyard web and API" },
    { port: ports.inbox, purpose: "mail inbox page" },
    { port: ports.payments, purpose: "payments fake" },
    { port: ports.s3, purpose: "S3 fake" },
    { port: ports.smtp, purpose: "SMTP mail sink" },
    { port: ports.mariadb, purpose: "MariaDB" },
    ...(options.extraPorts ?? []),
  ];
  for (const { port, purpose } of wanted) await assertPortFree(port, purpose);

  const secrets = secretsFor(profile.dataDir);
  // Each service is stopped once, whoever asks first: the runner's lifecycle (told through
  // `track`, with the service's name) or this stack's own stop.
  const stoppers: (() => Promise<void>)[] = [];
  const add = (name: string, stop: () => Promise<void>) => {
    let stopping: Promise<void> | undefined;
    const once = () => (stopping ??= stop());
    stoppers.push(once);
    options.track?.(name, once);
  };
  const stopAll = async () => {
    for (const stop of [...stoppers].reverse()) await stop().catch(() => undefined);
  };
  try {
    say(`starting MariaDB on 127.0.0.1:${ports.mariadb}…`);
    const mariadb = await startMariadb({
      dir: join(profile.dataDir, "mariadb"),
      port: ports.mariadb,
      appPassword: secrets.databasePassword,
      signal: options.signal,
      track: options.track,
      ...(options.replicated ? { replication: { role: "primary", serverId: 1 } as const } : {}),
    });
    stoppers.push(() => mariadb.stop()); // tracked by startMariadb itself, from its spawn

    const appOrigins = [`http://127.0.0.1:${ports.app}`, `http://127.0.0.1:${ports.vite}`];
    const storage = await startObjectStorage({ dir: join(profile.dataDir, "s3"), port: ports.s3, allowedOrigins: appOrigins });
    add("the S3 fake", () => storage.stop());

    const mail = await startMailSink({ dir: join(profile.dataDir, "mail"), smtpPort: ports.smtp, inboxPort: ports.inbox });
    add("the mail sink", () => mail.stop());

    const paymentsApp = createPaymentsFakeApp({
      stateFile: join(profile.dataDir, "payments-fake", "state.json"),
      secretKey: secrets.paymentsSecretKey,
      publicUrl: `http://127.0.0.1:${ports.payments}`,
      // Signed events go to the API's webhook route, retried with back-off while it is down.
      webhook: { url: `http://127.0.0.1:${ports.app}/api/v1/payments/webhook`, secret: secrets.paymentsWebhookSecret },
    });
    const paymentsServer: Server = await new Promise((resolvePromise, reject) => {
      const server = paymentsApp.listen(ports.payments, "127.0.0.1", () => resolvePromise(server));
      server.once("error", reject);
    });
    add(
      "the payments fake",
      () =>
        new Promise<void>((r) => {
          paymentsApp.webhooks.stop();
          paymentsServer.closeAllConnections();
          paymentsServer.close(() => r());
        }),
    );
    say("S3 fake, mail sink and payments fake are up");

    return {
      profile,
      mariadb,
      databasePassword: secrets.databasePassword,
      inboxUrl: mail.inboxUrl,
      apiEnvironment(database, extra = {}) {
        return {
          PORT: String(ports.app),
          HOST: "127.0.0.1",
          PUBLIC_URL: `http://127.0.0.1:${ports.app}`,
          SESSION_SECRET: secrets.sessionSecret,
          DATABASE_HOST: mariadb.endpoint.host,
          DATABASE_PORT: String(mariadb.endpoint.port),
          DATABASE_USER: mariadb.endpoint.user,
          DATABASE_PASSWORD: mariadb.endpoint.password,
          DATABASE_NAME: database,
          S3_ENDPOINT: storage.endpoint,
          S3_REGION: storage.region,
          S3_BUCKET: storage.bucket,
          S3_ACCESS_KEY_ID: storage.accessKeyId,
          S3_SECRET_ACCESS_KEY: storage.secretAccessKey,
          S3_FORCE_PATH_STYLE: "true",
          SMTP_HOST: mail.smtp.host,
          SMTP_PORT: String(mail.smtp.port),
          MAIL_FROM: "Grainyard <hello@grainyard.test>",
          MAIL_INBOX_URL: mail.inboxUrl,
          PAYMENTS_HOST: "127.0.0.1",
          PAYMENTS_PORT: String(ports.payments),
          PAYMENTS_PROTOCOL: "http",
          PAYMENTS_SECRET_KEY: secrets.paymentsSecretKey,
          PAYMENTS_WEBHOOK_SECRET: secrets.paymentsWebhookSecret,
          // The SDK is pinned to a release that supports Node 20; its notice about later releases is noise here.
          AWS_SDK_JS_NODE_VERSION_SUPPORT_WARNING_DISABLED: "true",
          ...extra,
        };
      },
      stop: stopAll,
    };
  } catch (error) {
    await stopAll();
    throw error;
  }
}

export function writeEnvironmentFile(file: string, environment: Record<string, string>): void {
  writeFileSync(
    file,
    `# Written by the local stack on each start; read by the api's CLI commands. Do not commit.\n${Object.entries(environment)
      .map(([key, value]) => `${key}='${value.replace(/'/g, `'\\''`)}'`)
      .join("\n")}\n`,
    { mode: 0o600 },
  );
}

/** The variables of a file written by writeEnvironmentFile. */
export function readEnvironmentFile(file: string): Record<string, string> {
  const environment: Record<string, string> = {};
  for (const line of readFileSync(file, "utf8").split("\n")) {
    const match = /^([A-Z0-9_]+)='(.*)'$/.exec(line.trim());
    if (match) environment[match[1]!] = match[2]!.replace(/'\\''/g, "'");
  }
  return environment;
}
