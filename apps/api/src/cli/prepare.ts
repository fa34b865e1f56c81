import { describeSeed, seedDemo } from "./demo-seed.ts";
import { demoAccounts } from "../seed/lakemont.ts";
import { runCli } from "./run-cli.ts";

// Used by the local stack on every start: apply pending migrations, then add missing demo data.
await runCli("prepare", async (dataSource, config) => {
  const applied = await dataSource.runMigrations({ transaction: "each" });
  const seed = !process.argv.includes("--no-seed");
  const summary = seed ? await seedDemo(dataSource, config) : null;
  console.log(`prepare: ${applied.length} migration(s) applied${summary ? `; ${describeSeed(summary)}` : ""}`);
  // The last line lists the demo accounts for the start banner.
  console.log(
    JSON.stringify(
      demoAccounts.map(({ role, email, password, displayName, yardName }) => ({ role, email, password, name: yardName ?? displayName })),
    ),
  );
});
