import { describe, expect, it } from 'vitest';
import type { z } from 'zod';
import {
  assignBadgeRequestSchema,
  badgeSignInRequestSchema,
  createPersonRequestSchema,
  loginRequestSchema,
  personIdSchema,
  setPasswordRequestSchema,
  setPinRequestSchema,
  updatePersonRequestSchema,
} from './auth.js';
import {
  abandonBatchSchema,
  batchListQuerySchema,
  createBatchSchema,
  currentBatchQuerySchema,
} from './batches.js';
import { benchIdSchema } from './benches.js';
import { fieldErrors } from './errors.js';
import {
  lotInputSchema,
  lotListQuerySchema,
  materialIdSchema,
  materialInputSchema,
} from './materials.js';
import { CONTROL_CHARACTER_MESSAGE, recordIdSchema, text } from './text.js';

const messages = (schema: z.ZodType, value: unknown) =>
  schema.safeParse(value).error?.issues.map((i) => i.message) ?? [];

describe('text(): the string schema of every request', () => {
  it('refuses NUL, escape, DEL and the C1 controls, saying so', () => {
    for (const bad of [
      'a\u0000b',
      '\u001b[2J',
      'x\u007f',
      'next\u0085line',
      '\u009b31m',
      '\u0000',
    ]) {
      expect(messages(text(), bad), JSON.stringify(bad)).toEqual([CONTROL_CHARACTER_MESSAGE]);
    }
    expect(CONTROL_CHARACTER_MESSAGE).toBe('Must not contain control characters');
  });

  it('takes ordinary text: accents, other scripts, emoji, symbols', () => {
    for (const good of ['Oda Fenwick', 'Müller-Żółć', 'Łódź ½ × 2 °C', '樹脂 A', '🧪 resin', '']) {
      expect(text().parse(good)).toBe(good);
    }
  });

  it('keeps line breaks and tabs out of one-line fields but lets a note have them', () => {
    const note = 'Cup tipped over.\r\nSecond line\twith a tab.';
    expect(messages(text(), note)).toEqual([CONTROL_CHARACTER_MESSAGE]);
    expect(text({ multiline: true }).parse(note)).toBe(note);
    // A note still may not carry the other controls.
    expect(messages(text({ multiline: true }), 'a\u0000b')).toEqual([CONTROL_CHARACTER_MESSAGE]);
    expect(messages(text({ multiline: true }), 'a\u000bb')).toEqual([CONTROL_CHARACTER_MESSAGE]);
  });

  it('refuses half of a surrogate pair, which would be stored as a replacement character', () => {
    expect(messages(text(), 'x\ud800')).toEqual([
      'Contains a broken character (half of a surrogate pair)',
    ]);
    expect(text().parse('\ud83e\uddea')).toBe('🧪');
  });

  it('checks before trimming, so a control character at either end is refused too', () => {
    expect(messages(text().trim(), 'name\u000b')).toEqual([CONTROL_CHARACTER_MESSAGE]);
    expect(text().trim().parse('  name  ')).toBe('name');
  });

  it('keeps the caller’s own message for a missing string', () => {
    expect(messages(text({ error: 'Enter a name' }), undefined)).toEqual(['Enter a name']);
  });

  it('gives ids a length limit: a long id names nothing', () => {
    expect(recordIdSchema('material').parse('0157c77e-866d-443c-bd9a-4648a53dc126')).toHaveLength(
      36,
    );
    expect(messages(recordIdSchema('material'), 'x'.repeat(101))).toEqual([
      'No material has an id that long',
    ]);
    expect(messages(recordIdSchema('material'), '')).toEqual(['Say which material']);
  });
});

