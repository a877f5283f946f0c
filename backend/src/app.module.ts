import { DynamicModule, Module, type ModuleMetadata } from '@nestjs/common';
import { ServeStaticModule } from '@nestjs/serve-static';
import { ThrottlerModule } from '@nestjs/throttler';
import { TypeOrmModule } from '@nestjs/typeorm';
import { existsSync } from 'node:fs';
import { join } from 'node:path';
import { AppConfig } from './config/app-config';
import { ConfigModule } from './config/config.module';
import { buildDataSourceOptions } from './database/data-source-options';
import { AdminModule } from './modules/admin/admin.module';
import { AnalysisRecomputeModule } from './modules/analyses/analysis-recompute.module';
import { AnalysesModule } from './modules/analyses/analyses.module';
import { AuditModule } from './modules/audit/audit.module';
import { AuthModule } from './modules/auth/auth.module';
import { CalibrationsModule } from './modules/calibrations/calibrations.module';
import { CampaignsModule } from './modules/campaigns/campaigns.module';
import { ChannelsModule } from './modules/channels/channels.module';
import { HealthModule } from './modules/health/health.module';
import { InvitationsModule } from './modules/invitations/invitations.module';
import { MailModule } from './modules/mail/mail.module';
import { RecordingsModule } from './modules/recordings/recordings.module';
import { RunsModule } from './modules/runs/runs.module';
import { ReadingsModule } from './modules/readings/readings.module';
import { SheetsModule } from './modules/sheets/sheets.module';
import { UsersModule } from './modules/users/users.module';
import { ReleasesModule } from './modules/releases/releases.module';
import { ExportsModule } from './modules/exports/exports.module';
import { NotificationsModule } from './modules/notifications/notifications.module';

/** Everything under /api, which must never fall back to the web app's index.html. */
export const API_PATHS = /^\/api(\/|$)/;

@Module({})
export class AppModule {
  static forRoot(config: AppConfig): DynamicModule {
    const imports: NonNullable<ModuleMetadata['imports']> = [
      ConfigModule.forRoot(config),
      TypeOrmModule.forRoot({
        ...buildDataSourceOptions(config.databaseUrl),
        // Start-up waits a little for a database that is still coming up, then fails loudly.
        retryAttempts: 5,
        retryDelay: 2000,
      }),
      ThrottlerModule.forRoot({
        throttlers: [{ name: 'sign-in', ttl: 60_000, limit: config.throttleLoginLimit }],
        errorMessage: 'Too many attempts. Wait a minute and try again.',
      }),
      AuthModule,
      UsersModule,
      CampaignsModule,
      InvitationsModule,
      AuditModule,
      MailModule,
      HealthModule,
      AdminModule,
      RunsModule,
      RecordingsModule,
      ChannelsModule,
      SheetsModule,
      ReadingsModule,
      CalibrationsModule,
      AnalysesModule,
      AnalysisRecomputeModule,
      ReleasesModule,
      ExportsModule,
      NotificationsModule,
    ];
    if (existsSync(join(config.frontendDir, 'index.html'))) {
      imports.push(
        ServeStaticModule.forRoot({
          rootPath: config.frontendDir,
          exclude: API_PATHS,
          serveStaticOptions: { index: 'index.html', fallthrough: true },
        }),
      );
    }
    return { module: AppModule, imports };
  }
}
