/**
 * One built hub for `npm run bench:multi-hub`: `count` benches per prefix (`a,b`: bench-a1…,
 * bench-b1…), each a
 * mock serial port fed by a line source, read by this hub. The database is PGlite, or the server
 * in DATABASE_URL (shared with the other hub of the run).
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

const [prefixes = 'a', countText = '50', rateText = '20'] = process.argv.slice(2);
const benchCount = Number(countText);
const rateHz = Number(rateText);

const dataDir = await mkdtemp(join(tmpdir(), 'tareline-bench-'));
const config = loadConfig({
  ...process.env,
  PORT: '0',
  HOST: '127.0.0.1',
  LOG_LEVEL: 'error',
  TARELINE_DATA_DIR: dataDir,
});
const app = await createApp(config);
await app.listen(0, '127.0.0.1');
const scales = app.get(ScalesService);
// The default bench reads the simulator; it is not part of the measurement.
if (scales.has('bench-1')) await scales.detach('bench-1');

const sources = new Map<string, LineSource>();
scales.configure({
  transportFactory: (benchId, link) =>
    new SerialTransport(link as SerialLinkSettings, sources.get(benchId)!.binding),
});
const ids = prefixes
  .split(',')
  .flatMap((prefix) => Array.from({ length: benchCount }, (_, i) => `bench-${prefix}${i + 1}`));
await app
  .get(Database)
  .db.insert(benchesTable)
  .values(ids.map((id) => ({ id, name: id, hubId: config.hub.id })))
  .onConflictDoNothing();
for (const id of ids) {
  const source = new LineSource(id, rateHz);
  sources.set(id, source);
  await scales.attach(id, parseScaleUrl(`serial://${source.path}?format=headered`));
}

const { port } = app.getHttpServer().address() as { port: number };
const signIn = await fetch(`http://127.0.0.1:${port}/api/auth/login`, {
  method: 'POST',
  headers: { 'Content-Type': 'application/json' },
  body: JSON.stringify({ email: 'ilse.varga@hollin-ridge.example', password: 'ridge-lead-demo' }),
});
const { token } = (await signIn.json()) as { token: string };
serveParent([...sources.values()]);
[...sources.values()].forEach((s, i) => s.start((i * 1000) / rateHz / ids.length));
process.send?.({ type: 'ready', port, token });

process.on('exit', () => rmSync(dataDir, { recursive: true, force: true }));
