import "reflect-metadata";
import { DataSource } from "typeorm";
import type { AppConfig } from "../config.ts";
import { entities } from "../entities/index.ts";
import { migrations } from "../migrations/index.ts";

/** The one way the API reaches MariaDB. Schema changes only through migrations. */
export function createDataSource(database: AppConfig["database"]): DataSource {
  return new DataSource({
    type: "mariadb",
    host: database.host,
    port: database.port,
    username: database.user,
    password: database.password,
    database: database.database,
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
