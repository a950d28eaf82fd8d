import type { BindingInterface, OpenOptions } from '@serialport/bindings-interface' with {
  'resolution-mode': 'require',
};
import {
  getCodec,
  parseScaleUrl,
  type EncodableReading,
  type ReadingEvent,
  type ScaleFormat,
  type ScaleLinkSettings,
  type ScaleState,
  type ScaleStatusEvent,
  type SerialLinkSettings,
} from '@tareline/protocol';
import { SerialPortMock } from 'serialport';
import { Logger } from '@nestjs/common';
import { afterEach, beforeAll, describe, expect, it } from 'vitest';
import { ScaleCommandError, ScaleLink, scaleDetailInWords } from './scale-link.js';
import { SerialTransport } from './transports/serial.transport.js';

type MockPort = Awaited<ReturnType<typeof SerialPortMock.binding.open>>;

/**
 * The far end of a mock serial port, as the test's balance: prints lines into the port, sees
 * what the hub wrote, and can be unplugged (the pending read fails with an I/O error, as a pulled
 * USB adapter does) and plugged back in.
 */
class MockScale {
  readonly ports: MockPort[] = [];
  plugged = true;
  private failRead: ((err: Error) => void) | undefined;
  readonly binding: BindingInterface;
  private static next = 1;
  readonly path = `/dev/ttyMOCK${MockScale.next++}`;

  constructor() {
    SerialPortMock.binding.createPort(this.path, { record: true });
    this.binding = {
      list: () => SerialPortMock.binding.list(),
      open: async (options: OpenOptions) => {
        if (!this.plugged) {
          throw Object.assign(new Error(`No such file or directory, cannot open ${options.path}`), {
            code: 'ENOENT',
          });
        }
        const port = await SerialPortMock.binding.open(options);
        this.ports.push(port);
        return new Proxy(port, {
          get: (target, prop) => {
            if (prop === 'read') {
              return (buffer: Buffer, offset: number, length: number) =>
                Promise.race([
                  target.read(buffer, offset, length),
                  new Promise<never>((_, reject) => (this.failRead = reject)),
                ]);
            }
            const value: unknown = Reflect.get(target, prop);
            return typeof value === 'function' ? value.bind(target) : value;
          },
        });
      },
    };
  }

  get port(): MockPort {
    const port = this.ports.at(-1);
    if (!port) throw new Error('the hub has not opened the port');
    return port;
  }

  /** Bytes as the balance sends them, in whatever chunks the test likes. */
  send(bytes: string): void {
    this.port.emitData(bytes);
  }

  print(format: ScaleFormat, reading: Partial<EncodableReading> & { grams: number }): void {
    const line = getCodec(format).encode({
      stable: true,
      mode: 'gross',
      unit: 'g',
      decimals: 2,
      ...reading,
    });
    this.send(`${line}\r\n`);
  }

  /** Everything the hub wrote to the scale since the port was opened. */
  written(): string {
    return this.port.recording.toString('latin1');
  }

  unplug(): void {
    this.plugged = false;
    this.failRead?.(new Error('EIO: i/o error, read'));
  }
}

const FAST = {
  staleAfterMs: 400,
  initialBackoffMs: 50,
  maxBackoffMs: 200,
  commandTimeoutMs: 1_500,
};

beforeAll(() => Logger.overrideLogger(false));

const links: ScaleLink[] = [];
afterEach(async () => {
  await Promise.all(links.splice(0).map((l) => l.stop()));
});

/** A serial transport whose device file comes and goes with the mock scale's cable. */
class VanishingSerialTransport extends SerialTransport {
  constructor(
    settings: SerialLinkSettings,
    private readonly scale: MockScale,
  ) {
    super(settings, scale.binding);
  }
  override stillThere(): Promise<boolean> {
    return Promise.resolve(this.scale.plugged);
  }
}

function startLink(url: string, scale = new MockScale(), options: { vanishing?: boolean } = {}) {
  const settings = parseScaleUrl(url.replace('PATH', scale.path)) as ScaleLinkSettings;
  const serial = settings as SerialLinkSettings;
  const link = new ScaleLink(
    'bench-t',
    settings,
    options.vanishing
      ? new VanishingSerialTransport(serial, scale)
      : new SerialTransport(serial, scale.binding),
    FAST,
  );
  links.push(link);
  const readings: ReadingEvent[] = [];
  const states: ScaleStatusEvent[] = [];
  link.onReading((r) => readings.push(r));
  link.onStatus((s) => states.push(s));
  link.start();
  return { link, scale, readings, states };
}

async function until(what: string, check: () => boolean, timeoutMs = 3_000): Promise<void> {
  const deadline = Date.now() + timeoutMs;
  while (!check()) {
    if (Date.now() > deadline) throw new Error(`timed out waiting for ${what}`);
    await new Promise((r) => setTimeout(r, 10));
  }
}

