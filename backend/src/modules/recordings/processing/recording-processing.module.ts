import { Module } from '@nestjs/common';
import { JobsModule } from '../../../jobs/jobs.module';
import { StorageModule } from '../../../storage/storage.module';
import { FfmpegRunner } from '../media/ffmpeg-runner';
import { RecordingProcessor } from './recording-processor';

/**
 * The processing job on its own, so the worker process (cli/worker.ts) can run it without the
 * HTTP side of recordings.
 */
@Module({
  imports: [StorageModule, JobsModule],
  providers: [FfmpegRunner, RecordingProcessor],
  exports: [RecordingProcessor],
})
export class RecordingProcessingModule {}
