import { connect, type Socket } from 'node:net';
import { getCodec, LineSplitter } from '@tareline/protocol';
import { afterEach, describe, expect, it } from 'vitest';
import { SimulatedScale } from '../simulated-scale.js';
import { serveTcp, type TcpAdapter } from './tcp-adapter.js';

const cleanup: Array<() => Promise<void> | void> = [];
afterEach(async () => {
  for (const step of cleanup.splice(0).reverse()) await step();
});

async function open(port: number): Promise<{ socket: Socket; lines: string[] }> {
  const socket = connect({ port, host: '127.0.0.1' });
  cleanup.push(() => void socket.destroy());
  await new Promise<void>((resolve, reject) => {
    socket.once('connect', resolve);
    socket.once('error', reject);
  });
  const lines: string[] = [];
  const splitter = new LineSplitter();
  socket.setEncoding('latin1');
  socket.on('data', (chunk: string) => lines.push(...splitter.push(chunk)));
  return { socket, lines };
}

async function until(check: () => boolean, what: string): Promise<void> {
  for (let i = 0; i < 200; i++) {
    if (check()) return;
    await new Promise((resolve) => setTimeout(resolve, 10));
  }
  throw new Error(`timed out waiting for ${what}`);
}

async function start(
  format: 'echo' | 'headered',
): Promise<{ scale: SimulatedScale; adapter: TcpAdapter }> {
  const scale = new SimulatedScale({ format, speed: 20 });
  const adapter = await serveTcp(scale, { port: 0 });
  cleanup.push(
    () => adapter.close(),
    () => scale.stop(),
  );
  scale.start();
  return { scale, adapter };
}

describe('serveTcp on loopback', () => {
  it('streams CR LF lines to a client and answers its commands', async () => {
    const { scale, adapter } = await start('echo');
    scale.placeCup(40);
    const { socket, lines } = await open(adapter.port);
    await until(() => lines.length >= 5, 'five lines');
    const codec = getCodec('echo');
    expect(lines.slice(0, 5).every((line) => codec.parse(line).kind === 'weight')).toBe(true);
    await scale.settle();
    socket.write('T\r\nNONSENSE\r\n');
    await until(() => lines.includes('ES'), 'the refusal');
    await until(() => lines.some((line) => line.startsWith('T S')), 'the tare reply');
    expect(codec.parse(lines.find((line) => line.startsWith('T S'))!)).toMatchObject({
      kind: 'weight',
      tare: true,
    });
    expect(scale.tareG).toBeCloseTo(40, 1);
  });

  it('drops clients when unplugged and takes them again after replug', async () => {
    const { scale, adapter } = await start('headered');
    const { socket } = await open(adapter.port);
    const closed = new Promise<void>((resolve) => socket.once('close', () => resolve()));
    scale.unplug();
    await closed;
    await expect(open(adapter.port)).rejects.toThrow(/ECONNREFUSED/);
    scale.replug();
    // The adapter listens again a moment after the replug.
    let again: Awaited<ReturnType<typeof open>> | undefined;
    for (let i = 0; i < 50 && !again; i++) {
      again = await open(adapter.port).catch(async () => {
        await new Promise((resolve) => setTimeout(resolve, 10));
        return undefined;
      });
    }
    if (!again) throw new Error('the adapter did not listen again after replug');
    const { lines } = again;
    await until(() => lines.length > 2, 'lines after replug');
    expect(getCodec('headered').parse(lines.at(-1)!).kind).toBe('weight');
  });
});
