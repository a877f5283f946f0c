import { Module } from '@nestjs/common';
import { TypeOrmModule } from '@nestjs/typeorm';
import { AuditModule } from '../audit/audit.module';
import { CampaignAccessModule } from '../campaigns/campaign-access.module';
import { ReadingEntity } from './reading.entity';
import { ReadingsController } from './readings.controller';
import { ReadingsService } from './readings.service';
import { SheetGridService } from './sheet-grid.service';

@Module({
  imports: [TypeOrmModule.forFeature([ReadingEntity]), CampaignAccessModule, AuditModule],
  controllers: [ReadingsController],
  providers: [ReadingsService, SheetGridService],
})
export class ReadingsModule {}
