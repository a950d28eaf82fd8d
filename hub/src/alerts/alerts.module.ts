import { Module } from '@nestjs/common';
import { APP_CONFIG, type AppConfig } from '../config/app-config.js';
import { AlertsController } from './alerts.controller.js';
import { AlertsRepository } from './alerts.repository.js';
import { AlertsService } from './alerts.service.js';
import { createMailTransport, MAIL_TRANSPORT } from './mail-transport.js';
import { OutboxSender } from './outbox-sender.js';

/**
 * Alert mails: batch changes become rows of a durable outbox for the people who chose them; a
 * sender delivers them (the configured SMTP server, or a local mail catcher) with retries.
 */
@Module({
  controllers: [AlertsController],
  providers: [
    AlertsRepository,
    {
      provide: MAIL_TRANSPORT,
      inject: [APP_CONFIG],
      useFactory: (config: AppConfig) => createMailTransport(config.mail),
    },
    OutboxSender,
    AlertsService,
  ],
})
export class AlertsModule {}
