import { Body, Controller, Get, Inject, Param, Patch, Post } from '@nestjs/common';
import {
  pourPlanIdSchema,
  pourPlanInputSchema,
  pourPlanPatchSchema,
  type PourPlan,
} from '@tareline/protocol';
import type { z } from 'zod';
import { Roles } from '../auth/access.decorator.js';
import type { AuthUser } from '../auth/auth-user.js';
import { CurrentUser } from '../auth/current-user.decorator.js';
import { ZodValidationPipe } from '../common/zod-validation.pipe.js';
import { PourPlansService } from './pour-plans.service.js';

const planId = new ZodValidationPipe(pourPlanIdSchema, 'Not a pour plan id');

/** Saved pour plans: leads keep them, everyone signed in pours from them. */
@Controller('pour-plans')
export class PourPlansController {
  constructor(@Inject(PourPlansService) private readonly plans: PourPlansService) {}

  @Get()
  @Roles('operator', 'lead', 'admin')
  list(): Promise<PourPlan[]> {
    return this.plans.list();
  }

  @Get(':id')
  @Roles('operator', 'lead', 'admin')
  get(@Param('id', planId) id: string): Promise<PourPlan> {
    return this.plans.get(id);
  }

  @Post()
  @Roles('lead', 'admin')
  create(
    @Body(new ZodValidationPipe(pourPlanInputSchema, 'The pour plan is not saved'))
    body: z.output<typeof pourPlanInputSchema>,
    @CurrentUser() user: AuthUser,
  ): Promise<PourPlan> {
    return this.plans.create(body, user);
  }

  @Patch(':id')
  @Roles('lead', 'admin')
  update(
    @Param('id', planId) id: string,
    @Body(new ZodValidationPipe(pourPlanPatchSchema, 'The pour plan is not changed'))
    body: z.output<typeof pourPlanPatchSchema>,
  ): Promise<PourPlan> {
    return this.plans.update(id, body);
  }
}
