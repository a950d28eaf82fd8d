import { fixedMagnitude, parseNumberField, printsNegative } from './number-field.js';
import type { EncodableReading, ScaleCodec, ScaleCommand, ScaleLine } from './types.js';
import { fromGrams, parseUnit, toGrams } from './units.js';

/**
 * `echo`: every reply starts with the command it answers, then a status letter:
 * `S S     123.45 g` stable, `S D     123.47 g` dynamic, `S +` overload, `S -` underload,
 * `S I` busy, `T S      40.00 g` tare done (carries the tare), `Z A` zero done, `<cmd> L`
 * cannot execute, `ES` / `ET` / `EL` not understood.
 */
const COMMANDS: Readonly<Record<ScaleCommand, string>> = {
  'stable-weight': 'S',
  'immediate-weight': 'SI',
  'repeat-weight': 'SIR',
  tare: 'T',
  zero: 'Z',
};
const COMMAND_BY_TEXT = new Map(
  Object.entries(COMMANDS).map(([command, text]) => [text, command as ScaleCommand]),
);
/** The reply prefix of each command: weight commands all answer with `S`. */
const REPLY_PREFIX: Readonly<Record<ScaleCommand, string>> = {
  'stable-weight': 'S',
  'immediate-weight': 'S',
  'repeat-weight': 'S',
  tare: 'T',
  zero: 'Z',
};

const REPLY = /^(S|SI|SIR|T|TI|Z|ZI)\s+([SDIA+\-L])(?:\s+(.*))?$/;
const VALUE_AND_UNIT = /^([+-]?\s*[\d.]+)\s+([A-Za-z]{1,3})$/;
const VALUE_WIDTH = 11;

function parse(raw: string): ScaleLine {
  const line = raw.trim();
  if (/^E[A-Z]$/.test(line)) return { kind: 'refused', raw };
  const match = REPLY.exec(line);
  if (!match) return { kind: 'unreadable', raw };
  const [, prefix = '', status, rest] = match;
  const isTare = prefix.startsWith('T');
  const isZero = prefix.startsWith('Z');
  if (status === 'S' || status === 'D') {
    if (isZero || rest === undefined) return { kind: 'unreadable', raw };
    const parts = VALUE_AND_UNIT.exec(rest.trim());
    const value = parseNumberField(parts?.[1] ?? '');
    const unit = parseUnit(parts?.[2] ?? '');
    if (value === undefined || !unit) return { kind: 'unreadable', raw };
    return {
      kind: 'weight',
      value,
      unit,
      grams: toGrams(value, unit),
      stable: status === 'S',
      mode: 'unknown',
      ...(isTare ? { tare: true } : {}),
      raw,
    };
  }
  if (rest !== undefined) return { kind: 'unreadable', raw };
  switch (status) {
    case '+':
      return { kind: 'overload', raw };
    case '-':
      return { kind: 'underload', raw };
    case 'I':
      return { kind: 'busy', raw };
    case 'L':
      return { kind: 'refused', raw };
    default:
      // 'A': done, without a value.
      return isTare || isZero
        ? { kind: 'ack', command: isTare ? 'tare' : 'zero', raw }
        : { kind: 'unreadable', raw };
  }
}

function weightLine(prefix: string, status: string, grams: number, reading: EncodableReading) {
  const value = fromGrams(grams, reading.unit);
  const sign = printsNegative(value, reading.decimals) ? '-' : '';
  const field = sign + fixedMagnitude(value, reading.decimals);
  return `${prefix} ${status}${field.padStart(VALUE_WIDTH)} ${reading.unit}`;
}

function encode(reading: EncodableReading): string {
  if (reading.overload) return 'S +';
  if (reading.underload) return 'S -';
  return weightLine('S', reading.stable ? 'S' : 'D', reading.grams, reading);
}

export const echoCodec: ScaleCodec = {
  format: 'echo',
  parse: (line) => {
    try {
      return parse(line);
    } catch {
      return { kind: 'unreadable', raw: String(line) };
    }
  },
  encode,
  command: (command) => COMMANDS[command],
  parseCommand: (line) => COMMAND_BY_TEXT.get(line.trim()),
  encodeRefusal: () => 'ES',
  encodeTareReply: (tareGrams, reading) => weightLine('T', 'S', tareGrams, reading),
  encodeAck: (command) => `${REPLY_PREFIX[command]} A`,
  encodeBusy: (command) => `${REPLY_PREFIX[command]} I`,
};
