import { Module } from '@nestjs/common';
import { MailService } from './mail.service';
import { MailTransport } from './mail.transport';
import { MailboxService } from './mailbox.service';
import { NotificationPreferences } from './notification-preferences.service';

@Module({
  providers: [MailTransport, MailService, MailboxService, NotificationPreferences],
  exports: [MailService, MailboxService, NotificationPreferences],
})
export class MailModule {}