const stateIs = (link: ScaleLink, state: ScaleState) => () => link.status().state === state;

/**
 * Waits for the hub's `opened`-th opening of the port and prints what a balance that was
 * mid-line prints first: the tail of a line, which the link must drop.
 */
async function openedMidLine(scale: MockScale, opened = 1): Promise<void> {
  await until('the port to open', () => scale.ports.length === opened && scale.port.isOpen);
  scale.send('.00  g\r\n');
}

describe('ScaleLink over the mock serial binding', () => {
  it('turns lines split across chunks into readings, in order, and goes online', async () => {
    const { link, scale, readings } = startLink('serial://PATH?format=headered');
    await openedMidLine(scale);
    expect(link.status().state).toBe('connecting');
    // One line cut in three, then two lines in one chunk; CR LF split across chunks too.
    scale.send('ST,GS,+00');
    scale.send('040.00  g\r');
    scale.send('\nUS,GS,+00052.37  g\r\nUS,GS,+00079.94  g\r\n');
    await until('three readings', () => readings.length === 3);
    expect(readings.map((r) => [r.grossG, r.netG, r.stable])).toEqual([
      [40, 40, true],
      [52.37, 52.37, false],
      [79.94, 79.94, false],
    ]);
    expect(readings.map((r) => r.seq)).toEqual([0, 1, 2]);
    expect(readings.every((r) => r.benchId === 'bench-t')).toBe(true);
    expect(link.status()).toMatchObject({
      state: 'online',
      detail: expect.stringContaining('headered'),
    });
    // d read from the two printed decimals.
    expect(link.readabilityG()).toBe(0.01);
  });

  it('recognises the format by itself and normalises units to grams', async () => {
    const { link, scale, readings } = startLink('serial://PATH?format=auto');
    await until('the port to open', () => scale.ports.length === 1);
    for (let i = 0; i < 3; i += 1)
      scale.print('plain', { grams: 453.59237, unit: 'lb', decimals: 3 });
    await until('online', stateIs(link, 'online'));
    expect(link.status().detail).toMatch(/plain lines \(recognised\)/);
    await until('a reading', () => readings.length > 0);
    // 1 lb = 453.592 37 g exactly (international yard and pound agreement, 1959).
    expect(readings.at(-1)?.grossG).toBeCloseTo(453.592, 3);
  });

  it('reports overload as an out-of-range reading', async () => {
    const { scale, readings } = startLink('serial://PATH?format=headered');
    await openedMidLine(scale);
    scale.print('headered', { grams: 100 });
    scale.print('headered', { grams: 0, overload: true });
    await until('two readings', () => readings.length === 2);
    expect(readings[1]).toMatchObject({ outOfRange: 'overload', stable: false });
  });

  it("tares through the scale's own command and keeps gross and net apart", async () => {
    const { link, scale, readings } = startLink('serial://PATH?format=headered');
    await openedMidLine(scale);
    scale.print('headered', { grams: 40 });
    await until('online', stateIs(link, 'online'));
    const tared = link.tare();
    await until('the tare command', () => scale.written().length > 0);
    // The headered family's tare command is the letter T.
    expect(scale.written()).toBe(`${getCodec('headered').command('tare')}\r\n`);
    scale.print('headered', { grams: 0, mode: 'net' });
    await tared;
    scale.print('headered', { grams: 12.5, mode: 'net' });
    await until('a net reading', () => readings.at(-1)?.netG === 12.5);
    expect(readings.at(-1)).toMatchObject({ grossG: 52.5, netG: 12.5 });
  });

  it('tares an echo-family scale with its command and takes the tare value from its reply', async () => {
    const { link, scale, readings } = startLink('serial://PATH?format=echo');
    await openedMidLine(scale);
    scale.print('echo', { grams: 40 });
    await until('online', stateIs(link, 'online'));
    const tared = link.tare();
    await until('the tare command', () => scale.written().length > 0);
    expect(scale.written()).toBe(`${getCodec('echo').command('tare')}\r\n`);
    const codec = getCodec('echo');
    const display: EncodableReading = {
      grams: 0,
      stable: true,
      mode: 'net',
      unit: 'g',
      decimals: 2,
    };
    scale.send(`${codec.encodeTareReply(40, display)}\r\n`);
    scale.print('echo', { grams: 0, mode: 'net' });
    await tared;
    scale.print('echo', { grams: 7.25, mode: 'net' });
    await until('a net reading', () => readings.at(-1)?.netG === 7.25);
    expect(readings.at(-1)?.grossG).toBe(47.25);
  });

  it('keeps a software tare for a scale without commands and writes nothing to it', async () => {
    const { link, scale, readings } = startLink('serial://PATH?format=plain');
    await openedMidLine(scale);
    scale.print('plain', { grams: 38.4 });
    await until('online', stateIs(link, 'online'));
    const tared = link.tare();
    scale.print('plain', { grams: 38.4 });
    await tared;
    scale.print('plain', { grams: 138.4 });
    await until('a reading after the tare', () => readings.at(-1)?.grossG === 138.4);
    expect(readings.at(-1)?.netG).toBe(100);
    expect(scale.written()).toBe('');
  });

  it('falls back to a software tare when the scale refuses the command', async () => {
    const { link, scale, readings } = startLink('serial://PATH?format=headered');
    await openedMidLine(scale);
    scale.print('headered', { grams: 25 });
    await until('online', stateIs(link, 'online'));
    const tared = link.tare();
    await until('the tare command', () => scale.written().length > 0);
    scale.send(`${getCodec('headered').encodeRefusal('T')}\r\n`);
    scale.print('headered', { grams: 25 });
    await tared;
    scale.print('headered', { grams: 30 });
    await until('a reading', () => readings.at(-1)?.grossG === 30);
    expect(readings.at(-1)?.netG).toBe(5);
  });

  it('refuses to tare while the scale is not online, saying why', async () => {
    const { link } = startLink('serial://PATH?format=headered');
    await expect(link.tare()).rejects.toThrow(ScaleCommandError);
    await expect(link.tare()).rejects.toThrow(/Cannot tare: the scale is connecting/);
  });

  it('goes stale when lines stop and online again when they resume', async () => {
    const { link, scale } = startLink('serial://PATH?format=headered');
    await openedMidLine(scale);
    scale.print('headered', { grams: 10 });
    await until('online', stateIs(link, 'online'));
    await until('stale', stateIs(link, 'stale'), 2_000);
    expect(link.status().detail).toMatch(/no line from the scale/);
    scale.print('headered', { grams: 10 });
    await until('online again', stateIs(link, 'online'));
  });

  it('goes offline when unplugged, keeps trying, and is back online after replugging', async () => {
    const { link, scale, states } = startLink('serial://PATH?format=headered');
    await openedMidLine(scale);
    scale.print('headered', { grams: 10 });
    await until('online', stateIs(link, 'online'));
    scale.unplug();
    await until('offline', stateIs(link, 'offline'));
    // Told in words, without the device's path (which the hub's log keeps).
    expect(link.status().detail).toMatch(/its cable was pulled or it was switched off/);
    expect(link.status().detail).not.toMatch(/\/dev\/|EIO/);
    // Retries fail while unplugged and stay offline (not an error: nothing is wrong but the cable).
    await new Promise((r) => setTimeout(r, 300));
    expect(link.status().state).toBe('offline');
    expect(link.status().detail).toMatch(/not connected: check that its cable is plugged in/);
    expect(link.status().detail).not.toMatch(/\/dev\/|No such file/);
    scale.plugged = true;
    await openedMidLine(scale, 2);
    scale.print('headered', { grams: 11 });
    await until('online again', stateIs(link, 'online'));
    const seen = states.map((s) => s.state);
    expect(seen.indexOf('offline')).toBeGreaterThan(seen.indexOf('online'));
    expect(seen.lastIndexOf('online')).toBeGreaterThan(seen.indexOf('offline'));
    // The old port was released: only the new one is open.
    expect(scale.ports.filter((p) => p.isOpen)).toHaveLength(1);
  });

  it('goes offline when the device vanishes without an I/O error, and reopens it when back', async () => {
    // A pseudo-terminal or adapter can disappear while the open port just goes quiet.
    const { link, scale } = startLink('serial://PATH?format=headered', new MockScale(), {
      vanishing: true,
    });
    await openedMidLine(scale);
    scale.print('headered', { grams: 10 });
    await until('online', stateIs(link, 'online'));
    scale.plugged = false;
    await until('offline', stateIs(link, 'offline'), 3_000);
    expect(link.status().detail).toMatch(/port has gone|not connected/);
    scale.plugged = true;
    await openedMidLine(scale, 2);
    scale.print('headered', { grams: 11 });
    await until('online again', stateIs(link, 'online'));
  });

  it('reports an error for lines it cannot read (wrong baud rate) and recovers', async () => {
    const { link, scale } = startLink('serial://PATH?format=headered');
    await openedMidLine(scale);
    for (let i = 0; i < 10; i += 1) scale.send('\u00f8\u00e5\u0012#\u00ff\r\n');
    await until('error', stateIs(link, 'error'));
    expect(link.status().detail).toMatch(/not headered lines.*baud rate/);
    scale.print('headered', { grams: 3 });
    await until('online', stateIs(link, 'online'));
  });

  it('never reads the cut first line after opening, and recognises the format from the whole lines', async () => {
    const { link, scale, readings } = startLink('serial://PATH?format=auto');
    await until('the port to open', () => scale.ports.length === 1);
    // Opened in the middle of `ST,GS,+00123.45  g`: the tail alone reads as a plain 3.45 g.
    scale.send('3.45  g\r\n');
    for (let i = 0; i < 4; i += 1) scale.print('headered', { grams: 123.45 });
    await until('online', stateIs(link, 'online'));
    await until('readings', () => readings.length > 0);
    expect(link.status().detail).toMatch(/headered lines \(recognised\)/);
    expect(readings.map((r) => r.grossG)).not.toContain(3.45);
    expect(readings.every((r) => r.grossG === 123.45)).toBe(true);
  });

  it('drops the cut first line with a fixed format too, after every reopening', async () => {
    const { link, scale, readings } = startLink('serial://PATH?format=plain');
    await until('the port to open', () => scale.ports.length === 1);
    // The tail of `+    123.45 g` is itself a plain line of 23.45 g.
    scale.send('23.45 g\r\n');
    scale.print('plain', { grams: 123.45 });
    await until('online', stateIs(link, 'online'));
    scale.unplug();
    await until('offline', stateIs(link, 'offline'));
    scale.plugged = true;
    await until('the port to reopen', () => scale.ports.length === 2 && scale.port.isOpen);
    scale.send('3.45 g\r\n');
    scale.print('plain', { grams: 123.45 });
    await until('online again', stateIs(link, 'online'));
    expect(readings.map((r) => r.grossG)).toEqual([123.45, 123.45]);
  });

  it('recognises the format once good lines follow a long run of unreadable ones', async () => {
    const { link, scale, readings } = startLink('serial://PATH?format=auto');
    await until('the port to open', () => scale.ports.length === 1);
    for (let i = 0; i < 30; i += 1) scale.send('\u00f8\u00e5\u0012#\u00ff\r\n');
    await until('error', stateIs(link, 'error'));
    expect(link.status().detail).toMatch(/none in a known format/);
    for (let i = 0; i < 3; i += 1) scale.print('echo', { grams: 12.5 });
    await until('online', stateIs(link, 'online'));
    await until('a reading', () => readings.length > 0);
    expect(readings.map((r) => r.grossG)).toEqual([12.5, 12.5]);
  });

  it('follows the balance to another format without reopening the port', async () => {
    // A balance whose print format is changed at its keypad, or a first guess that was wrong.
    const { link, scale, readings } = startLink('serial://PATH?format=auto');
    await until('the port to open', () => scale.ports.length === 1);
    for (let i = 0; i < 3; i += 1) scale.print('plain', { grams: 10 });
    await until('online', stateIs(link, 'online'));
    for (let i = 0; i < 12; i += 1) scale.print('headered', { grams: 20 });
    await until('a headered reading', () => readings.at(-1)?.grossG === 20);
    expect(link.status()).toMatchObject({
      state: 'online',
      detail: expect.stringMatching(/headered lines \(recognised\)/),
    });
    expect(scale.ports).toHaveLength(1);
  });

  it('releases the port when stopped', async () => {
    const { link, scale } = startLink('serial://PATH?format=headered');
    await until('the port to open', () => scale.ports.length === 1);
    await link.stop();
    expect(scale.port.isOpen).toBe(false);
    expect(link.status().state).toBe('offline');
  });
});

