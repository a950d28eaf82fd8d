import { Logger } from '@nestjs/common';
import { describeWithoutParameters } from '../common/api-exception.filter.js';
import { Conflict, InvalidInput, StoreUnavailable } from '../common/domain-errors.js';

/** What a clash with a unique index means to the person who caused it, by index name. */
export type UniqueClashes = Readonly<Record<string, { path: string; message: string }>>;

// PostgreSQL error codes (SQLSTATE, appendix A of the PostgreSQL manual).
const UNIQUE_VIOLATION = '23505';
/** A NUL character in a text value: PostgreSQL text cannot hold it. */
const CHARACTER_NOT_IN_REPERTOIRE = '22021';
const UNTRANSLATABLE_CHARACTER = '22P05';

const logger = new Logger('Store');

/**
 * Runs one repository call and turns what the database throws into a domain error: a unique
 * index clash into {@link Conflict} (two admins adding the same e-mail at once), a character the
 * database cannot hold into {@link InvalidInput}, and anything else (full disk, closed database)
 * into {@link StoreUnavailable}, logged without the query's parameters.
 */
export async function guardStore<T>(
  work: () => Promise<T>,
  clashes: UniqueClashes = {},
): Promise<T> {
  try {
    return await work();
  } catch (err) {
    throw translateStoreError(err, clashes);
  }
}

export function translateStoreError(err: unknown, clashes: UniqueClashes = {}): Error {
  const cause = (err as { cause?: unknown } | null)?.cause ?? err;
  const { code, constraint } = (cause ?? {}) as { code?: unknown; constraint?: unknown };
  if (code === UNIQUE_VIOLATION) {
    const clash = typeof constraint === 'string' ? clashes[constraint] : undefined;
    const message = clash?.message ?? 'This is already taken by something else';
    return new Conflict(message, clash ? [clash] : []);
  }
  if (code === CHARACTER_NOT_IN_REPERTOIRE || code === UNTRANSLATABLE_CHARACTER) {
    return new InvalidInput('A text holds a character the hub cannot store (a NUL character)');
  }
  logger.error(describeWithoutParameters(err));
  return new StoreUnavailable(STORE_UNAVAILABLE);
}

export const STORE_UNAVAILABLE =
  'The hub could not use its data store, so nothing was changed: try again in a moment. ' +
  'If it keeps happening, tell an admin (the disk may be full)';
