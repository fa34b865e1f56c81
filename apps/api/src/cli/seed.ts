import { seedLakemontYards } from "../seed/lakemont-yard.ts";
import { withDemoPhotos } from "./demo-photos.ts";
import { seedLakemont } from "../seed/lakemont.ts";
import { runCli } from "./run-cli.ts";

// `pnpm --filter @grainyard/api seed`: adds the Lakemont demo accounts that are missing.
await runCli("seed", async (dataSource, config) => {
  const { created } = await seedLakemont(dataSource, config.bcryptCost);
  const { logs } = await withDemoPhotos(dataSource, config, (options) => seedLakemontYards(dataSource, options));
  console.log(created || logs ? `seed: added ${created} demo accounts and ${logs} demo logs` : "seed: the demo data is already there");
});
