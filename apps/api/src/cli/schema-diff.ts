import { loadConfig } from "../config.ts";
import { createDataSource } from "../db/data-source.ts";

// Prints the SQL that would bring the database in line with the entities, after migrations:
// the body of the next migration to write. Run it against a throwaway database.
const config = loadConfig();
const dataSource = createDataSource(config.database);
await dataSource.initialize();
await dataSource.runMigrations({ transaction: "each" });
const sql = await dataSource.driver.createSchemaBuilder().log();
if (sql.upQueries.length === 0) console.log("-- the schema matches the entities; no migration needed");
for (const query of sql.upQueries) console.log(`UP   ${query.query}`);
for (const query of sql.downQueries.reverse()) console.log(`DOWN ${query.query}`);
await dataSource.destroy();
