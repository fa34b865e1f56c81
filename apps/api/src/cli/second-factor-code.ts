import { AccountEntity } from "../entities/index.ts";
import { codeAt } from "../services/second-factor-service.ts";
import { runCli } from "./run-cli.ts";

// `pnpm --filter @grainyard/api demo:code [email]`: the code an authenticator app with this demo
// account's secret shows now (the demo admin's by default), for trying the demo without a phone.
const email = process.argv.slice(2).find((arg) => !arg.startsWith("--")) ?? "desk@grainyard.test";

await runCli("demo:code", async (dataSource) => {
  const account = await dataSource.getRepository(AccountEntity).findOneBy({ email });
  if (!account?.totpSecret) throw new Error(`${email} has no second factor on`);
  const now = new Date();
  const secondsLeft = 30 - (Math.floor(now.getTime() / 1000) % 30);
  console.log(`demo:code: ${email} ${await codeAt(account.totpSecret, now)} (for ${secondsLeft} more seconds; each code works once)`);
});
