import { Module } from '@nestjs/common';
import { BatchesModule } from '../batches/batches.module.js';
import { APP_CONFIG, type AppConfig } from '../config/app-config.js';
import { AlertsController } from './alerts.controller.js';
import { AlertsRepository } from './alerts.repository.js';
import { AlertsService } from './alerts.service.js';
import { createMailTransport, MAIL_TRANSPORT } from './mail-transport.js';
import { DailySummary } from './daily-summary.js';
import { OutboxSender } from './outbox-sender.js';

/**
 * Alert mails: batch writes also store rows of a durable outbox (one transaction) for the people who chose them; a
 * sender delivers them (the configured SMTP server, or a local mail catcher) with retries.
 */
@Module({
  imports: [BatchesModule],
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
    DailySummary,
  ],
})
export class AlertsModule {}
