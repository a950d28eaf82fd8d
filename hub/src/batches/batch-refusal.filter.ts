import { ArgumentsHost, Catch, ExceptionFilter } from '@nestjs/common';
import type { ApiError } from '@tareline/protocol';
import type { Response } from 'express';
import { BatchRefusal } from './batch-machine.js';

/** A refused batch step is the operator's to fix (tare first, wait for steady): 409 with why. */
@Catch(BatchRefusal)
export class BatchRefusalFilter implements ExceptionFilter {
  catch(refusal: BatchRefusal, host: ArgumentsHost): void {
    host
      .switchToHttp()
      .getResponse<Response>()
      .status(409)
      .json({
        message: refusal.message,
        errors: [{ path: refusal.code, message: refusal.message }],
      } satisfies ApiError);
  }
}
