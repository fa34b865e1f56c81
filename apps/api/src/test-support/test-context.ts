import { randomBytes, randomUUID } from "node:crypto";
import { Agent } from "node:http";
import { CSRF_HEADER, type Role } from "@grainyard/contracts";
import mysql from "mysql2/promise";
import request from "supertest";
import type { DataSource } from "typeorm";
import { createApp } from "../app.ts";
import { loadConfig, type AppConfig } from "../config.ts";
import { freeYardSlug } from "../services/yard-slugs.ts";
import { createDataSource } from "../db/data-source.ts";
import { AccountEntity } from "../entities/index.ts";
import { createMailer } from "../integrations/mail.ts";
import { createPayments } from "../integrations/payments-stripe.ts";
import { createPhotoStorage } from "../integrations/storage.ts";
import { createLogger } from "../logger.ts";
import { hashPassword } from "../services/passwords.ts";
import { codeAt, newTotpSecret } from "../services/second-factor-service.ts";

/**
 * API integration tests run against the real local test stack that `npm test` starts: a private
 * MariaDB (each test file gets its own throwaway database, built by the migrations), the SMTP
 * mail sink, the S3 fake and the payments fake.
 */
export function stackEnvironment(): NodeJS.ProcessEnv {
  if (!process.env.GRAINYARD_TEST_STACK) {
    throw new Error("API tests need the local test stack: run `npm test` from the repository root.");
  }
  return process.env;
}

export interface TestClock {
  now: () => Date;
  advance(milliseconds: number): void;
}

export function testClock(): TestClock {
  let offset = 0;
  return { now: () => new Date(Date.now() + offset), advance: (ms) => (offset += ms) };
}

/** A throwaway database on the test stack's MariaDB, built by the migrations; `drop` removes it. */
export async function createTestDatabase(environment: Record<string, string | undefined> = {}) {
  const database = `grainyard_t_${randomBytes(5).toString("hex")}`;
  const config: AppConfig = loadConfig({ ...stackEnvironment(), ...environment, DATABASE_NAME: database });
  const server = await mysql.createConnection({
    host: config.database.host,
    port: config.database.port,
    user: config.database.user,
    password: config.database.password,
  });
  await server.query(`CREATE DATABASE \`${database}\` CHARACTER SET utf8mb4 COLLATE utf8mb4_unicode_ci`);
  await server.end();
  const dataSource: DataSource = createDataSource(config.database);
  await dataSource.initialize();
  await dataSource.runMigrations({ transaction: "each" });
  return {
    config,
    dataSource,
    async drop() {
      await dataSource.query(`DROP DATABASE \`${database}\``);
      await dataSource.destroy();
    },
  };
}

export async function createTestContext(options: { environment?: Record<string, string>; clock?: TestClock } = {}) {
  const { config, dataSource, drop } = await createTestDatabase(options.environment);
  const logLines: string[] = [];
  const logger = createLogger("info", { write: (line: string) => void logLines.push(line) });
  const mailer = createMailer(config.mail);
  const storage = createPhotoStorage(config.storage);
  const payments = createPayments(config.payments);
  const app = createApp({ config, dataSource, mailer, storage, payments, logger, now: options.clock?.now });
  const untrack = trackDeliveries(app);

  return {
    app,
    config,
    dataSource,
    logLines,
    /**
     * Creates an account straight in the database (already verified unless told otherwise). An admin
     * has a second factor on (admins need one) unless `secondFactor: false`; its secret is returned.
     */
    async createAccount(role: Role, overrides: AccountOverrides = {}) {
      const password = overrides.password ?? `test-${randomBytes(6).toString("hex")}-pass`;
      const totpSecret = (overrides.secondFactor ?? role === "admin") ? newTotpSecret() : null;
      const id = randomUUID();
      const email = overrides.email ?? `${role}-${id.slice(0, 8)}@lakemont.test`;
      const yardName = role === "sawyer" ? (overrides.yardName ?? "Test Yard") : null;
      await dataSource.getRepository(AccountEntity).insert({
        id,
        email,
        passwordHash: await hashPassword(password, config.bcryptCost),
        role,
        displayName: overrides.displayName ?? `Test ${role}`,
        yardName,
        yardSlug: yardName ? await freeYardSlug(dataSource, yardName, id) : null,
        yardStory: overrides.yardStory ?? null,
        pickupTown: role === "sawyer" ? (overrides.pickupTown ?? "Lakemont") : null,
        pickupLatitude: overrides.pickupLatitude ?? null,
        pickupLongitude: overrides.pickupLongitude ?? null,
        emailVerifiedAt: overrides.emailVerifiedAt === undefined ? new Date() : overrides.emailVerifiedAt,
        totpSecret,
        totpOnAt: totpSecret ? new Date() : null,
      });
      return { id, email, password, totpSecret };
    },
    /** The code an account's authenticator shows now (on the test's clock when it has one). */
    codeFor: (secret: string) => codeAt(secret, options.clock?.now() ?? new Date()),
    /**
     * A browser-like client: keeps cookies and sends the anti-forgery header on changes. `from`
     * gives it its own loopback address (127.0.0.2, 127.0.0.3…): its connections leave from there,
     * so the API sees two clients as two addresses, through the socket, with no proxy header.
     */
    async client(options: ClientOptions = {}) {
      return browserClient(app, options);
    },
    /** Waits for the e-mails and other background work the requests so far started. */
    settled: () => app.background.settled(),
    /** A client signed in to a new account of this role (an admin through its second factor's code step). */
    async signedInClient(role: Role, overrides: AccountOverrides = {}) {
      const account = await this.createAccount(role, overrides);
      const client = await browserClient(app);
      let res = await client.post("/api/v1/session", { email: account.email, password: account.password });
      if (res.status === 200 && res.body.secondStep && account.totpSecret)
        res = await client.post("/api/v1/session/second-factor", { code: await this.codeFor(account.totpSecret) });
      if (res.status !== 200 || !res.body.account)
        throw new Error(`sign-in for the test failed: ${res.status} ${JSON.stringify(res.body)}`);
      return Object.assign(client, { account });
    },
    async close() {
      await app.background.settled();
      untrack();
      mailer.close();
      storage.close();
      await drop();
    },
  };
}

