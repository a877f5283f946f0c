import 'reflect-metadata';
import { Logger } from '@nestjs/common';
import { DataSource } from 'typeorm';
import { ConfigError, validateEnv } from '../config/env';
import { buildDataSourceOptions } from '../database/data-source-options';
import { DEMO_ACCOUNTS, DEMO_CAMPAIGN_NAME, seedDemo } from '../database/seed/demo-seed';

/** Creates the demo accounts and campaign when missing; safe to run any number of times. */
async function main(): Promise<void> {
  const logger = new Logger('seed');
  const env = validateEnv();
  const dataSource = new DataSource(buildDataSourceOptions(env.databaseUrl));
  await dataSource.initialize();
  try {
    const r = await seedDemo(dataSource, env.demoPassword);
    logger.log(
      `demo data ready: ${r.usersCreated} account(s) created, campaign "${DEMO_CAMPAIGN_NAME}" ` +
        `${r.campaignCreated ? 'created' : 'already there'}, ${r.membersAdded} membership(s) added`,
    );
    logger.log(`accounts: ${DEMO_ACCOUNTS.map((a) => a.email).join(', ')} (password from DEMO_PASSWORD)`);
  } finally {
    await dataSource.destroy();
  }
}

main().catch((error: unknown) => {
  const message = error instanceof ConfigError ? error.message : error instanceof Error ? (error.stack ?? error.message) : String(error);
  new Logger('seed').error(message);
  process.exit(1);
});
