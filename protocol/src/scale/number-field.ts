/**
 * Shared pieces of the line codecs: strict number fields and fixed-width printing. Strict on
 * purpose: a line that is half a number must read as unreadable, never as a smaller weight.
 */

const NUMBER = /^([+-]?)\s*(\d+(?:\.\d*)?|\.\d+)$/;

/** A signed decimal field, blanks allowed between sign and digits (`-    0.20`), else undefined. */
export function parseNumberField(text: string): number | undefined {
  const match = NUMBER.exec(text.trim());
  if (!match) return undefined;
  const value = Number(match[2]);
  if (!Number.isFinite(value)) return undefined;
  // Keep -0 out of readings: a printed "-0.00" is zero.
  return match[1] === '-' && value !== 0 ? -value : value;
}

/** The magnitude with a fixed number of decimals (never exponent notation). */
export function fixedMagnitude(value: number, decimals: number): string {
  const places = Math.min(Math.max(Math.trunc(decimals), 0), 10);
  const abs = Math.abs(value);
  if (!Number.isFinite(abs)) return (0).toFixed(places);
  return abs < 1e15 ? abs.toFixed(places) : '999999999999999';
}

/** Whether `value` prints as negative at `decimals` places (so -0.001 at 2 places is "+0.00"). */
export function printsNegative(value: number, decimals: number): boolean {
  return value < 0 && Number(fixedMagnitude(value, decimals)) !== 0;
}
