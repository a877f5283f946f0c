import { Logger } from '@nestjs/common';
import type { DataSourceOptions } from 'typeorm';
import { entities } from './entities';
import { migrations } from './migrations';
import { SnakeNamingStrategy } from './snake-naming.strategy';

const logger = new Logger('Database');

/** The one description of our database, shared by the server, the CLI scripts and the tests. */
export function buildDataSourceOptions(databaseUrl: string): DataSourceOptions {
  return {
    type: 'postgres',
    url: databaseUrl,
    entities,
    migrations,
    migrationsTableName: 'migrations',
    migrationsTransactionMode: 'each',
    namingStrategy: new SnakeNamingStrategy(),
    synchronize: false,
    migrationsRun: false,
    // Extensions are a migration's business, and gen_random_uuid() needs none on PostgreSQL 13+.
    installExtensions: false,
    uuidExtension: 'pgcrypto',
    applicationName: 'dialsheet',
    // A dead database must make requests fail within seconds, not queue forever.
    connectTimeoutMS: 5000,
    // Idle connections that the server drops raise pool errors; log them instead of crashing.
    poolErrorHandler: (error: unknown) => logger.warn(`PostgreSQL pool error: ${String(error)}`),
  };
}
