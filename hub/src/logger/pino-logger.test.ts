import { Writable } from 'node:stream';
import { describe, expect, it } from 'vitest';
import { PinoLogger } from './pino-logger.js';

function capture(): { lines: Record<string, unknown>[]; stream: Writable } {
  const lines: Record<string, unknown>[] = [];
  const stream = new Writable({
    write(chunk: Buffer, _enc, done) {
      lines.push(JSON.parse(chunk.toString()) as Record<string, unknown>);
      done();
    },
  });
  return { lines, stream };
}

describe('PinoLogger', () => {
  it('writes one JSON object a line with level, context and message', async () => {
    const { lines, stream } = capture();
    const logger = new PinoLogger('info', stream);
    logger.log('Hub listening', 'Bootstrap');
    logger.debug('hidden below info');
    await new Promise((r) => setImmediate(r));
    expect(lines).toHaveLength(1);
    expect(lines[0]).toMatchObject({ level: 30, context: 'Bootstrap', msg: 'Hub listening' });
  });

  it('never writes a password, PIN, badge code or token', async () => {
    const { lines, stream } = capture();
    const logger = new PinoLogger('info', stream);
    logger.warn({ msg: 'sign-in refused', badge: 'B-1234', pin: '9876', user: { password: 'x' } });
    await new Promise((r) => setImmediate(r));
    const text = JSON.stringify(lines);
    expect(text).not.toContain('B-1234');
    expect(text).not.toContain('9876');
    expect(text).toContain('[redacted]');
  });
});
