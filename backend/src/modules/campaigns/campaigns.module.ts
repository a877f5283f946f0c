import { Module } from '@nestjs/common';
import { AuditModule } from '../audit/audit.module';
import { CampaignAccessModule } from './campaign-access.module';
import { CampaignsController } from './campaigns.controller';
import { CampaignsService } from './campaigns.service';
import { MembersController } from './members.controller';
import { MembersService } from './members.service';

@Module({
  imports: [CampaignAccessModule, AuditModule],
  controllers: [CampaignsController, MembersController],
  providers: [CampaignsService, MembersService],
})
export class CampaignsModule {}
