import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { detectFormat, getCodec } from './codecs.js';
import { LineSplitter } from './line-splitter.js';
import type { ScaleFormat, ScaleLine } from './types.js';

const formats: ScaleFormat[] = ['headered', 'echo', 'plain'];
const realLines = [
  'ST,GS,+00123.45  g',
  'US,NT,-00000.20  g',
  'OL,GS,+99999.99  g',
  'S S     123.45 g',
  'S D     123.47 g',
  'T S      40.00 g',
  'S +',
  'Z A',
  'ES',
  '+    123.45 g',
  '+    123.47 g ?',
  '+  OVERLOAD',
];

/** A real line with a few characters replaced, inserted or deleted, as line noise does. */
const mutatedLine = fc
  .tuple(
    fc.constantFrom(...realLines),
    fc.array(
      fc.tuple(
        fc.nat(40),
        fc.constantFrom('replace', 'insert', 'delete'),
        fc.integer({ min: 0, max: 255 }),
      ),
      { minLength: 1, maxLength: 4 },
    ),
  )
  .map(([line, edits]) =>
    edits.reduce((text, [at, how, code]) => {
      const i = at % (text.length + 1);
      const char = String.fromCharCode(code);
      if (how === 'insert') return text.slice(0, i) + char + text.slice(i);
      if (how === 'delete') return text.slice(0, i) + text.slice(i + 1);
      return text.slice(0, i) + char + text.slice(i + 1);
    }, line),
  );

const randomBytes = fc.uint8Array({ maxLength: 64 }).map((bytes) => String.fromCharCode(...bytes));

function wellFormed(line: ScaleLine, raw: string): void {
  expect(line.raw).toBe(raw);
  if (line.kind === 'weight') {
    expect(Number.isFinite(line.grams)).toBe(true);
    expect(Number.isFinite(line.value)).toBe(true);
  }
}

describe('codecs under noise', () => {
  it('never throw on random bytes or mutated lines, and every weight is a finite number', () => {
    fc.assert(
      fc.property(fc.oneof(randomBytes, mutatedLine, fc.string({ maxLength: 80 })), (raw) => {
        for (const format of formats) {
          const codec = getCodec(format);
          wellFormed(codec.parse(raw), raw);
          // The simulator side must survive the same noise on its command input.
          codec.parseCommand(raw);
          codec.encodeRefusal(raw);
        }
        detectFormat([raw, raw]);
      }),
      { numRuns: 20_000 },
    );
  });

  it('frame a random byte stream in random chunks into the same lines as in one piece', () => {
    fc.assert(
      fc.property(
        fc.array(fc.oneof(mutatedLine, randomBytes), { maxLength: 20 }),
        fc.array(fc.nat(30), { maxLength: 40 }),
        (pieces, cuts) => {
          const stream = pieces.join('\r\n');
          const whole = new LineSplitter({ maxLength: 64 });
          const expected = [...whole.push(stream), ...whole.flush()];
          const chunked = new LineSplitter({ maxLength: 64 });
          const got: string[] = [];
          let at = 0;
          for (const cut of cuts) {
            got.push(...chunked.push(stream.slice(at, at + cut)));
            at += cut;
          }
          got.push(...chunked.push(stream.slice(at)), ...chunked.flush());
          expect(got).toEqual(expected);
          for (const line of got) {
            expect(line.length).toBeLessThanOrEqual(64);
            expect(line).not.toMatch(/[\r\n]/);
          }
        },
      ),
      { numRuns: 5_000 },
    );
  });
});
