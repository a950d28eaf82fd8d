import { fixedMagnitude, printsNegative } from './number-field.js';
import type { EncodableReading, ScaleCodec, ScaleLine } from './types.js';
import { fromGrams, parseUnit, toGrams } from './units.js';

/**
 * `plain`: a fixed-width signed value and unit, ` ?` appended while unstable:
 * `+    123.45 g`, `-      0.20 g ?`. Out of range it prints `+  OVERLOAD` / `- UNDERLOAD`.
 * The family takes no commands, so the hub keeps a software tare; stability is its marker.
 */
const WEIGHT = /^([+-])?\s*(\d+(?:\.\d*)?|\.\d+)\s*([A-Za-z]{1,3})\s*(\?)?$/;
const VALUE_WIDTH = 10;

function parse(raw: string): ScaleLine {
  const line = raw.trim();
  if (/^[+-]?\s*(OL|OVER|OVERLOAD)$/i.test(line)) return { kind: 'overload', raw };
  if (/^[+-]?\s*(UL|UNDER|UNDERLOAD)$/i.test(line)) return { kind: 'underload', raw };
  if (line === 'BUSY') return { kind: 'busy', raw };
  if (line === 'ERR') return { kind: 'refused', raw };
  const match = WEIGHT.exec(line);
  if (!match) return { kind: 'unreadable', raw };
  const magnitude = Number(match[2]);
  const unit = parseUnit(match[3] ?? '');
  if (!Number.isFinite(magnitude) || !unit) return { kind: 'unreadable', raw };
  const value = match[1] === '-' && magnitude !== 0 ? -magnitude : magnitude;
  return {
    kind: 'weight',
    value,
    unit,
    grams: toGrams(value, unit),
    stable: match[4] === undefined,
    mode: 'unknown',
    raw,
  };
}

function encode(reading: EncodableReading): string {
  if (reading.overload) return '+  OVERLOAD';
  if (reading.underload) return '- UNDERLOAD';
  const value = fromGrams(reading.grams, reading.unit);
  const sign = printsNegative(value, reading.decimals) ? '-' : '+';
  const field = fixedMagnitude(value, reading.decimals).padStart(VALUE_WIDTH);
  return `${sign}${field} ${reading.unit}${reading.stable ? '' : ' ?'}`;
}

export const plainCodec: ScaleCodec = {
  format: 'plain',
  parse: (line) => {
    try {
      return parse(line);
    } catch {
      return { kind: 'unreadable', raw: String(line) };
    }
  },
  encode,
  command: () => undefined,
  parseCommand: () => undefined,
  encodeRefusal: () => 'ERR',
  // Never asked: the family has no commands. Answers exist so the simulator stays uniform.
  encodeTareReply: () => 'ERR',
  encodeAck: () => 'ERR',
  encodeBusy: () => 'BUSY',
};
