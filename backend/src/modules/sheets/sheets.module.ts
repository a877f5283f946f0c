import { Module } from '@nestjs/common';
import { TypeOrmModule } from '@nestjs/typeorm';
import { AuditModule } from '../audit/audit.module';
import { CampaignAccessModule } from '../campaigns/campaign-access.module';
import { MailModule } from '../mail/mail.module';
import { RunsModule } from '../runs/runs.module';
import { SheetChannelEntity } from './sheet-channel.entity';
import { SheetEntity } from './sheet.entity';
import { RunSheetsController, SheetsController } from './sheets.controller';
import { SheetsService } from './sheets.service';

@Module({
  imports: [TypeOrmModule.forFeature([SheetEntity, SheetChannelEntity]), CampaignAccessModule, AuditModule, RunsModule, MailModule],
  controllers: [RunSheetsController, SheetsController],
  providers: [SheetsService],
})
export class SheetsModule {}
