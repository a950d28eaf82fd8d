import { Body, Controller, HttpCode, HttpStatus, Inject, Post } from '@nestjs/common';
import { planRequestSchema, type PlanRequest, type PlanResponse } from '@tareline/protocol';
import { Public } from '../auth/access.decorator.js';
import { ZodValidationPipe } from '../common/zod-validation.pipe.js';
import { PlanService } from './plan.service.js';

@Controller('plan')
export class PlanController {
  constructor(@Inject(PlanService) private readonly plans: PlanService) {}

  /** Computes a pour plan and stores nothing, so anyone may ask. */
  @Post()
  @Public()
  @HttpCode(HttpStatus.OK)
  plan(
    @Body(new ZodValidationPipe(planRequestSchema, 'The plan request has mistakes'))
    request: PlanRequest,
  ): PlanResponse {
    return this.plans.compute(request);
  }
}
