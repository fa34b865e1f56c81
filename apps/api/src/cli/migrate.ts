import { runCli } from "./run-cli.ts";

// `pnpm --filter @grainyard/api migrate [--undo]`: applies pending migrations, or reverts the last one.
await runCli("migrate", async (dataSource) => {
  if (process.argv.includes("--undo")) {
    await dataSource.undoLastMigration({ transaction: "each" });
    console.log("migrate: reverted the last migration");
    return;
  }
  const applied = await dataSource.runMigrations({ transaction: "each" });
  console.log(applied.length ? `migrate: applied ${applied.map((m) => m.name).join(", ")}` : "migrate: the schema is up to date");
});
