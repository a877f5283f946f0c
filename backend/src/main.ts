import 'reflect-metadata';
import { Logger } from '@nestjs/common';
import { createApp } from './app.factory';
import { ConfigError, loadConfig } from './config/env';

async function bootstrap(): Promise<void> {
  const logger = new Logger('Dialsheet');
  let config;
  try {
    config = loadConfig();
  } catch (error) {
    if (error instanceof ConfigError) {
      logger.error(error.message);
      process.exit(1);
    }
    throw error;
  }
  const app = await createApp(config);
  await app.listen(config.port, config.host);
  logger.log(`Dialsheet listening on http://${config.host}:${config.port}`);
}

bootstrap().catch((error: unknown) => {
  new Logger('Dialsheet').error(error instanceof Error ? (error.stack ?? error.message) : String(error));
  process.exit(1);
});
