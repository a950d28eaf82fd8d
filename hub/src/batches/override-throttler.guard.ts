import { Injectable, type ExecutionContext } from '@nestjs/common';
import { ThrottlerGuard } from '@nestjs/throttler';

/**
 * The sign-in throttle, for requests that carry a lead's password (`override`): each counts
 * against the address's sign-in budget, like a sign-in. Requests without one are not counted, so
 * an ordinary batch start never uses up a lead's sign-in attempts.
 */
@Injectable()
export class OverrideThrottlerGuard extends ThrottlerGuard {
  protected override shouldSkip(context: ExecutionContext): Promise<boolean> {
    const body = context.switchToHttp().getRequest<{ body?: { override?: unknown } }>().body;
    return Promise.resolve(!body || typeof body !== 'object' || body.override === undefined);
  }
}
