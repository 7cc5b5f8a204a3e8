import 'reflect-metadata';
import { Logger, type INestApplication, type LoggerService } from '@nestjs/common';
import { NestFactory } from '@nestjs/core';
import type { NestExpressApplication } from '@nestjs/platform-express';
import { DocumentBuilder, SwaggerModule } from '@nestjs/swagger';
import { AppModule } from './app.module';
import type { KilnConfig } from './config/config.schema';
import { serveWebApp } from './web/serve-web-app';

export interface CreateAppOptions {
  /** Nest's logger; `false` silences it (tests). */
  logger?: LoggerService | false;
}

/** Builds the API (and the web app beside it) without listening; used by main.ts and the tests. */
export async function createApp(config: KilnConfig, options: CreateAppOptions = {}): Promise<INestApplication> {
  const app = await NestFactory.create<NestExpressApplication>(AppModule.forConfig(config), {
    logger: options.logger ?? new Logger(),
    bufferLogs: false,
  });
  app.setGlobalPrefix('api');
  app.enableShutdownHooks();
  app.set('trust proxy', 'loopback');
  app.useBodyParser('json', { limit: '2mb' });

  const document = SwaggerModule.createDocument(
    app,
    new DocumentBuilder()
      .setTitle('Kiln API')
      .setDescription('Launch sweeps of geometric heat-flow runs, watch them, triage blow-up candidates.')
      .addBearerAuth()
      .build(),
  );
  SwaggerModule.setup('api/docs', app, document);

  serveWebApp(app.getHttpAdapter().getInstance(), config.KILN_WEB_DIR);
  return app;
}
