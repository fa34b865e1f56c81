import { describeSeed, seedDemo } from "./demo-seed.ts";
import { runCli } from "./run-cli.ts";

// `pnpm --filter @grainyard/api seed`: adds whatever of the Lakemont demo is missing.
await runCli("seed", async (dataSource, config) => {
  const summary = await seedDemo(dataSource, config);
  console.log(summary.accounts || summary.logs ? `seed: ${describeSeed(summary)}` : "seed: the demo data is already there");
});
