import { echoCodec } from './echo-codec.js';
import { headeredCodec } from './headered-codec.js';
import { plainCodec } from './plain-codec.js';
import type { ScaleCodec, ScaleFormat } from './types.js';

const CODECS: Readonly<Record<ScaleFormat, ScaleCodec>> = {
  headered: headeredCodec,
  echo: echoCodec,
  plain: plainCodec,
};

export function getCodec(format: ScaleFormat): ScaleCodec {
  return CODECS[format];
}

/** Lines in a row one family must read before `auto` trusts it. */
export const CONFIRMING_LINES = 2;

/**
 * Recognise a balance's family from the latest lines it printed (`auto` mode): the one family
 * whose strict parser reads each of the last {@link CONFIRMING_LINES} non-blank lines. A single
 * line never decides, because the first line after opening a port is often the tail of a line,
 * which another family can read as a smaller weight (`3.45  g` from `ST,GS,+00123.45  g`).
 * Earlier lines do not count, so after a burst of noise (a wrong baud rate, a cable moved) the
 * family is recognised as soon as two good lines come. `undefined` means "not yet": feed more.
 */
export function detectFormat(lines: readonly string[]): ScaleFormat | undefined {
  const latest = lines
    .filter((line) => typeof line === 'string' && line.trim() !== '')
    .slice(-CONFIRMING_LINES);
  if (latest.length < CONFIRMING_LINES) return undefined;
  const readers = (Object.keys(CODECS) as ScaleFormat[]).filter((format) =>
    latest.every((line) => CODECS[format].parse(line).kind !== 'unreadable'),
  );
  return readers.length === 1 ? readers[0] : undefined;
}
