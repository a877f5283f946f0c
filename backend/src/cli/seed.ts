import 'reflect-metadata';
import { Logger } from '@nestjs/common';
import { NestFactory } from '@nestjs/core';
import { DataSource } from 'typeorm';
import { ConfigError, loadConfig, validateEnv } from '../config/env';
import { buildDataSourceOptions } from '../database/data-source-options';
import { DEMO_ACCOUNTS, DEMO_CAMPAIGN_NAME, seedDemo } from '../database/seed/demo-seed';
import { DEMO_SHEET, ingestDemoVideos } from '../database/seed/demo-videos';
import { SeedModule } from '../database/seed/seed.module';
import { RecordingsService } from '../modules/recordings/recordings.service';
import { RunsService } from '../modules/runs/runs.service';

/**
 * Creates the demo accounts, campaign, runs and channels when missing; with DEMO_VIDEOS_DIR set,
 * also gives each run its generated video, display regions and a sheet for the demo reader and
 * checker, once. Safe to run any number of times.
 */
async function main(): Promise<void> {
  const logger = new Logger('seed');
  const env = validateEnv();
  const dataSource = new DataSource(buildDataSourceOptions(env.databaseUrl));
  await dataSource.initialize();
  try {
    const r = await seedDemo(dataSource, env.demoPassword);
    logger.log(
      `demo data ready: ${r.usersCreated} account(s) created, campaign "${DEMO_CAMPAIGN_NAME}" ` +
        `${r.campaignCreated ? 'created' : 'already there'}, ${r.membersAdded} membership(s), ${r.runsCreated} run(s) and ` +
        `${r.channelsCreated} channel(s) added`,
    );
    logger.log(`accounts: ${DEMO_ACCOUNTS.map((a) => a.email).join(', ')} (password from DEMO_PASSWORD)`);
  } finally {
    await dataSource.destroy();
  }
  if (!env.demoVideosDir) return;

  // Uploading needs the JWT secret (for nothing here, but the config is whole) and the queue.
  const config = loadConfig(process.env, { worker: false });
  // Quiet while Nest wires itself up, then our own progress lines again.
  const app = await NestFactory.createApplicationContext(SeedModule.forRoot(config), { logger: ['warn', 'error', 'fatal'] });
  await app.init();
  Logger.overrideLogger(['log', 'warn', 'error', 'fatal']);
  try {
    const result = await ingestDemoVideos(env.demoVideosDir, {
      dataSource: app.get(DataSource),
      recordings: app.get(RecordingsService),
      runs: app.get(RunsService),
    });
    logger.log(`demo videos: ${result.ingested.length} stored, ${result.skipped.length} run(s) already had one or no file was found`);
    logger.log(
      `demo reading set-up: display regions set on ${result.regionsSet.length} run(s), ` +
        `sheet “${DEMO_SHEET.name}” planned on ${result.sheetsCreated.length} run(s) for reader@demo.test and checker@demo.test`,
    );
  } finally {
    await app.close();
  }
}

main().catch((error: unknown) => {
  const message = error instanceof ConfigError ? error.message : error instanceof Error ? (error.stack ?? error.message) : String(error);
  new Logger('seed').error(message);
  process.exit(1);
});
