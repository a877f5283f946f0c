import { Module } from '@nestjs/common';
import { MulterModule } from '@nestjs/platform-express';
import { TypeOrmModule } from '@nestjs/typeorm';
import { AppConfig } from '../../config/app-config';
import { StorageModule } from '../../storage/storage.module';
import { StorageService } from '../../storage/storage.service';
import { AuditModule } from '../audit/audit.module';
import { CampaignAccessModule } from '../campaigns/campaign-access.module';
import { RunsModule } from '../runs/runs.module';
import { MediaController } from './media.controller';
import { RecordingProcessingModule } from './processing/recording-processing.module';
import { RecordingFrameTimesEntity } from './recording-frame-times.entity';
import { RecordingEntity } from './recording.entity';
import { RecordingsController } from './recordings.controller';
import { RecordingsService } from './recordings.service';
import { UploadAccessGuard } from './upload/upload-access.guard';
import { UploadErrorsInterceptor } from './upload/upload-errors.interceptor';
import { uploadOptions } from './upload/upload-options';

@Module({
  imports: [
    TypeOrmModule.forFeature([RecordingEntity, RecordingFrameTimesEntity]),
    MulterModule.registerAsync({
      imports: [StorageModule],
      inject: [StorageService, AppConfig],
      useFactory: (storage: StorageService, config: AppConfig) => uploadOptions(storage.tmpDir, config.uploadMaxBytes),
    }),
    CampaignAccessModule,
    AuditModule,
    StorageModule,
    RunsModule,
    RecordingProcessingModule,
  ],
  controllers: [RecordingsController, MediaController],
  providers: [RecordingsService, UploadAccessGuard, UploadErrorsInterceptor],
  exports: [RecordingsService],
})
export class RecordingsModule {}
