/**
 * The real hub (built, from dist/) with benches whose scales are mock serial ports fed by line
 * sources: the full path of a line through the scale link, the codec, stability, the throttle
 * and the live gateway.
 */
import { rmSync } from 'node:fs';
import { mkdtemp } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import 'reflect-metadata';
import { parseScaleUrl, type SerialLinkSettings } from '@tareline/protocol';
import { LineSource, serveParent } from './line-source.js';

// Types from the source, code from the build: Nest needs the decorator metadata tsc emits.
const dist = resolve(import.meta.dirname, '..', 'dist');
const { createApp } = (await import(join(dist, 'app.js'))) as typeof import('../src/app.js');
const { loadConfig } = (await import(
  join(dist, 'config', 'app-config.js')
)) as typeof import('../src/config/app-config.js');
const { ScalesService } = (await import(
  join(dist, 'scales', 'scales.service.js')
)) as typeof import('../src/scales/scales.service.js');
const { SerialTransport } = (await import(
  join(dist, 'scales', 'transports', 'serial.transport.js')
)) as typeof import('../src/scales/transports/serial.transport.js');
const { Database } = (await import(
  join(dist, 'database', 'database.js')
)) as typeof import('../src/database/database.js');
const { benches: benchesTable } = (await import(
  join(dist, 'database', 'schema', 'index.js')
)) as typeof import('../src/database/schema/index.js');

const benchCount = Number(process.argv[2]);
const rateHz = Number(process.argv[3]);

const dataDir = await mkdtemp(join(tmpdir(), 'tareline-bench-'));
const config = loadConfig({
  PORT: '0',
  HOST: '127.0.0.1',
  LOG_LEVEL: 'error',
  TARELINE_DATA_DIR: dataDir,
});
const app = await createApp(config);
await app.listen(0, '127.0.0.1');
const scales = app.get(ScalesService);
// bench-1 reads the simulator by default; it is not part of the measurement.
await scales.detach('bench-1');

const sources = new Map<string, LineSource>();
scales.configure({
  transportFactory: (benchId, link) =>
    new SerialTransport(link as SerialLinkSettings, sources.get(benchId)!.binding),
});
const ids = Array.from({ length: benchCount }, (_, i) => `bench-b${i + 1}`);
await app
  .get(Database)
  .db.insert(benchesTable)
  .values(ids.map((id) => ({ id, name: id })));
for (const id of ids) {
  const source = new LineSource(id, rateHz);
  sources.set(id, source);
  await scales.attach(id, parseScaleUrl(`serial://${source.path}?format=headered`));
}

const { port } = app.getHttpServer().address() as { port: number };
// The live socket needs a signed-in person: the demo shop's lead may watch every bench.
const signIn = await fetch(`http://127.0.0.1:${port}/api/auth/login`, {
  method: 'POST',
  headers: { 'Content-Type': 'application/json' },
  body: JSON.stringify({
    email: 'ilse.varga@hollin-ridge.example',
    password: 'ridge-lead-demo',
  }),
});
const { token } = (await signIn.json()) as { token: string };
serveParent([...sources.values()]);
[...sources.values()].forEach((s, i) => s.start((i * 1000) / rateHz / benchCount));
process.send?.({ type: 'ready', port, token });

process.on('exit', () => rmSync(dataDir, { recursive: true, force: true }));
