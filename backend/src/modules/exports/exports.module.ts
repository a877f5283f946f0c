import { Module } from '@nestjs/common';
import { StorageModule } from '../../storage/storage.module';
import { CampaignAccessModule } from '../campaigns/campaign-access.module';
import { ReleasesModule } from '../releases/releases.module';
import { ExportsController } from './exports.controller';
import { ExportsService } from './exports.service';

/** Files out: published releases from their snapshots, and drafts of live data. */
@Module({
  imports: [CampaignAccessModule, StorageModule, ReleasesModule],
  controllers: [ExportsController],
  providers: [ExportsService],
})
export class ExportsModule {}
