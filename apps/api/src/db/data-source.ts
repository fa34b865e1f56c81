import "reflect-metadata";
import { DataSource } from "typeorm";
import type { AppConfig } from "../config.ts";
import { entities } from "../entities/index.ts";
import { migrations } from "../migrations/index.ts";

/**
 * The one way the API reaches MariaDB. Schema changes only through migrations.
 *
 * With a read replica configured, TypeORM's `replication` setting holds two pools: the primary
 * ("master") and the replica ("slave"). TypeORM 1.x sends a plain `find` / query-builder read to a
 * slave unless `defaultMode` says otherwise, so it is set to master: every read and write goes to
 * the primary, and only the reads that ask for the replica (db/read-replica.ts: the catalogue
 * search, slab, yard and sitemap pages) reach it. A node that fails is retried after a second
 * (mysql2's pool cluster would otherwise drop it for good after five errors).
 */
export function createDataSource(database: AppConfig["database"]): DataSource {
  const credentials = { username: database.user, password: database.password, database: database.database };
  const where = database.replica
    ? {
        replication: {
          master: { host: database.host, port: database.port, ...credentials },
          slaves: [{ host: database.replica.host, port: database.replica.port, ...credentials }],
          defaultMode: "master" as const,
          restoreNodeTimeout: 1000,
        },
      }
    : { host: database.host, port: database.port, ...credentials };
  return new DataSource({
    type: "mariadb",
    ...where,
    charset: "utf8mb4_unicode_ci",
    timezone: "Z",
    entities,
    migrations,
    migrationsTableName: "schema_migration",
    synchronize: false,
    // DATE columns as plain YYYY-MM-DD text: a calendar day, never shifted by a time zone.
    dateStrings: ["DATE"],
    logging: false,
    extra: { connectionLimit: 10 },
  });
}
