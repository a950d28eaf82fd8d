import { connect, type Socket } from 'node:net';
import { describeScaleLink, type TcpLinkSettings } from '@tareline/protocol';
import { toOpenError, type ScaleConnection, type ScaleTransport } from './scale-transport.js';

/** How long a connect may take before it counts as nobody there. */
const CONNECT_TIMEOUT_MS = 5_000;

/** A scale behind a serial-to-network adapter: a raw TCP stream of the scale's bytes. */
export class TcpTransport implements ScaleTransport {
  readonly kind = 'tcp' as const;
  readonly description: string;

  constructor(private readonly link: TcpLinkSettings) {
    this.description = describeScaleLink(link);
  }

  open(): Promise<ScaleConnection> {
    const what = `${this.link.host}:${this.link.port}`;
    return new Promise((resolve, reject) => {
      const socket: Socket = connect({ host: this.link.host, port: this.link.port });
      socket.setNoDelay(true);
      const fail = (err: Error) => {
        socket.destroy();
        reject(toOpenError(err, what));
      };
      socket.setTimeout(CONNECT_TIMEOUT_MS, () =>
        fail(Object.assign(new Error('connect timed out'), { code: 'EHOSTUNREACH' })),
      );
      socket.once('error', fail);
      socket.once('connect', () => {
        socket.off('error', fail);
        socket.setTimeout(0);
        // Half-silent adapters: let the OS notice a dead peer.
        socket.setKeepAlive(true, 5_000);
        resolve({
          stream: socket,
          close: () =>
            new Promise<void>((done) => {
              if (socket.destroyed) return done();
              socket.once('close', () => done());
              socket.destroy();
            }),
        });
      });
    });
  }

  async dispose(): Promise<void> {}
}
