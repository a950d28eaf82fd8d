import { access } from 'node:fs/promises';
import type { BindingInterface } from '@serialport/bindings-interface' with {
  'resolution-mode': 'require',
};
import { SerialPortStream } from '@serialport/stream';
import { describeScaleLink, type SerialLinkSettings } from '@tareline/protocol';
import { SerialPort } from 'serialport';
import { toOpenError, type ScaleConnection, type ScaleTransport } from './scale-transport.js';

/** Opens a serial port and settles the close callback API into a promise that never rejects. */
export async function openSerialStream(
  port: SerialPortStream,
  what: string,
): Promise<ScaleConnection> {
  await new Promise<void>((resolve, reject) =>
    port.open((err) => (err ? reject(toOpenError(err, what)) : resolve())),
  );
  return {
    stream: port,
    close: () =>
      new Promise<void>((resolve) => {
        if (!port.isOpen) return resolve();
        port.close(() => resolve());
      }),
  };
}

/**
 * A scale on a serial port, through the real serialport bindings (or, in tests, any binding with
 * the same interface, such as the mock binding).
 */
export class SerialTransport implements ScaleTransport {
  readonly kind = 'serial' as const;
  readonly description: string;

  constructor(
    private readonly link: SerialLinkSettings,
    private readonly binding?: BindingInterface,
  ) {
    this.description = describeScaleLink(link);
  }

  open(): Promise<ScaleConnection> {
    const options = {
      path: this.link.path,
      baudRate: this.link.baudRate,
      dataBits: this.link.dataBits,
      parity: this.link.parity,
      stopBits: this.link.stopBits,
      rtscts: this.link.rtscts,
      autoOpen: false,
    };
    const port = this.binding
      ? new SerialPortStream({ ...options, binding: this.binding })
      : new SerialPort(options);
    return openSerialStream(port, this.link.path);
  }

  async stillThere(): Promise<boolean> {
    // A binding other than the real one (the mock) has no device file to look at.
    if (this.binding) return true;
    return access(this.link.path).then(
      () => true,
      () => false,
    );
  }

  async dispose(): Promise<void> {}
}
