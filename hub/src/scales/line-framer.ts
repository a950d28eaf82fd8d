import { Transform, type TransformCallback } from 'node:stream';
import { LineSplitter } from '@tareline/protocol';

/**
 * Bytes from a scale in, one line (without its CR / LF) per chunk out, in object mode.
 * A thin stream wrapper around protocol's pure {@link LineSplitter}; the bytes are Latin-1 so
 * that a line noise byte never splits into a multi-byte character across chunks.
 */
export class LineFramer extends Transform {
  private readonly splitter: LineSplitter;

  constructor(options: { maxLength?: number } = {}) {
    super({ readableObjectMode: true });
    if (
      options.maxLength !== undefined &&
      !(Number.isInteger(options.maxLength) && options.maxLength > 0)
    ) {
      throw new TypeError(`"maxLength" must be a positive whole number, got ${options.maxLength}`);
    }
    this.splitter = new LineSplitter(
      options.maxLength === undefined ? {} : { maxLength: options.maxLength },
    );
  }

  override _transform(chunk: Buffer | string, _encoding: BufferEncoding, done: TransformCallback) {
    const text = typeof chunk === 'string' ? chunk : chunk.toString('latin1');
    for (const line of this.splitter.push(text)) this.push(line);
    done();
  }

  override _flush(done: TransformCallback) {
    for (const line of this.splitter.flush()) this.push(line);
    done();
  }
}
