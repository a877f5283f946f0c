import { Module } from '@nestjs/common';
import { AppConfig } from '../config/app-config';
import { buildStorageDriver, StorageService } from './storage.service';

@Module({
  providers: [
    {
      provide: StorageService,
      inject: [AppConfig],
      useFactory: (config: AppConfig) => new StorageService(config, buildStorageDriver(config)),
    },
  ],
  exports: [StorageService],
})
export class StorageModule {}
