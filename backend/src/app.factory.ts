import { type INestApplication, type LogLevel, ValidationPipe } from '@nestjs/common';
import { NestFactory } from '@nestjs/core';
import type { NestExpressApplication } from '@nestjs/platform-express';
import { DocumentBuilder, SwaggerModule } from '@nestjs/swagger';
import helmet from 'helmet';
import type { Server } from 'node:http';
import { AppModule } from './app.module';
import { AppConfig } from './config/app-config';
import { AllExceptionsFilter } from './core/filters/all-exceptions.filter';
import { BodyShapePipe } from './core/pipes/body-shape.pipe';

export interface CreateAppOptions {
  logger?: LogLevel[] | false;
}

/** Builds the application exactly as it runs in production; tests call this too. */
export async function createApp(config: AppConfig, options: CreateAppOptions = {}): Promise<NestExpressApplication> {
  const app = await NestFactory.create<NestExpressApplication>(AppModule.forRoot(config), {
    logger: options.logger ?? ['log', 'warn', 'error', 'fatal'],
  });
  configureApp(app);
  configureServer(app.getHttpServer() as Server);
  return app;
}

/** A connection that moves no byte for this long is dropped (a stalled upload frees its temp file). */
export const IDLE_SOCKET_TIMEOUT_MS = 120_000;

/**
 * Node ends any request that takes longer than five minutes to arrive, which a multi-gigabyte
 * upload over a lab network easily does. The whole-request limit is lifted; a connection that
 * goes silent is still closed, and slow headers are still refused (headersTimeout).
 */
export function configureServer(server: Server): void {
  server.requestTimeout = 0;
  server.setTimeout(IDLE_SOCKET_TIMEOUT_MS);
}

/** Global prefix, security headers, validation, error shape and API docs. */
export function configureApp(app: INestApplication): void {
  app.setGlobalPrefix('api');
  app.use(
    helmet({
      contentSecurityPolicy: {
        useDefaults: false,
        directives: {
          defaultSrc: ["'self'"],
          scriptSrc: ["'self'"],
          // antd writes component styles at runtime into <style> elements.
          styleSrc: ["'self'", "'unsafe-inline'"],
          imgSrc: ["'self'", 'data:', 'blob:'],
          fontSrc: ["'self'", 'data:'],
          mediaSrc: ["'self'", 'blob:'],
          connectSrc: ["'self'"],
          workerSrc: ["'self'", 'blob:'],
          objectSrc: ["'none'"],
          baseUri: ["'self'"],
          formAction: ["'self'"],
          frameAncestors: ["'none'"],
        },
      },
    }),
  );
  app.useGlobalPipes(
    new BodyShapePipe(),
    new ValidationPipe({
      whitelist: true,
      forbidNonWhitelisted: true,
      transform: true,
    }),
  );
  app.useGlobalFilters(new AllExceptionsFilter());
  app.enableShutdownHooks();

  const document = SwaggerModule.createDocument(
    app,
    new DocumentBuilder()
      .setTitle('Dialsheet API')
      .setDescription('Campaigns, people and their roles, invitations and the audit trail.')
      .setVersion('0.1.0')
      .addBearerAuth()
      .build(),
  );
  SwaggerModule.setup('api/docs', app, document, {
    jsonDocumentUrl: 'api/docs-json',
    customSiteTitle: 'Dialsheet API',
  });
}
