import { In } from "typeorm";
import { AccountEntity } from "../entities/index.ts";
import { otpauthUrl } from "../services/second-factor-service.ts";
import { describeSeed, seedDemo } from "./demo-seed.ts";
import { demoAccounts } from "../seed/lakemont.ts";
import { runCli } from "./run-cli.ts";

// Used by the local stack on every start: apply pending migrations, then add missing demo data.
await runCli("prepare", async (dataSource, config) => {
  const applied = await dataSource.runMigrations({ transaction: "each" });
  const seed = !process.argv.includes("--no-seed");
  const summary = seed ? await seedDemo(dataSource, config) : null;
  console.log(`prepare: ${applied.length} migration(s) applied${summary ? `; ${describeSeed(summary)}` : ""}`);
  // The second factor of demo accounts that have one (the admin): its secret, to add to an authenticator app.
  const withSecret = await dataSource
    .getRepository(AccountEntity)
    .find({ where: { email: In(demoAccounts.map((demo) => demo.email)) }, select: { email: true, totpSecret: true } });
  const secretOf = new Map(withSecret.filter((account) => account.totpSecret).map((account) => [account.email, account.totpSecret!]));
  // The last line lists the demo accounts for the start banner.
  console.log(
    JSON.stringify(
      demoAccounts.map(({ role, email, password, displayName, yardName }) => ({
        role,
        email,
        password,
        name: yardName ?? displayName,
        ...(secretOf.has(email)
          ? { secondFactor: { secret: secretOf.get(email)!, otpauthUrl: otpauthUrl(secretOf.get(email)!, email) } }
          : {}),
      })),
    ),
  );
});
