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
import { BatchRefusal } from '../batches/batch-machine.js';
import {
  BenchBusy,
  Conflict,
  DomainError,
  InvalidInput,
  LockedOut,
  NotAllowed,
  NotApplicable,
  NotFound,
  NotSignedIn,
  ScaleCommandFailed,
  StoreUnavailable,
  TooLarge,
  UnsupportedType,
} from './domain-errors.js';

type DomainErrorClass = abstract new (...args: never[]) => DomainError;

/** The one table from what went wrong to the HTTP status a client sees. */
const STATUS_OF: ReadonlyArray<readonly [DomainErrorClass, (err: DomainError) => number]> = [
  [InvalidInput, () => HttpStatus.BAD_REQUEST],
  [NotSignedIn, () => HttpStatus.UNAUTHORIZED],
  [NotAllowed, () => HttpStatus.FORBIDDEN],
  [NotFound, () => HttpStatus.NOT_FOUND],
  [Conflict, () => HttpStatus.CONFLICT],
  [BenchBusy, () => HttpStatus.CONFLICT],
  [NotApplicable, () => HttpStatus.UNPROCESSABLE_ENTITY],
  [LockedOut, () => HttpStatus.LOCKED],
  [UnsupportedType, () => HttpStatus.UNSUPPORTED_MEDIA_TYPE],
  [TooLarge, () => HttpStatus.PAYLOAD_TOO_LARGE],
  // A balance that answered "busy" (moving, overloaded) is the operator's to wait out: 409.
  // One that did not answer at all is a service that is away: 503.
  [
    ScaleCommandFailed,
    (err) =>
      (err as ScaleCommandFailed).reason === 'busy'
        ? HttpStatus.CONFLICT
        : HttpStatus.SERVICE_UNAVAILABLE,
  ],
  [StoreUnavailable, () => HttpStatus.SERVICE_UNAVAILABLE],
];

export function statusOf(err: DomainError): number {
  const entry = STATUS_OF.find(([type]) => err instanceof type);
  return entry ? entry[1](err) : HttpStatus.INTERNAL_SERVER_ERROR;
}

/**
 * Turns every error into the protocol's {@link ApiError} shape: domain errors through the table
 * above, a refused batch step as 409 naming its code, Nest's and body-parser's own HTTP errors
 * as they are. Anything else is a bug: logged by its name, message and stack only (a database
 * error's message can carry the query's parameters, hashes included) and answered 500 without
 * internals.
 */
@Catch()
export class ApiExceptionFilter implements ExceptionFilter {
  private readonly logger = new Logger('Http');

  catch(exception: unknown, host: ArgumentsHost): void {
    if (host.getType() !== 'http') throw exception;
    const response = host.switchToHttp().getResponse<Response>();
    if (response.headersSent) return;
    const [status, body] = this.answer(exception);
    if (exception instanceof LockedOut) {
      response.setHeader('Retry-After', String(exception.retryAfterS));
    }
    response.status(status).json(body);
  }

  private answer(exception: unknown): [number, ApiError] {
    if (exception instanceof DomainError) {
      const status = statusOf(exception);
      if (
        status >= 500 &&
        !(exception instanceof StoreUnavailable || exception instanceof ScaleCommandFailed)
      ) {
        this.logUnexpected(exception);
      }
      return [status, { message: exception.message, errors: exception.errors }];
    }
    if (exception instanceof BatchRefusal) {
      return [
        HttpStatus.CONFLICT,
        {
          message: exception.message,
          errors: [{ path: exception.code, message: exception.message }],
        },
      ];
    }
    if (exception instanceof HttpException) {
      const status = exception.getStatus();
      // Nest maps body-parser's SyntaxError to a 400 carrying the parser's own words.
      if (status === 400 && exception.cause instanceof SyntaxError) {
        return [status, { message: 'The request body is not valid JSON', errors: [] }];
      }
      if (status >= 500) this.logUnexpected(exception);
      return [status, toApiError(exception.getResponse(), exception.message)];
    }
    // Body-parser errors (malformed JSON, too large) carry their own 4xx status.
    const status = (exception as { status?: number; statusCode?: number } | null)?.status;
    if (typeof status === 'number' && status >= 400 && status < 500) {
      return [
        status,
        {
          message:
            status === 400 ? 'The request body is not valid JSON' : (exception as Error).message,
          errors: [],
        },
      ];
    }
    this.logUnexpected(exception);
    return [
      HttpStatus.INTERNAL_SERVER_ERROR,
      { message: 'Internal error: the hub logged it', errors: [] },
    ];
  }

  private logUnexpected(exception: unknown): void {
    this.logger.error(describeWithoutParameters(exception));
  }
}

/**
 * An error as one line and its stack, without what a database driver attaches: Drizzle's
 * "Failed query: … params: …" message and a driver's `query`/`parameters` fields would put
 * password and PIN hashes in the log.
 */
export function describeWithoutParameters(err: unknown): string {
  if (!(err instanceof Error)) return 'A non-error value was thrown';
  const message = err.message.replace(/\nparams:[\s\S]*$/u, '').replace(/params:.*$/su, '');
  const cause =
    err.cause instanceof Error ? ` (cause: ${describeWithoutParameters(err.cause)})` : '';
  const stack = (err.stack ?? '')
    .split('\n')
    .filter((line) => /^\s+at /u.test(line))
    .join('\n');
  return `${err.name}: ${message}${cause}${stack ? `\n${stack}` : ''}`;
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
