import { randomBytes } from "node:crypto";
import mysql from "mysql2/promise";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { DataSource } from "typeorm";
import { loadConfig } from "../config.ts";
import { AccountEntity, AuditEntryEntity, SlabEntity } from "../entities/index.ts";
import { demoLogs, seedLakemontYards } from "../seed/lakemont-yard.ts";
import { demoAccounts, seedLakemont } from "../seed/lakemont.ts";
import { createAdmin } from "../services/admin-accounts.ts";
import { passwordMatches } from "../services/passwords.ts";
import { stackEnvironment } from "../test-support/test-context.ts";
import { createDataSource } from "./data-source.ts";

const database = `grainyard_m_${randomBytes(4).toString("hex")}`;
let dataSource: DataSource;

beforeAll(async () => {
  const config = loadConfig({ ...stackEnvironment(), DATABASE_NAME: database });
  const server = await mysql.createConnection({
    host: config.database.host,
    port: config.database.port,
    user: config.database.user,
    password: config.database.password,
  });
  await server.query(`CREATE DATABASE \`${database}\``);
  await server.end();
  dataSource = createDataSource(config.database);
  await dataSource.initialize();
});
afterAll(async () => {
  await dataSource.query(`DROP DATABASE \`${database}\``);
  await dataSource.destroy();
});

const tables = async () => ((await dataSource.query("SHOW TABLES")) as Record<string, string>[]).map((row) => Object.values(row)[0]).sort();

describe("migrations", () => {
  it("build a schema that matches the entities exactly (no drift)", async () => {
    await dataSource.runMigrations({ transaction: "each" });
    const pending = await dataSource.driver.createSchemaBuilder().log();
    expect(pending.upQueries.map((q) => q.query)).toEqual([]);
    expect(await tables()).toEqual([
      "account",
      "audit_entry",
      "buyer_order",
      "cache_version",
      "catalogue_entry",
      "content_report",
      "email_token",
      "favourite",
      "job_lease",
      "ledger_entry",
      "listing",
      "listing_offer",
      "listing_photo",
      "listing_review",
      "listing_slab",
      "log_photo",
      "marketplace_setting",
      "message",
      "message_thread",
      "moisture_reading",
      "order_problem",
      "order_refund",
      "order_review",
      "outbox_email",
      "payment_event",
      "payout",
      "payout_account",
      "payout_line",
      "rate_limit",
      "recovery_code",
      "saved_search",
      "saved_search_match",
      "schema_migration",
      "session_record",
      "slab",
      "yard_log",
    ]);
  });

  it("revert cleanly with down, and apply again", async () => {
    for (let i = 0; i < dataSource.migrations.length; i++) await dataSource.undoLastMigration({ transaction: "each" });
    expect(await tables()).toEqual(["schema_migration"]);
    await dataSource.runMigrations({ transaction: "each" });
    expect(await tables()).toContain("account");
  });
});

describe("Lakemont seed", () => {
  it("adds one admin, the sawyers and the buyers once; a second run adds nothing", async () => {
    const first = await seedLakemont(dataSource, 4);
    expect(first.created).toBe(demoAccounts.length);
    const second = await seedLakemont(dataSource, 4);
    expect(second.created).toBe(0);
    const repository = dataSource.getRepository(AccountEntity);
    expect(await repository.count()).toBe(demoAccounts.length);
    expect(await repository.countBy({ role: "admin" })).toBe(1);
    expect(await repository.countBy({ role: "sawyer" })).toBeGreaterThanOrEqual(2);
    expect(await repository.countBy({ role: "buyer" })).toBeGreaterThanOrEqual(2);
    const sawyer = await repository.findOneByOrFail({ email: "yard@ridgeback-timber.test" });
    expect(sawyer.yardName).toBe("Ridgeback Urban Timber");
    expect(await passwordMatches("ridgeback-bandmill-2026", sawyer.passwordHash)).toBe(true);
  });

  it("adds the demo yards' logs, slabs and readings once, with figures from slab-math", async () => {
    const logs = demoLogs();
    const first = await seedLakemontYards(dataSource);
    expect(first.logs).toBe(logs.length);
    expect(first.sales.length).toBeGreaterThan(10);
    expect((await seedLakemontYards(dataSource)).logs).toBe(0);
    const slabs = await dataSource.getRepository(SlabEntity).find();
    expect(slabs).toHaveLength(logs.reduce((n, l) => n + l.slabs.length, 0));
    for (const slab of slabs) {
      expect(slab.boardFeet).toBeGreaterThan(0);
      expect(slab.weightKg).toBeGreaterThan(0);
    }
  });
});

describe("admin:create", () => {
  it("promotes an existing account, or creates a verified admin", async () => {
    const promoted = await createAdmin(dataSource, { email: "shop@fernhill-furniture.test", password: "unused-password", bcryptCost: 4 });
    expect(promoted).toEqual({ email: "shop@fernhill-furniture.test", created: false });
    const repository = dataSource.getRepository(AccountEntity);
    expect((await repository.findOneByOrFail({ email: "shop@fernhill-furniture.test" })).role).toBe("admin");
    const created = await createAdmin(dataSource, { email: "Ops@Lakemont.test", password: "fresh-admin-pass", bcryptCost: 4 });
    expect(created).toEqual({ email: "ops@lakemont.test", created: true });
    const row = await repository.findOneByOrFail({ email: "ops@lakemont.test" });
    expect(row.role).toBe("admin");
    expect(row.emailVerifiedAt).not.toBeNull();
    await expect(createAdmin(dataSource, { email: "not-an-address", password: "x", bcryptCost: 4 })).rejects.toThrow(/not a valid e-mail/);
    // Both are in the audit log as command-line actions.
    const audit = await dataSource.getRepository(AuditEntryEntity).find({ order: { id: "ASC" } });
    expect(audit.map((e) => [e.action, e.actorLabel, e.targetId])).toEqual([
      ["account.promote", "command line", (await repository.findOneByOrFail({ email: "shop@fernhill-furniture.test" })).id],
      ["account.create_admin", "command line", row.id],
    ]);
    expect(audit[0]!.before).toEqual({ role: "buyer" });
  });
});
