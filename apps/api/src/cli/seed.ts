import { seedLakemont } from "../seed/lakemont.ts";
import { runCli } from "./run-cli.ts";

// `pnpm --filter @grainyard/api seed`: adds the Lakemont demo accounts that are missing.
await runCli("seed", async (dataSource, config) => {
  const { created } = await seedLakemont(dataSource, config.bcryptCost);
  console.log(created ? `seed: added ${created} demo accounts` : "seed: the demo data is already there");
});
