import type { INestApplication } from '@nestjs/common';
import { NestFactory } from '@nestjs/core';
import type { NestExpressApplication } from '@nestjs/platform-express';
import helmet from 'helmet';
import { AppModule } from './app.module.js';
import type { AppConfig } from './config/app-config.js';
import { ApiExceptionFilter } from './common/api-exception.filter.js';
import { PostgresIoAdapter } from './live/postgres-io.adapter.js';
import { PinoLogger } from './logger/pino-logger.js';

/**
 * Security headers on every answer, the station's pages included. The built station loads its
 * script, styles and fonts as files from the hub and talks only to the hub (REST and the live
 * socket), so everything is 'self' and nothing inline runs; React's `style` props go through the
 * CSS object model, which a policy does not block. The hub serves plain HTTP on the shop's
 * network: no upgrade of requests to HTTPS and no HSTS, which would lock browsers out of it.
 */
const securityHeaders = helmet({
  contentSecurityPolicy: {
    useDefaults: false,
    directives: {
      defaultSrc: ["'self'"],
      baseUri: ["'self'"],
      connectSrc: ["'self'"],
      fontSrc: ["'self'"],
      formAction: ["'self'"],
      frameAncestors: ["'none'"],
      imgSrc: ["'self'"],
      objectSrc: ["'none'"],
      scriptSrc: ["'self'"],
      scriptSrcAttr: ["'none'"],
      styleSrc: ["'self'"],
    },
  },
  referrerPolicy: { policy: 'no-referrer' },
  strictTransportSecurity: false,
  xFrameOptions: { action: 'deny' },
});

/** Builds the hub (not yet listening): shared by `main.ts` and the end-to-end tests. */
export async function createApp(config: AppConfig): Promise<INestApplication> {
  const logger = new PinoLogger(config.log.level);
  const app = await NestFactory.create<NestExpressApplication>(AppModule.forRoot(config), {
    logger,
    abortOnError: false,
  });
  if (config.database.url) {
    // Several hubs on one server: live events reach the screens on every hub.
    app.useWebSocketAdapter(new PostgresIoAdapter(app, config.database.url));
  }
  app.use(securityHeaders);
  app.setGlobalPrefix('api');
  app.useGlobalFilters(new ApiExceptionFilter());
  app.disable('x-powered-by');
  return app;
}
