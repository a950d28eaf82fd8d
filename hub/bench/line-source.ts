import type { BindingInterface, OpenOptions } from '@serialport/bindings-interface' with {
  'resolution-mode': 'require',
};
import { getCodec } from '@tareline/protocol';
import { SerialPortMock } from 'serialport';

type MockPort = Awaited<ReturnType<typeof SerialPortMock.binding.open>>;

/** Wall-clock milliseconds with sub-millisecond resolution, comparable across processes. */
export const nowMs = () => performance.timeOrigin + performance.now();

/**
 * The scale side of one simulated bench in the benchmark: a mock serial port into which it
 * writes `headered` lines at a fixed rate. Each line's value is its own number (line n reads
 * n / 100 g), so the receiving client can tell which line an event came from, and the time each
 * line was written is kept for the latency.
 */
export class LineSource {
  readonly path: string;
  readonly binding: BindingInterface;
  private port: MockPort | undefined;
  private timer: NodeJS.Timeout | undefined;
  private counter = 1;
  readonly written = new Map<number, number>();
  private static next = 1;
  private readonly codec = getCodec('headered');

  constructor(
    readonly benchId: string,
    private readonly rateHz: number,
  ) {
    this.path = `/dev/bench-line-source-${LineSource.next++}`;
    SerialPortMock.binding.createPort(this.path);
    this.binding = {
      list: () => SerialPortMock.binding.list(),
      open: async (options: OpenOptions) => {
        const port = await SerialPortMock.binding.open(options);
        this.port = port;
        return port;
      },
    };
  }

  start(offsetMs: number): void {
    setTimeout(() => {
      this.timer = setInterval(() => this.writeLine(), 1000 / this.rateHz);
    }, offsetMs);
  }

  private writeLine(): void {
    if (!this.port?.isOpen) return;
    const n = this.counter++;
    const line = this.codec.encode({
      grams: n / 100,
      stable: true,
      mode: 'gross',
      unit: 'g',
      decimals: 2,
    });
    this.written.set(n, nowMs());
    this.port.emitData(`${line}\r\n`);
  }

  stop(): void {
    clearInterval(this.timer);
  }
}

/** Messages between the benchmark and its hub process. */
export type ChildMessage =
  /** `token`: a lead's sign-in for the live socket (the hub requires one; the relay does not). */
  | { type: 'ready'; port: number; token?: string }
  | { type: 'report'; cpuMs: number; wallMs: number; written: Record<string, [number, number][]> };
export type ParentMessage = { type: 'start-window' } | { type: 'end-window' } | { type: 'exit' };

/** Runs the child side of the protocol: CPU over the window, and every line's write time. */
export function serveParent(sources: LineSource[]): void {
  let cpu = process.cpuUsage();
  let wall = performance.now();
  process.on('message', (message: ParentMessage) => {
    if (message.type === 'start-window') {
      cpu = process.cpuUsage();
      wall = performance.now();
    } else if (message.type === 'end-window') {
      const used = process.cpuUsage(cpu);
      const report: ChildMessage = {
        type: 'report',
        cpuMs: (used.user + used.system) / 1000,
        wallMs: performance.now() - wall,
        written: Object.fromEntries(sources.map((s) => [s.benchId, [...s.written.entries()]])),
      };
      process.send?.(report);
    } else if (message.type === 'exit') {
      for (const source of sources) source.stop();
      process.exit(0);
    }
  });
}
