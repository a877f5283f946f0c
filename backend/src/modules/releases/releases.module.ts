import { Module } from '@nestjs/common';
import { StorageModule } from '../../storage/storage.module';
import { AnalysesModule } from '../analyses/analyses.module';
import { AuditModule } from '../audit/audit.module';
import { CampaignAccessModule } from '../campaigns/campaign-access.module';
import { NotificationsModule } from '../notifications/notifications.module';
import { RunsModule } from '../runs/runs.module';
import { DashboardService } from './dashboard.service';
import { ReleasesController } from './releases.controller';
import { ReleasesService } from './releases.service';

/** Sign-off: release requests, signing (snapshot, hash, number, run locks), corrections, the lead's dashboard. */
@Module({
  imports: [CampaignAccessModule, AuditModule, StorageModule, RunsModule, AnalysesModule, NotificationsModule],
  controllers: [ReleasesController],
  providers: [ReleasesService, DashboardService],
  exports: [ReleasesService],
})
export class ReleasesModule {}
