import { Module } from '@nestjs/common';
import { MailModule } from '../mail/mail.module';
import { AdminMailController } from './admin-mail.controller';

@Module({ imports: [MailModule], controllers: [AdminMailController] })
export class AdminModule {}
