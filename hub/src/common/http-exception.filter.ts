import {
  ArgumentsHost,
  Catch,
  ExceptionFilter,
  HttpException,
  HttpStatus,
  Logger,
} from '@nestjs/common';
import type { ApiError } from '@tareline/protocol';
import type { Response } from 'express';

/**
 * Gives every error answer the protocol's {@link ApiError} shape. An unexpected error is logged
 * with its stack and answered 500 without internals: a 500 is a bug to fix, not a message.
 */
@Catch()
export class HttpExceptionFilter implements ExceptionFilter {
  private readonly logger = new Logger('Http');

  catch(exception: unknown, host: ArgumentsHost): void {
    if (host.getType() !== 'http') throw exception;
    const response = host.switchToHttp().getResponse<Response>();
    if (response.headersSent) return;
    if (exception instanceof HttpException) {
      const status = exception.getStatus();
      // Nest maps body-parser's SyntaxError to a 400 carrying the parser's own words.
      if (status === 400 && exception.cause instanceof SyntaxError) {
        response.status(status).json({
          message: 'The request body is not valid JSON',
          errors: [],
        } satisfies ApiError);
        return;
      }
      response.status(status).json(toApiError(exception.getResponse(), exception.message));
      return;
    }
    // Body-parser errors (malformed JSON, too large) carry their own 4xx status.
    const status = (exception as { status?: number; statusCode?: number }).status;
    if (typeof status === 'number' && status >= 400 && status < 500) {
      response.status(status).json({
        message:
          status === 400 ? 'The request body is not valid JSON' : (exception as Error).message,
        errors: [],
      } satisfies ApiError);
      return;
    }
    this.logger.error(exception instanceof Error ? exception : String(exception));
    response
      .status(HttpStatus.INTERNAL_SERVER_ERROR)
      .json({ message: 'Internal error: the hub logged it', errors: [] } satisfies ApiError);
  }
}

function toApiError(body: string | object, fallback: string): ApiError {
  if (typeof body === 'string') return { message: body, errors: [] };
  const b = body as { message?: unknown; errors?: unknown };
  const message = Array.isArray(b.message)
    ? b.message.join('; ')
    : typeof b.message === 'string'
      ? b.message
      : fallback;
  return { message, errors: Array.isArray(b.errors) ? (b.errors as ApiError['errors']) : [] };
}
