import { demoAccounts, seedLakemont } from "../seed/lakemont.ts";
import { runCli } from "./run-cli.ts";

// Used by the local stack on every start: apply pending migrations, then add missing demo data.
await runCli("prepare", async (dataSource, config) => {
  const applied = await dataSource.runMigrations({ transaction: "each" });
  const { created } = process.argv.includes("--no-seed") ? { created: 0 } : await seedLakemont(dataSource, config.bcryptCost);
  console.log(`prepare: ${applied.length} migration(s) applied, ${created} demo account(s) added`);
  // The last line lists the demo accounts for the start banner.
  console.log(JSON.stringify(demoAccounts.map(({ role, email, password, displayName, yardName }) => ({ role, email, password, name: yardName ?? displayName }))));
});
