import { Controller, Get, Inject, Query } from '@nestjs/common';
import { accuracyQuerySchema, type AccuracyAnswer } from '@tareline/protocol';
import type { z } from 'zod';
import { Roles } from '../auth/access.decorator.js';
import { ZodValidationPipe } from '../common/zod-validation.pipe.js';
import { BatchDeskService } from './batch-desk.service.js';

/** How close to the ratio each material, bench or operator came over time. */
@Controller('accuracy')
@Roles('lead', 'admin')
export class AccuracyController {
  constructor(@Inject(BatchDeskService) private readonly desk: BatchDeskService) {}

  @Get()
  get(
    @Query(new ZodValidationPipe(accuracyQuerySchema)) q: z.output<typeof accuracyQuerySchema>,
  ): Promise<AccuracyAnswer> {
    return this.desk.accuracy(q);
  }
}
