import { Module } from '@nestjs/common';
import { TypeOrmModule } from '@nestjs/typeorm';
import { StorageModule } from '../../storage/storage.module';
import { AuditModule } from '../audit/audit.module';
import { CampaignAccessModule } from '../campaigns/campaign-access.module';
import { RecordingEntity } from '../recordings/recording.entity';
import { RunAccessService } from './run-access.service';
import { RunEntity } from './run.entity';
import { CampaignRunsController, RunsController } from './runs.controller';
import { RunsService } from './runs.service';

@Module({
  imports: [TypeOrmModule.forFeature([RunEntity, RecordingEntity]), CampaignAccessModule, AuditModule, StorageModule],
  controllers: [CampaignRunsController, RunsController],
  providers: [RunsService, RunAccessService],
  exports: [RunAccessService],
})
export class RunsModule {}
