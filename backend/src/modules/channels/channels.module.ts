import { Module } from '@nestjs/common';
import { TypeOrmModule } from '@nestjs/typeorm';
import { AuditModule } from '../audit/audit.module';
import { CampaignAccessModule } from '../campaigns/campaign-access.module';
import { RunsModule } from '../runs/runs.module';
import { ChannelEntity } from './channel.entity';
import { CampaignChannelsController, ChannelsController, RunDisplayRegionsController } from './channels.controller';
import { ChannelsService } from './channels.service';
import { DisplayRegionEntity } from './display-region.entity';
import { DisplayRegionsService } from './display-regions.service';

@Module({
  imports: [TypeOrmModule.forFeature([ChannelEntity, DisplayRegionEntity]), CampaignAccessModule, AuditModule, RunsModule],
  controllers: [CampaignChannelsController, ChannelsController, RunDisplayRegionsController],
  providers: [ChannelsService, DisplayRegionsService],
  exports: [ChannelsService],
})
export class ChannelsModule {}