export type TestContext = Awaited<ReturnType<typeof createTestContext>>;

/** Columns to set on a test account, its password, and whether it has a second factor on (admins do unless false). */
export type AccountOverrides = Partial<AccountEntity> & { password?: string; secondFactor?: boolean };

export interface ClientOptions {
  /** The loopback address the client's connections leave from (127.0.0.0/8 only). */
  from?: string;
}

export async function browserClient(app: Parameters<typeof request.agent>[0], options: ClientOptions = {}) {
  const agent = request.agent(app);
  if (options.from) {
    if (!/^127\.\d{1,3}\.\d{1,3}\.\d{1,3}$/.test(options.from)) throw new Error(`test clients stay on loopback, not ${options.from}`);
    const socketAgent = new Agent({ localAddress: options.from });
    agent.use((req: { agent(agent: Agent): unknown }) => void req.agent(socketAgent));
  }
  let csrfToken = (await agent.get("/api/v1/session").expect(200)).body.csrfToken as string;
  const remember = (res: request.Response) => {
    if (typeof res.body?.csrfToken === "string") csrfToken = res.body.csrfToken;
    return res;
  };
  return {
    agent,
    get csrfToken() {
      return csrfToken;
    },
    get: (path: string) => agent.get(path),
    post: async (path: string, body?: object) => remember(await agent.post(path).set(CSRF_HEADER, csrfToken).send(body)),
    patch: async (path: string, body?: object) => remember(await agent.patch(path).set(CSRF_HEADER, csrfToken).send(body)),
    put: async (path: string, body?: object) => remember(await agent.put(path).set(CSRF_HEADER, csrfToken).send(body)),
    delete: async (path: string) => remember(await agent.delete(path).set(CSRF_HEADER, csrfToken)),
  };
}

export type BrowserClient = Awaited<ReturnType<typeof browserClient>>;

/** Apps of this test file whose prompt e-mail deliveries `mailTo` waits for. */
const liveApps = new Set<{ background: { settled(): Promise<void> } }>();

/** Lets `mailTo` wait for this app's first delivery attempts (they run after each answer); returns the undo. */
export function trackDeliveries(app: { background: { settled(): Promise<void> } }): () => void {
  liveApps.add(app);
  return () => liveApps.delete(app);
}

/**
 * Messages the real SMTP sink received for an address, newest first, once every tracked app's
 * delivery attempts so far have finished (an e-mail leaves the outbox after the answer).
 */
export async function mailTo(address: string): Promise<{ subject: string; text: string }[]> {
  await Promise.all([...liveApps].map((app) => app.background.settled()));
  const inbox = stackEnvironment().MAIL_INBOX_URL;
  const response = await fetch(`${inbox}/api/messages?to=${encodeURIComponent(address.toLowerCase())}`);
  return ((await response.json()) as { messages: { subject: string; text: string }[] }).messages;
}

/** The token of the newest link of this kind mailed to an address. */
export async function mailedToken(address: string, path: "verify-email" | "reset-password"): Promise<string> {
  for (const message of await mailTo(address)) {
    const match = new RegExp(`/${path}\\?token=([A-Za-z0-9_-]+)`).exec(message.text);
    if (match) return match[1]!;
  }
  throw new Error(`no ${path} link was mailed to ${address}`);
}
