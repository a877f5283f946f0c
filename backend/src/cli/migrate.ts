import 'reflect-metadata';
import { Logger } from '@nestjs/common';
import { DataSource } from 'typeorm';
import { ConfigError, validateEnv } from '../config/env';
import { buildDataSourceOptions } from '../database/data-source-options';

/** Applies pending migrations to DATABASE_URL and exits (0 on success). */
async function main(): Promise<void> {
  const logger = new Logger('migrate');
  const { databaseUrl } = validateEnv();
  const dataSource = new DataSource(buildDataSourceOptions(databaseUrl));
  await dataSource.initialize();
  try {
    const applied = await dataSource.runMigrations({ transaction: 'each' });
    logger.log(applied.length === 0 ? 'database is up to date' : `applied ${applied.map((m) => m.name).join(', ')}`);
  } finally {
    await dataSource.destroy();
  }
}

main().catch((error: unknown) => {
  const message = error instanceof ConfigError ? error.message : error instanceof Error ? (error.stack ?? error.message) : String(error);
  new Logger('migrate').error(message);
  process.exit(1);
});
