import 'reflect-metadata';
import { Logger } from '@nestjs/common';
import { NestFactory } from '@nestjs/core';
import { ConfigError, loadConfig } from '../config/env';
import { WorkerModule } from '../worker.module';

/**
 * A job worker without HTTP: processes uploaded recordings from the queue until SIGINT/SIGTERM.
 * Run beside API servers started with WORKER=off to scale transcoding on its own.
 */
async function main(): Promise<void> {
  const logger = new Logger('worker');
  let config;
  try {
    config = loadConfig(process.env, { worker: true });
  } catch (error) {
    if (error instanceof ConfigError) {
      logger.error(error.message);
      process.exit(1);
    }
    throw error;
  }
  const app = await NestFactory.createApplicationContext(WorkerModule.forRoot(config), {
    logger: ['log', 'warn', 'error', 'fatal'],
  });
  app.enableShutdownHooks();
  await app.init();
  logger.log('worker running; stop with Ctrl-C');
}

main().catch((error: unknown) => {
  new Logger('worker').error(error instanceof Error ? (error.stack ?? error.message) : String(error));
  process.exit(1);
});
