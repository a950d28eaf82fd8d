/**
 * The baseline: a bare relay. Reads lines from mock serial ports and emits each raw line to the
 * bench's room on socket.io, with no decoding, judging or throttling.
 */
import { createServer } from 'node:http';
import { ReadlineParser } from 'serialport';
import { SerialPortStream } from '@serialport/stream';
import { Server } from 'socket.io';
import { LineSource, serveParent } from './line-source.js';

const benches = Number(process.argv[2]);
const rateHz = Number(process.argv[3]);

const http = createServer();
const io = new Server(http);
const live = io.of('/live');
live.on('connection', (socket) => {
  void socket.join(`bench:${String(socket.handshake.query.benchId)}`);
});

const sources: LineSource[] = [];
for (let i = 0; i < benches; i += 1) {
  const benchId = `bench-b${i + 1}`;
  const source = new LineSource(benchId, rateHz);
  sources.push(source);
  const port = new SerialPortStream({ binding: source.binding, path: source.path, baudRate: 9600 });
  const lines = port.pipe(new ReadlineParser({ delimiter: '\r\n' }));
  lines.on('data', (line: string) => live.to(`bench:${benchId}`).emit('line', { benchId, line }));
}

http.listen(0, '127.0.0.1', () => {
  const { port } = http.address() as { port: number };
  serveParent(sources);
  sources.forEach((s, i) => s.start((i * 1000) / rateHz / benches));
  process.send?.({ type: 'ready', port });
});
