import { Logger } from '@nestjs/common';
import { ConfigError, loadMailCatcherSettings } from '../config/env';
import { MailCatcher } from '../modules/mail/mail-catcher';

/** Local fake SMTP server: stores every message under MAIL_CATCHER_DIR until stopped. */
async function main(): Promise<void> {
  const logger = new Logger('mail-catcher');
  const settings = loadMailCatcherSettings();
  const catcher = new MailCatcher(settings.dir);
  const port = await catcher.start(settings.port);
  logger.log(`mail catcher listening on 127.0.0.1:${port}`);
  logger.log(`storing messages in ${settings.dir}`);
  const stop = (signal: string) => {
    logger.log(`${signal} received, stopping`);
    catcher.stop().then(
      () => process.exit(0),
      () => process.exit(1),
    );
  };
  process.once('SIGINT', () => stop('SIGINT'));
  process.once('SIGTERM', () => stop('SIGTERM'));
}

main().catch((error: unknown) => {
  const message = error instanceof ConfigError ? error.message : error instanceof Error ? error.message : String(error);
  new Logger('mail-catcher').error(message);
  process.exit(1);
});
