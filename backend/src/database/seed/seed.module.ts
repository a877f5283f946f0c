import { DynamicModule, Module } from '@nestjs/common';
import { TypeOrmModule } from '@nestjs/typeorm';
import { AppConfig } from '../../config/app-config';
import { ConfigModule } from '../../config/config.module';
import { RecordingsModule } from '../../modules/recordings/recordings.module';
import { RunsModule } from '../../modules/runs/runs.module';
import { buildDataSourceOptions } from '../data-source-options';

/** The services the seed uses to add demo videos, without HTTP (cli/seed.ts). */
@Module({})
export class SeedModule {
  static forRoot(config: AppConfig): DynamicModule {
    return {
      module: SeedModule,
      imports: [
        ConfigModule.forRoot(config),
        TypeOrmModule.forRoot({ ...buildDataSourceOptions(config.databaseUrl), retryAttempts: 2, retryDelay: 1000 }),
        RunsModule,
        RecordingsModule,
      ],
    };
  }
}
