import { seedLakemontYards } from "../seed/lakemont-yard.ts";
import { withDemoPhotos } from "./demo-photos.ts";
import { demoAccounts, seedLakemont } from "../seed/lakemont.ts";
import { runCli } from "./run-cli.ts";

// Used by the local stack on every start: apply pending migrations, then add missing demo data.
await runCli("prepare", async (dataSource, config) => {
  const applied = await dataSource.runMigrations({ transaction: "each" });
  const seed = !process.argv.includes("--no-seed");
  const { created } = seed ? await seedLakemont(dataSource, config.bcryptCost) : { created: 0 };
  const { logs } = seed ? await withDemoPhotos(dataSource, config, (options) => seedLakemontYards(dataSource, options)) : { logs: 0 };
  console.log(`prepare: ${applied.length} migration(s) applied, ${created} demo account(s) and ${logs} demo log(s) added`);
  // The last line lists the demo accounts for the start banner.
  console.log(
    JSON.stringify(
      demoAccounts.map(({ role, email, password, displayName, yardName }) => ({ role, email, password, name: yardName ?? displayName })),
    ),
  );
});
