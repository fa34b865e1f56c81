import { resolve } from "node:path";

export const repoRoot = resolve(import.meta.dirname, "../../..");

/**
 * A profile is one separate local stack: its own data folder and its own ports.
 * `local` serves `npm start` and `npm run dev`; `test` serves `npm test` and is wiped each run.
 */
export interface Profile {
  name: "local" | "test";
  dataDir: string;
  ports: {
    app: number;
    inbox: number;
    mariadb: number;
    s3: number;
    smtp: number;
    payments: number;
    vite: number;
    /** The read replica (GRAINYARD_REPLICA=1 npm start; in npm test, the replica suite's). */
    replica: number;
    /** npm test only: the replica suite's own primary (a binary log the test stack's MariaDB does not keep). */
    replicaPrimary: number;
  };
}

function portsFrom(base: number): Profile["ports"] {
  return {
    app: base,
    inbox: base + 1,
    payments: base + 2,
    s3: base + 3,
    smtp: base + 4,
    mariadb: base + 5,
    vite: base + 6,
    replica: base + 7,
    replicaPrimary: base + 8,
  };
}

function baseFromEnv(name: string, fallback: number): number {
  const raw = process.env[name];
  if (!raw) return fallback;
  const value = Number(raw);
  if (!Number.isInteger(value) || value < 1024 || value > 65000) {
    throw new Error(`${name} must be a whole number between 1024 and 65000, not "${raw}".`);
  }
  return value;
}

/** GRAINYARD_DATA_DIR moves the profile's data folder (the devstack's own tests run stacks in a temporary one). */
function dataDirFor(fallback: string): string {
  return process.env.GRAINYARD_DATA_DIR ? resolve(process.env.GRAINYARD_DATA_DIR) : resolve(repoRoot, fallback);
}

export function profileFor(name: Profile["name"]): Profile {
  if (name === "local") {
    return { name, dataDir: dataDirFor(".data/local"), ports: portsFrom(baseFromEnv("GRAINYARD_PORT_BASE", 5080)) };
  }
  return { name, dataDir: dataDirFor(".data/test"), ports: portsFrom(baseFromEnv("GRAINYARD_TEST_PORT_BASE", 6080)) };
}
