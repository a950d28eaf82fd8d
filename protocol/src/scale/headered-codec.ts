import { fixedMagnitude, parseNumberField, printsNegative } from './number-field.js';
import type { EncodableReading, ScaleCodec, ScaleCommand, ScaleLine } from './types.js';
import { parseUnit, fromGrams, toGrams } from './units.js';

/**
 * `headered`: `ST,GS,+00123.45  g`. First header: ST stable, US unstable, OL out of range (a
 * negative value means underload). Second header: GS gross, NT net. Commands are single letters;
 * the family answers a command without a value by `OK,<letter>` and refuses with `ER,CMD`.
 * It prints no tare value: after a tare the lines simply turn NT.
 */
const LETTERS: Readonly<Record<ScaleCommand, string>> = {
  'stable-weight': 'S',
  'immediate-weight': 'Q',
  'repeat-weight': 'R',
  tare: 'T',
  zero: 'Z',
};
const COMMAND_BY_LETTER = new Map(
  Object.entries(LETTERS).map(([command, letter]) => [letter, command as ScaleCommand]),
);

const LINE = /^(ST|US|OL),(GS|NT),(.*)$/;
const VALUE_AND_UNIT = /^([+-]?\s*[\d.]+)\s*([A-Za-z]{1,3})$/;
const VALUE_WIDTH = 8;

function parse(raw: string): ScaleLine {
  const line = raw.trim();
  const reply = /^(OK|BY|ER),(.+)$/.exec(line);
  if (reply) {
    if (reply[1] === 'ER') return { kind: 'refused', raw };
    const command = COMMAND_BY_LETTER.get(reply[2] ?? '');
    if (!command) return { kind: 'unreadable', raw };
    return reply[1] === 'OK' ? { kind: 'ack', command, raw } : { kind: 'busy', raw };
  }
  const match = LINE.exec(line);
  if (!match) return { kind: 'unreadable', raw };
  const [, stability, mode, rest = ''] = match;
  if (stability === 'OL') {
    return rest.trim().startsWith('-') ? { kind: 'underload', raw } : { kind: 'overload', raw };
  }
  const parts = VALUE_AND_UNIT.exec(rest.trim());
  if (!parts) return { kind: 'unreadable', raw };
  const value = parseNumberField(parts[1] ?? '');
  const unit = parseUnit(parts[2] ?? '');
  if (value === undefined || !unit) return { kind: 'unreadable', raw };
  return {
    kind: 'weight',
    value,
    unit,
    grams: toGrams(value, unit),
    stable: stability === 'ST',
    mode: mode === 'NT' ? 'net' : 'gross',
    raw,
  };
}

function valueField(value: number, decimals: number): string {
  const sign = printsNegative(value, decimals) ? '-' : '+';
  return sign + fixedMagnitude(value, decimals).padStart(VALUE_WIDTH, '0');
}

function encode(reading: EncodableReading): string {
  const mode = reading.mode === 'net' ? 'NT' : 'GS';
  const unit = reading.unit.padStart(3);
  const full = '9'.repeat(Math.max(1, VALUE_WIDTH - reading.decimals - 1));
  const fullScale = reading.decimals > 0 ? `${full}.${'9'.repeat(reading.decimals)}` : full;
  if (reading.overload) return `OL,${mode},+${fullScale}${unit}`;
  if (reading.underload) return `OL,${mode},-${fullScale}${unit}`;
  const stability = reading.stable ? 'ST' : 'US';
  return `${stability},${mode},${valueField(fromGrams(reading.grams, reading.unit), reading.decimals)}${unit}`;
}

export const headeredCodec: ScaleCodec = {
  format: 'headered',
  parse: (line) => {
    try {
      return parse(line);
    } catch {
      return { kind: 'unreadable', raw: String(line) };
    }
  },
  encode,
  command: (command) => LETTERS[command],
  parseCommand: (line) => COMMAND_BY_LETTER.get(line.trim()),
  encodeRefusal: () => 'ER,CMD',
  encodeTareReply: () => `OK,${LETTERS.tare}`,
  encodeAck: (command) => `OK,${LETTERS[command]}`,
  encodeBusy: (command) => `BY,${LETTERS[command]}`,
};
