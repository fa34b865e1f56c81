import { randomBytes } from "node:crypto";
import { createAdmin } from "../services/admin-accounts.ts";
import { runCli } from "./run-cli.ts";

// `pnpm --filter api admin:create <email> [--name "Full Name"]`: the only way to make an admin
// besides the seed. Promotes an existing account, or creates one with a printed one-time password.
const [email] = process.argv.slice(2).filter((arg) => !arg.startsWith("--"));
const nameIndex = process.argv.indexOf("--name");
const displayName = nameIndex > 0 ? process.argv[nameIndex + 1] : undefined;

if (!email) {
  console.error("admin:create: give the e-mail address, e.g. pnpm --filter api admin:create ops@example.org");
  process.exit(1);
}

await runCli("admin:create", async (dataSource, config) => {
  const password = randomBytes(12).toString("base64url");
  const result = await createAdmin(dataSource, { email, displayName, password, bcryptCost: config.bcryptCost });
  if (result.created) console.log(`admin:create: created admin ${result.email} with password ${password} (change it after signing in)`);
  else console.log(`admin:create: ${result.email} is now an admin (password unchanged)`);
});
