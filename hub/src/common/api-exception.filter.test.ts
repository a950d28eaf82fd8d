import { describe, expect, it } from 'vitest';
import { describeWithoutParameters, statusOf } from './api-exception.filter.js';
import {
  BenchBusy,
  Conflict,
  InvalidInput,
  LockedOut,
  NotAllowed,
  NotApplicable,
  NotFound,
  NotSignedIn,
  ScaleCommandFailed,
  StoreUnavailable,
} from './domain-errors.js';

describe('the one table from domain errors to statuses', () => {
  it.each([
    [new InvalidInput('x'), 400],
    [new NotSignedIn('x'), 401],
    [new NotAllowed('x'), 403],
    [new NotFound('x'), 404],
    [new Conflict('x'), 409],
    [new BenchBusy('x'), 409],
    [new NotApplicable('x'), 422],
    [new LockedOut('x', [], 60), 423],
    [new ScaleCommandFailed('x', [], 'busy'), 409],
    [new ScaleCommandFailed('x', [], 'away'), 503],
    [new StoreUnavailable('x'), 503],
  ])('%s → %i', (err, status) => {
    expect(statusOf(err)).toBe(status);
  });
});

describe('logging an unexpected error', () => {
  it('leaves out the parameters a database error carries', () => {
    const hash = '$scrypt$N=16384$c2FsdA$aGFzaA';
    const err = new Error(
      `Failed query: update "people" set "pin_hash" = $1 where "people"."id" = $2\nparams: ${hash},\u0000`,
      { cause: new Error(`invalid byte sequence; params: ${hash}`) },
    );
    const line = describeWithoutParameters(err);
    expect(line).toContain('Failed query: update "people"');
    expect(line).not.toContain(hash);
    expect(line).not.toContain('params');
  });
});
