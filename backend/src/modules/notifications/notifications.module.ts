import { Global, Module } from '@nestjs/common';
import { MailModule } from '../mail/mail.module';
import { NotificationsController } from './notifications.controller';
import { NotificationsService } from './notifications.service';

/**
 * Each person's notification choices, and the mails sent when passes finish and releases publish.
 * Global: the features that trigger notifications (readings, releases) only inject the service,
 * without importing this module into each of them.
 */
@Global()
@Module({
  imports: [MailModule],
  controllers: [NotificationsController],
  providers: [NotificationsService],
  exports: [NotificationsService],
})
export class NotificationsModule {}
