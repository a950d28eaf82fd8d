import { BadRequestException, Injectable } from '@nestjs/common';
import {
  computePlan,
  MixInputError,
  type ApiError,
  type PlanRequest,
  type PlanResponse,
} from '@tareline/protocol';

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
        const body: ApiError = {
          message: 'The plan request has mistakes',
          errors: [{ path: err.field, message: err.message }],
        };
        throw new BadRequestException(body);
      }
      throw err;
    }
  }
}
