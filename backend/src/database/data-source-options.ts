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
    // pg's own defaults are 10 connections, each closed after 10 s idle. Readers save in bursts,
    // so at one row/s per reader the pool kept closing connections and opening them again, and
    // each new one is a new PostgreSQL process that loads its catalog caches and prepares the
    // hot statements anew: tens of ms that landed in the save p99 (bench/save-row.bench.ts).
    // Ten busy connections were enough for 50 readers saving back to back on 2 cores.
    poolSize: 10,
    extra: { idleTimeoutMillis: 5 * 60_000 },
  };
}
