import { Module } from '@nestjs/common';
import { AuditModule } from '../audit/audit.module';
import { CalibrationsModule } from '../calibrations/calibrations.module';
import { CampaignAccessModule } from '../campaigns/campaign-access.module';
import { AnalysesController, CampaignAnalysesController, RunSeriesController } from './analyses.controller';
import { AnalysesService } from './analyses.service';
import { SeriesService } from './series.service';

/** Channel series and named analyses (stable values, balances) with their stale marking. */
@Module({
  imports: [CampaignAccessModule, AuditModule, CalibrationsModule],
  controllers: [RunSeriesController, CampaignAnalysesController, AnalysesController],
  providers: [SeriesService, AnalysesService],
  exports: [AnalysesService],
})
export class AnalysesModule {}
