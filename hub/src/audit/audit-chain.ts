import { createHash } from 'node:crypto';
import stableStringify from 'fast-json-stable-stringify';

/** The hash before the first entry. */
export const GENESIS_HASH = '0'.repeat(64);

/** What an entry's hash covers: every field but the hashes themselves. */
export interface ChainedFields {
  id: number;
  /** ISO 8601, UTC, to the millisecond. */
  at: string;
  actor: { id: string; name: string } | null;
  entity: string;
  entityId: string;
  action: string;
  data: unknown;
}

/**
 * sha256 (hex) of the previous hash followed by the entry as canonical JSON (keys sorted at every
 * level), so the same entry hashes the same whatever order the database gives its JSON keys in.
 */
export function entryHash(prevHash: string, entry: ChainedFields): string {
  const canonical = stableStringify({
    id: entry.id,
    at: entry.at,
    actor: entry.actor,
    entity: entry.entity,
    entityId: entry.entityId,
    action: entry.action,
    data: entry.data,
  });
  return createHash('sha256')
    .update(prevHash + canonical)
    .digest('hex');
}

/** A stored entry: its fields and the two hashes. */
export interface StoredEntry extends ChainedFields {
  prevHash: string;
  hash: string;
}

/**
 * Checks entries in id order, continuing from `prevHash` (the hash of the entry before the first
 * given). Answers the first entry whose link or hash does not hold, or null.
 */
export function firstBroken(
  entries: readonly StoredEntry[],
  prevHash: string,
): { brokenId: number | null; lastHash: string } {
  let expectedPrev = prevHash;
  for (const e of entries) {
    if (e.prevHash !== expectedPrev || entryHash(e.prevHash, e) !== e.hash) {
      return { brokenId: e.id, lastHash: expectedPrev };
    }
    expectedPrev = e.hash;
  }
  return { brokenId: null, lastHash: expectedPrev };
}
