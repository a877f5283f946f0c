import { DynamicModule, Module } from '@nestjs/common';
import { TypeOrmModule } from '@nestjs/typeorm';
import { AppConfig } from './config/app-config';
import { ConfigModule } from './config/config.module';
import { buildDataSourceOptions } from './database/data-source-options';
import { AnalysisRecomputeModule } from './modules/analyses/analysis-recompute.module';
import { RecordingProcessingModule } from './modules/recordings/processing/recording-processing.module';

/** Everything a job worker needs and nothing that serves HTTP (cli/worker.ts): recordings and the analysis recompute. */
@Module({})
export class WorkerModule {
  static forRoot(config: AppConfig): DynamicModule {
    return {
      module: WorkerModule,
      imports: [
        ConfigModule.forRoot(config),
        TypeOrmModule.forRoot({ ...buildDataSourceOptions(config.databaseUrl), retryAttempts: 5, retryDelay: 2000 }),
        RecordingProcessingModule,
        AnalysisRecomputeModule,
      ],
    };
  }
}
