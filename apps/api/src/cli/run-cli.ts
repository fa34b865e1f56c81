import type { DataSource } from "typeorm";
import { ConfigError, loadConfig, type AppConfig } from "../config.ts";
import { createDataSource } from "../db/data-source.ts";
import { useLocalStackEnvironment } from "./local-environment.ts";

/** Runs a CLI command with a connected data source; failures print one clear line and exit 1. */
export async function runCli(name: string, command: (dataSource: DataSource, config: AppConfig) => Promise<void>): Promise<void> {
  useLocalStackEnvironment();
  let dataSource: DataSource | undefined;
  try {
    const config = loadConfig();
    dataSource = createDataSource(config.database);
    try {
      await dataSource.initialize();
    } catch (error) {
      throw new Error(
        `cannot reach MariaDB at ${config.database.host}:${config.database.port} (${(error as Error).message}). Is Grainyard started (npm start)?`,
        { cause: error },
      );
    }
    await command(dataSource, config);
  } catch (error) {
    console.error(`${name}: ${error instanceof ConfigError ? error.message : (error as Error).message}`);
    process.exitCode = 1;
  } finally {
    if (dataSource?.isInitialized) await dataSource.destroy();
  }
}
