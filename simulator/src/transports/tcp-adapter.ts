import { createServer, type Server, type Socket } from 'node:net';
import { LineSplitter } from '@tareline/protocol';
import type { SimulatedScale } from '../simulated-scale.js';

export interface TcpAdapter {
  /** The port it listens on (useful with port 0). */
  readonly port: number;
  close(): Promise<void>;
}

/**
 * The balance behind a serial-to-network adapter: every client gets the printed lines with
 * CR LF and may send commands. Unplugging the balance drops every client and stops listening
 * until it is plugged in again, as an adapter with a dead serial side looks to the hub.
 */
export async function serveTcp(
  scale: SimulatedScale,
  opts: { port: number; host?: string },
): Promise<TcpAdapter> {
  const host = opts.host ?? '127.0.0.1';
  const clients = new Set<Socket>();
  let server: Server | undefined;
  let port = opts.port;

  const offLine = scale.onLine((line) => {
    for (const client of clients) client.write(`${line}\r\n`, 'latin1');
  });

  const listen = () =>
    new Promise<void>((resolve, reject) => {
      const next = createServer((socket) => {
        clients.add(socket);
        socket.setNoDelay(true);
        socket.setEncoding('latin1');
        const splitter = new LineSplitter({ maxLength: 64 });
        socket.on('data', (chunk: string) => {
          for (const line of splitter.push(chunk)) scale.receive(line);
        });
        socket.on('error', () => socket.destroy());
        socket.on('close', () => clients.delete(socket));
      });
      next.once('error', reject);
      next.listen(port, host, () => {
        next.off('error', reject);
        const address = next.address();
        if (address && typeof address === 'object') port = address.port;
        server = next;
        resolve();
      });
    });

  const shut = () =>
    new Promise<void>((resolve) => {
      for (const client of clients) client.destroy();
      clients.clear();
      if (!server) return resolve();
      server.close(() => resolve());
      server = undefined;
    });

  const offPlug = scale.onPlug((plugged) => {
    const change = plugged ? listen() : shut();
    change.catch((error: Error) => {
      process.stderr.write(`tcp adapter: ${error.message}\n`);
    });
  });

  await listen();
  return {
    get port() {
      return port;
    },
    async close() {
      offLine();
      offPlug();
      await shut();
    },
  };
}
