import { createHash } from 'node:crypto';
import { describe, expect, it } from 'vitest';
import { entryHash, firstBroken, GENESIS_HASH, type StoredEntry } from './audit-chain.js';

const fields = {
  id: 1,
  at: '2026-12-02T08:00:00.000Z',
  actor: { id: 'p-ilse', name: 'Ilse Varga' },
  entity: 'batch',
  entityId: '12',
  action: 'disposition.hold',
  data: { reason: 'Lot under review', decision: 'hold' },
};

function chain(n: number): StoredEntry[] {
  const out: StoredEntry[] = [];
  let prev = GENESIS_HASH;
  for (let i = 1; i <= n; i += 1) {
    const e = { ...fields, id: i };
    const hash = entryHash(prev, e);
    out.push({ ...e, prevHash: prev, hash });
    prev = hash;
  }
  return out;
}

describe('audit hash chain', () => {
  it('is sha256 of the previous hash and the entry as JSON with its keys sorted', () => {
    // The canonical form written out by hand: keys in code-point order at every level.
    const canonical =
      '{"action":"disposition.hold","actor":{"id":"p-ilse","name":"Ilse Varga"},' +
      '"at":"2026-12-02T08:00:00.000Z","data":{"decision":"hold","reason":"Lot under review"},' +
      '"entity":"batch","entityId":"12","id":1}';
    // sha256 as specified in FIPS 180-4, here through Node's own implementation.
    const expected = createHash('sha256')
      .update(GENESIS_HASH + canonical)
      .digest('hex');
    expect(entryHash(GENESIS_HASH, fields)).toBe(expected);
  });

  it('hashes the same whatever order the JSON keys come back in', () => {
    const shuffled = { ...fields, data: { decision: 'hold', reason: 'Lot under review' } };
    expect(entryHash(GENESIS_HASH, shuffled)).toBe(entryHash(GENESIS_HASH, fields));
  });

  it('finds the first entry changed, and an entry removed from the middle', () => {
    const intact = chain(4);
    expect(firstBroken(intact, GENESIS_HASH).brokenId).toBeNull();

    const edited = chain(4);
    edited[2] = { ...edited[2]!, data: { decision: 'release', reason: 'Lot under review' } };
    expect(firstBroken(edited, GENESIS_HASH).brokenId).toBe(3);

    const gap = chain(4).filter((e) => e.id !== 2);
    expect(firstBroken(gap, GENESIS_HASH).brokenId).toBe(3);
  });
});
