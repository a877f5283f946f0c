import 'reflect-metadata';
import { DataSource } from 'typeorm';
import { buildDataSourceOptions } from '../src/database/data-source-options';

/**
 * Runs once before the API tests: empties the test database and applies the real migrations,
 * so the tests see exactly the schema production gets.
 */
export default async function setup(): Promise<void> {
  const url = process.env.DATABASE_URL;
  if (!url) {
    throw new Error('API tests need DATABASE_URL pointing at a disposable PostgreSQL database');
  }
  // This wipes the database; refuse anything that is not plainly a test database.
  const name = decodeURIComponent(new URL(url).pathname.replace(/^\//, ''));
  if (!/test/i.test(name)) {
    throw new Error(`Refusing to reset database "${name}": API tests need a database whose name contains "test"`);
  }
  const dataSource = new DataSource(buildDataSourceOptions(url));
  await dataSource.initialize();
  try {
    await dataSource.query('DROP SCHEMA IF EXISTS public CASCADE');
    // The job queue's own schema: jobs of an earlier run would point at rows that are gone.
    await dataSource.query('DROP SCHEMA IF EXISTS pgboss CASCADE');
    await dataSource.query('CREATE SCHEMA public');
    await dataSource.runMigrations({ transaction: 'each' });
  } finally {
    await dataSource.destroy();
  }
}
