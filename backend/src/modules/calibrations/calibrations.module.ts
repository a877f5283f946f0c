import { Module } from '@nestjs/common';
import { AuditModule } from '../audit/audit.module';
import { CampaignAccessModule } from '../campaigns/campaign-access.module';
import { AnalysisSetupAccess } from './analysis-setup-access';
import {
  CampaignAnalysisSetupController,
  ChannelCalibrationController,
  DerivedChannelController,
  StabilityRuleController,
} from './calibrations.controller';
import { CalibrationsService } from './calibrations.service';
import { DerivedChannelsService } from './derived-channels.service';
import { StabilityRulesService } from './stability-rules.service';

/** What the engineer sets up before analysing: calibration chains, derived channels, stability rules. */
@Module({
  imports: [CampaignAccessModule, AuditModule],
  controllers: [CampaignAnalysisSetupController, ChannelCalibrationController, DerivedChannelController, StabilityRuleController],
  providers: [AnalysisSetupAccess, CalibrationsService, DerivedChannelsService, StabilityRulesService],
  exports: [AnalysisSetupAccess],
})
export class CalibrationsModule {}
