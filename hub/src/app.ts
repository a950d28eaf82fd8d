import type { INestApplication } from '@nestjs/common';
import { NestFactory } from '@nestjs/core';
import type { NestExpressApplication } from '@nestjs/platform-express';
import { AppModule } from './app.module.js';
import type { AppConfig } from './config/app-config.js';
import { ApiExceptionFilter } from './common/api-exception.filter.js';
import { PinoLogger } from './logger/pino-logger.js';

/** Builds the hub (not yet listening): shared by `main.ts` and the end-to-end tests. */
export async function createApp(config: AppConfig): Promise<INestApplication> {
  const logger = new PinoLogger(config.log.level);
  const app = await NestFactory.create<NestExpressApplication>(AppModule.forRoot(config), {
    logger,
    abortOnError: false,
  });
  app.setGlobalPrefix('api');
  app.useGlobalFilters(new ApiExceptionFilter());
  app.disable('x-powered-by');
  return app;
}
