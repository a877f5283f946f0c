import { Module } from '@nestjs/common';
import { MailService } from './mail.service';
import { MailTransport } from './mail.transport';
import { MailboxService } from './mailbox.service';

@Module({
  providers: [MailTransport, MailService, MailboxService],
  exports: [MailService, MailboxService],
})
export class MailModule {}