/** Every request, query and path schema with a valid example, to taint one string at a time. */
const REQUESTS: [string, z.ZodType, unknown][] = [
  [
    'badge sign-in',
    badgeSignInRequestSchema,
    { benchId: 'bench-1', badge: 'HR-1003', pin: '1357' },
  ],
  ['desk sign-in', loginRequestSchema, { email: 'a@b.example', password: 'secret-words' }],
  [
    'new person',
    createPersonRequestSchema,
    {
      name: 'Ilse',
      role: 'lead',
      email: 'i@b.example',
      password: 'long-enough-1',
      badge: 'HR-0002',
      pin: '4321',
    },
  ],
  ['person change', updatePersonRequestSchema, { name: 'Ilse', email: 'i@b.example' }],
  ['badge', assignBadgeRequestSchema, { badge: 'HR-0002' }],
  ['PIN', setPinRequestSchema, { pin: '4321' }],
  ['password', setPasswordRequestSchema, { password: 'long-enough-1' }],
  [
    'material',
    materialInputSchema,
    {
      name: 'SC-14',
      ratio: { basis: 'weight', parts: [100, 14] },
      specificGravity: 1.6,
      partLabels: ['Resin', 'Hardener'],
      cautions: ['Stir the filler back in'],
      sdsRef: 'SDS-14',
    },
  ],
  [
    'lot',
    lotInputSchema,
    {
      materialId: 'm-1',
      part: 0,
      code: 'L-2231',
      expiresOn: '2027-03-31',
      openedOn: '2026-01-05',
      receivedG: 5000,
    },
  ],
  [
    'batch',
    createBatchSchema,
    { benchId: 'bench-1', materialId: 'm-1', totalMassG: 100, lots: [{ part: 0, code: 'L-1' }] },
  ],
  ['abandon', abandonBatchSchema, { reason: 'Cup tipped over' }],
  ['lot list query', lotListQuerySchema, { materialId: 'm-1' }],
  ['batch list query', batchListQuerySchema, { benchId: 'bench-1', state: 'saved', limit: '20' }],
  ['current batch query', currentBatchQuerySchema, { benchId: 'bench-1' }],
  ['bench id', benchIdSchema, 'bench-1'],
  ['material id', materialIdSchema, 'm-1'],
  ['person id', personIdSchema, 'p-1'],
];

type Path = (string | number)[];

const CLOSED_FIELDS = new Set(['role', 'basis', 'state', 'expiresOn', 'openedOn', 'limit']);

function stringPaths(value: unknown, prefix: Path = []): Path[] {
  if (typeof value === 'string') return [prefix];
  if (value === null || typeof value !== 'object') return [];
  return Object.entries(value).flatMap(([key, v]) =>
    stringPaths(v, [...prefix, Array.isArray(value) ? Number(key) : key]),
  );
}

function withNul(value: unknown, path: Path): unknown {
  if (path.length === 0) return `${value as string}\u0000`;
  const copy = structuredClone(value) as Record<string | number, unknown>;
  const [head, ...rest] = path as [string | number, ...Path];
  copy[head] = withNul(copy[head], rest);
  return copy;
}

describe('request, query and path schemas', () => {
  it.each(REQUESTS)('%s: the example is valid', (_, schema, example) => {
    expect(schema.safeParse(example).error).toBeUndefined();
  });

  it.each(REQUESTS)('%s: a NUL in any of its strings is refused at that field', (_, schema, ex) => {
    const paths = stringPaths(ex);
    expect(paths.length).toBeGreaterThan(0);
    for (const path of paths) {
      const result = schema.safeParse(withNul(ex, path));
      expect(result.success, `NUL at ${path.join('.')}`).toBe(false);
      const errors = fieldErrors(result.error!).filter(
        (e) => e.path === (path.join('.') || '(body)'),
      );
      expect(errors.length, `an error at ${path.join('.')}`).toBeGreaterThan(0);
      // A choice from a list, a date or a number refuses anything else in its own words.
      if (!CLOSED_FIELDS.has(String(path.at(-1)))) {
        expect(errors.map((e) => e.message)).toContain(CONTROL_CHARACTER_MESSAGE);
      }
    }
  });
});
