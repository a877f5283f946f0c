import { Module } from '@nestjs/common';
import { TypeOrmModule } from '@nestjs/typeorm';
import { CampaignAccessService } from './campaign-access.service';
import { CampaignMemberEntity } from './campaign-member.entity';
import { CampaignEntity } from './campaign.entity';

/** Separate from CampaignsModule so audit and invitations can check access without a cycle. */
@Module({
  imports: [TypeOrmModule.forFeature([CampaignEntity, CampaignMemberEntity])],
  providers: [CampaignAccessService],
  exports: [CampaignAccessService, TypeOrmModule],
})
export class CampaignAccessModule {}
