import { BadRequestException, Injectable, PipeTransform } from '@nestjs/common';
import { fieldErrors, type ApiError } from '@tareline/protocol';
import type { z } from 'zod';

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
      const body: ApiError = { message: this.message, errors: fieldErrors(result.error) };
      throw new BadRequestException(body);
    }
    return result.data;
  }
}
