import type {
  BindingInterface,
  BindingPortInterface,
  OpenOptions,
  PortStatus,
  SetOptions,
  UpdateOptions,
} from '@serialport/bindings-interface' with { 'resolution-mode': 'require' };
import { SerialPortStream } from '@serialport/stream';
import { LineSplitter, type SimulatedLinkSettings } from '@tareline/protocol';
import { SimulatedScale } from '@tareline/simulator';
import { SerialPortMock } from 'serialport';
import { openSerialStream } from './serial.transport.js';
import {
  TransportOpenError,
  type ScaleConnection,
  type ScaleTransport,
} from './scale-transport.js';

type MockPort = Awaited<ReturnType<typeof SerialPortMock.binding.open>>;

let nextPortNumber = 1;

/**
 * The in-process simulator on the far end of a mock serial port, so a simulated bench runs
 * through exactly the serial code path a real one does. The simulator's lines are fed into the
 * port as received bytes; bytes the hub writes are framed into lines and handed to the
 * simulator; unplugging the simulator breaks the port as a pulled USB cable does.
 */
export class SimulatedTransport implements ScaleTransport {
  readonly kind = 'simulated' as const;
  readonly description = 'simulated scale (in the hub)';
  readonly simulator: SimulatedScale;
  private readonly path: string;
  private readonly binding: BindingInterface<SimulatedPortBinding>;

  constructor(link: SimulatedLinkSettings, benchId: string, simulator?: SimulatedScale) {
    this.simulator =
      simulator ??
      new SimulatedScale({
        ...link.simulator,
        ...(link.format === 'auto' ? {} : { format: link.format }),
      });
    // Mock ports live in one registry shared by the process: make each path unique.
    this.path = `/dev/tareline-sim-${benchId}-${nextPortNumber++}`;
    SerialPortMock.binding.createPort(this.path);
    const simulatorRef = this.simulator;
    this.binding = {
      list: () => SerialPortMock.binding.list(),
      async open(options: OpenOptions): Promise<SimulatedPortBinding> {
        if (!simulatorRef.plugged) {
          throw new TransportOpenError(`${options.path}: simulated scale unplugged`, true);
        }
        return new SimulatedPortBinding(await SerialPortMock.binding.open(options), simulatorRef);
      },
    };
    this.simulator.start();
  }

  open(): Promise<ScaleConnection> {
    const port = new SerialPortStream({
      binding: this.binding,
      path: this.path,
      baudRate: 9600,
      autoOpen: false,
    });
    return openSerialStream(port, this.path);
  }

  async dispose(): Promise<void> {
    this.simulator.stop();
  }
}

/** A mock port binding with the simulator attached to its far end. */
class SimulatedPortBinding implements BindingPortInterface {
  private readonly commands = new LineSplitter();
  private readonly unsubscribe: (() => void)[] = [];
  private rejectRead: ((err: Error) => void) | undefined;

  constructor(
    private readonly inner: MockPort,
    private readonly simulator: SimulatedScale,
  ) {
    this.unsubscribe.push(
      simulator.onLine((line) => {
        if (inner.isOpen) inner.emitData(`${line}\r\n`);
      }),
      simulator.onPlug((plugged) => {
        if (!plugged) this.rejectRead?.(new Error('simulated scale unplugged (EIO)'));
      }),
    );
  }

  get openOptions(): Required<OpenOptions> {
    return this.inner.openOptions;
  }

  get isOpen(): boolean {
    return this.inner.isOpen;
  }

  async close(): Promise<void> {
    for (const off of this.unsubscribe.splice(0)) off();
    await this.inner.close();
  }

  read(buffer: Buffer, offset: number, length: number) {
    // A pulled cable fails the pending read with an I/O error, which the stream treats as a
    // disconnect; the inner read is then cancelled by the close that follows.
    const unplugged = new Promise<never>((_, reject) => (this.rejectRead = reject));
    return Promise.race([this.inner.read(buffer, offset, length), unplugged]).finally(() => {
      this.rejectRead = undefined;
    });
  }

  async write(buffer: Buffer): Promise<void> {
    await this.inner.write(buffer);
    for (const line of this.commands.push(buffer.toString('latin1'))) this.simulator.receive(line);
  }

  update(options: UpdateOptions): Promise<void> {
    return this.inner.update(options);
  }

  set(options: SetOptions): Promise<void> {
    return this.inner.set(options);
  }

  get(): Promise<PortStatus> {
    return this.inner.get();
  }

  getBaudRate(): Promise<{ baudRate: number }> {
    return this.inner.getBaudRate();
  }

  flush(): Promise<void> {
    return this.inner.flush();
  }

  drain(): Promise<void> {
    return this.inner.drain();
  }
}
