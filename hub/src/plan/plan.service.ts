import { Injectable } from '@nestjs/common';
import {
  computePlan,
  MixInputError,
  type PlanRequest,
  type PlanResponse,
} from '@tareline/protocol';
import { InvalidInput } from '../common/domain-errors.js';

@Injectable()
export class PlanService {
  /**
   * The pour plan for a validated request. The schema already runs the same math, so a
   * {@link MixInputError} here means a caller skipped it; it still becomes a 400 naming the field.
   */
  compute(request: PlanRequest): PlanResponse {
    try {
      return computePlan(request);
    } catch (err) {
      if (err instanceof MixInputError) {
        throw new InvalidInput('The plan request has mistakes', [
          { path: err.field, message: err.message },
        ]);
      }
      throw err;
    }
  }
}