describe('a scale error told in words', () => {
  it('names no device path or address and no error code', () => {
    const cases = [
      'serial /dev/ttyUSB0 9600 8N1: Error: ENOENT: no such file or directory, cannot open /dev/ttyUSB0; trying again in 2.0 s',
      'connection lost: EIO: i/o error, read',
      'serial COM3 9600 8N1: Error: EACCES: permission denied, open COM3; trying again in 1.0 s',
      'tcp 10.0.4.17:4001: connect ECONNREFUSED 10.0.4.17:4001; trying again in 4.0 s',
      'serial /tmp/tareline-pty-3 open, waiting for the first line',
    ];
    const words = cases.map(scaleDetailInWords);
    for (const w of words)
      expect(w).not.toMatch(/\/dev\/|\/tmp\/|COM\d|E[A-Z]{3,}|\d+\.\d+\.\d+\.\d+/);
    expect(words[0]).toBe(
      'the serial port: the scale is not connected: check that its cable is plugged in; trying again in 2.0 s',
    );
    expect(words[1]).toMatch(/its cable was pulled or it was switched off/);
    expect(words[2]).toMatch(/not allowed to open the scale port: ask an admin/);
    expect(words[3]).toMatch(/^the network link: .*nothing answers at the scale's network address/);
    expect(words[4]).toBe('the serial port open, waiting for the first line');
  });
});
