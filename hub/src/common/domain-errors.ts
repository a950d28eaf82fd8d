import type { ApiError } from '@tareline/protocol';

type FieldErrors = ApiError['errors'];

/**
 * What a service says went wrong, in the hub's own words. Services throw these and never an HTTP
 * class: the one table in `api-exception.filter.ts` decides what each becomes on the wire, so a
 * service reads the same whether it is called by a controller, a socket handler or a timer.
 */
export abstract class DomainError extends Error {
  constructor(
    message: string,
    readonly errors: FieldErrors = [],
  ) {
    super(message);
    this.name = new.target.name;
  }
}

/** The thing asked for does not exist (or the caller may not know it exists). */
export class NotFound extends DomainError {}

/** The request is well formed but names something that cannot be used this way. */
export class InvalidInput extends DomainError {}

/** The request clashes with the current state of things: a duplicate, a retired material. */
export class Conflict extends DomainError {}

/** A bench already has a batch open: finish or abandon it first. */
export class BenchBusy extends DomainError {}

/** Signed in, but this person may not do this (another bench, another role). */
export class NotAllowed extends DomainError {}

/** Not signed in, a wrong credential, or a session that has ended. */
export class NotSignedIn extends DomainError {}

/** Too many wrong tries: locked until a moment the message names. */
export class LockedOut extends DomainError {
  constructor(
    message: string,
    errors: FieldErrors,
    readonly retryAfterS: number,
  ) {
    super(message, errors);
  }
}

/** The database refused or could not be reached: nothing changed, the caller may try again. */
export class StoreUnavailable extends DomainError {}

/** The balance did not do what it was asked (busy, moving, gone). */
export class ScaleCommandFailed extends DomainError {
  constructor(
    message: string,
    errors: FieldErrors,
    /** `busy`: it answered but would not (moving, overloaded): try again. `away`: no answer. */
    readonly reason: 'busy' | 'away',
  ) {
    super(message, errors);
  }
}

/** The request is fine but the thing it acts on cannot take it (not a simulated scale, say). */
export class NotApplicable extends DomainError {}

/** The content is not of a type this route takes (a data sheet that is not a PDF). */
export class UnsupportedType extends DomainError {}

/** The content is larger than this route takes. */
export class TooLarge extends DomainError {}
