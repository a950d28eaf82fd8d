/**
 * Framing of a balance's byte stream into lines. Pure (no node:stream), so the hub wraps it in
 * a Transform and tests feed it by hand. A line ends at CR, LF or CR LF — also when the CR and
 * the LF arrive in different chunks. Blank lines carry nothing and are dropped. A run longer
 * than `maxLength` without a line end (wrong baud rate, binary noise) is cut and handed on as a
 * line of its own, so the codec reports it as unreadable and the stream never stalls.
 */
export interface LineSplitterOptions {
  /** Longest line in characters before it is cut; default 256. */
  maxLength?: number;
}

export const DEFAULT_MAX_LINE_LENGTH = 256;

export class LineSplitter {
  readonly maxLength: number;
  private buffer = '';
  private lastWasCr = false;

  constructor(opts: LineSplitterOptions = {}) {
    const maxLength = opts.maxLength ?? DEFAULT_MAX_LINE_LENGTH;
    if (!Number.isInteger(maxLength) || maxLength < 1) {
      throw new TypeError(`"maxLength" must be a positive integer, got ${String(maxLength)}`);
    }
    this.maxLength = maxLength;
  }

  push(chunk: string): string[] {
    const lines: string[] = [];
    for (const char of chunk) {
      if (char === '\n' && this.lastWasCr) {
        this.lastWasCr = false;
        continue;
      }
      this.lastWasCr = char === '\r';
      if (char === '\r' || char === '\n') {
        this.emit(lines);
        continue;
      }
      this.buffer += char;
      if (this.buffer.length >= this.maxLength) this.emit(lines);
    }
    return lines;
  }

  /** The rest of a stream that ended without a line end. */
  flush(): string[] {
    const lines: string[] = [];
    this.emit(lines);
    this.lastWasCr = false;
    return lines;
  }

  private emit(lines: string[]): void {
    if (this.buffer.trim() !== '') lines.push(this.buffer);
    this.buffer = '';
  }
}
