import { existsSync, readFileSync } from "node:fs";
import { resolve } from "node:path";

/**
 * CLI commands run beside a started local stack: when the database settings are not in the
 * environment, take them from the env file `npm start` writes under .data/local/.
 */
export function useLocalStackEnvironment(): void {
  const file = resolve(import.meta.dirname, "../../../../.data/local/api.env");
  if (process.env.DATABASE_HOST || !existsSync(file)) return;
  for (const line of readFileSync(file, "utf8").split("\n")) {
    const match = /^([A-Z0-9_]+)=(.*)$/.exec(line.trim());
    if (!match || process.env[match[1]!] !== undefined) continue;
    const raw = match[2]!;
    // Values are written single-quoted, shell style ('\'' stands for a quote inside).
    process.env[match[1]!] = raw.startsWith("'") && raw.endsWith("'") ? raw.slice(1, -1).replace(/'\\''/g, "'") : raw;
  }
}
