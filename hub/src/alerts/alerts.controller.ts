import { Body, Controller, Get, Inject, Param, Put } from '@nestjs/common';
import {
  alertSubscriptionRequestSchema,
  personIdSchema,
  type AlertSubscription,
  type CaughtMail,
  type OutboxMessage,
} from '@tareline/protocol';
import type { z } from 'zod';
import { Roles } from '../auth/access.decorator.js';
import type { AuthUser } from '../auth/auth-user.js';
import { CurrentUser } from '../auth/current-user.decorator.js';
import { ZodValidationPipe } from '../common/zod-validation.pipe.js';
import { AlertsService } from './alerts.service.js';

const personId = new ZodValidationPipe(personIdSchema, 'Not a person id');
const subscriptionBody = new ZodValidationPipe(alertSubscriptionRequestSchema);
type SubscriptionBody = z.output<typeof alertSubscriptionRequestSchema>;

@Controller()
export class AlertsController {
  constructor(@Inject(AlertsService) private readonly alerts: AlertsService) {}

  @Get('me/alerts')
  @Roles('operator', 'lead', 'admin')
  mine(@CurrentUser() user: AuthUser): Promise<AlertSubscription> {
    return this.alerts.subscription(user.id);
  }

  @Put('me/alerts')
  @Roles('operator', 'lead', 'admin')
  setMine(
    @CurrentUser() user: AuthUser,
    @Body(subscriptionBody) body: SubscriptionBody,
  ): Promise<AlertSubscription> {
    return this.alerts.subscribe(user.id, body.events);
  }

  @Get('people/:id/alerts')
  @Roles('admin')
  ofPerson(@Param('id', personId) id: string): Promise<AlertSubscription> {
    return this.alerts.subscription(id);
  }

  @Put('people/:id/alerts')
  @Roles('admin')
  setOfPerson(
    @Param('id', personId) id: string,
    @Body(subscriptionBody) body: SubscriptionBody,
  ): Promise<AlertSubscription> {
    return this.alerts.subscribe(id, body.events);
  }

  @Get('outbox')
  @Roles('admin')
  outbox(): Promise<OutboxMessage[]> {
    return this.alerts.outbox();
  }

  @Get('mail-catcher')
  @Roles('admin')
  caught(): CaughtMail[] {
    return this.alerts.caughtMail();
  }
}
