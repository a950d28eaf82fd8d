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

/**
 * Recognise a balance's family from the first lines it printed (`auto` mode). Each family's
 * parser is strict enough that it does not read the others' lines, so the family that reads the
 * most lines wins — when it reads at least one, reads more than any other, and reads at least
 * half of the non-blank lines (the first line is often cut in half by opening the port mid-line).
 * `undefined` means "not yet": feed more lines.
 */
export function detectFormat(lines: readonly string[]): ScaleFormat | undefined {
  const nonBlank = lines.filter((line) => typeof line === 'string' && line.trim() !== '');
  if (nonBlank.length === 0) return undefined;
  const scores = (Object.keys(CODECS) as ScaleFormat[]).map((format) => ({
    format,
    read: nonBlank.filter((line) => CODECS[format].parse(line).kind !== 'unreadable').length,
  }));
  scores.sort((a, b) => b.read - a.read);
  const [best, second] = scores;
  if (!best || best.read === 0 || best.read === second?.read) return undefined;
  return best.read * 2 >= nonBlank.length ? best.format : undefined;
}
