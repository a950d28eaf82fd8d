import { Injectable, PipeTransform } from '@nestjs/common';
import { fieldErrors } from '@tareline/protocol';
import type { z } from 'zod';
import { InvalidInput } from './domain-errors.js';

/**
 * Validates a body, query or parameter with a protocol schema and answers 400 with every bad
 * field named: `@Body(new ZodValidationPipe(planRequestSchema)) body: PlanRequest`.
 */
@Injectable()
export class ZodValidationPipe<S extends z.ZodType> implements PipeTransform<unknown, z.infer<S>> {
  constructor(
    private readonly schema: S,
    private readonly message = 'Some fields are not valid',
  ) {}

  transform(value: unknown): z.infer<S> {
    const result = this.schema.safeParse(value);
    if (!result.success) {
      throw new InvalidInput(this.message, fieldErrors(result.error));
    }
    return result.data;
  }
}
