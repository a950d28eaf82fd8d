/**
 * `npm run bench:multi-hub`: readings of 50 benches read by one hub, received by clients on
 * another hub sharing a PostgreSQL server (the socket.io PostgreSQL adapter), against the same
 * benches on one hub. Latency from a line written into a bench's serial port to the event at the
 * client (p50, p99), and CPU of the hubs (and of the PostgreSQL server). Writes the multi-hub
 * section of docs/benchmarks.md.
 */
import { execFileSync } from 'node:child_process';
import { fork, type ChildProcess } from 'node:child_process';
import { readdirSync, readFileSync } from 'node:fs';
import { readFile, writeFile } from 'node:fs/promises';
import { cpus, loadavg, release, totalmem, type } from 'node:os';
import { resolve } from 'node:path';
import pg from 'pg';
import { io, type Socket } from 'socket.io-client';
import { startPgCluster } from '../test/support/pg-cluster.js';
import { nowMs, type ChildMessage, type ParentMessage } from './line-source.js';

const RATE_HZ = 20;
const BENCHES = 50;
const WARMUP_MS = 4_000;
const WINDOW_MS = Number(process.env.BENCH_MULTI_WINDOW_S ?? 15) * 1000;
const here = import.meta.dirname;
const docPath = resolve(here, '..', '..', 'docs', 'benchmarks.md');
const SECRETS = {
  TARELINE_JWT_SECRET: 'bench-jwt-secret-shared-by-both-hubs-0123456789',
  TARELINE_BADGE_KEY: 'bench-badge-key-shared-by-both-hubs-0123456789',
};

interface Hub {
  child: ChildProcess;
  port: number;
  token: string;
}

type Report = Extract<ChildMessage, { type: 'report' }>;

function waitMessage<T extends ChildMessage['type']>(
  child: ChildProcess,
  kind: T,
): Promise<Extract<ChildMessage, { type: T }>> {
  return new Promise((done, fail) => {
    const onMessage = (message: ChildMessage) => {
      if (message.type !== kind) return;
      child.off('message', onMessage);
      done(message as Extract<ChildMessage, { type: T }>);
    };
    child.on('message', onMessage);
    child.once('exit', (code) => fail(new Error(`hub process exited with ${code}`)));
  });
}

async function startHub(prefix: string, env: Record<string, string>): Promise<Hub> {
  const child = fork(
    resolve(here, 'multi-hub-child.ts'),
    [prefix, String(BENCHES), String(RATE_HZ)],
    {
      execArgv: ['--import', 'tsx/esm'],
      env: { ...process.env, ...env },
      stdio: ['ignore', 'inherit', 'inherit', 'ipc'],
    },
  );
  const { port, token } = await waitMessage(child, 'ready');
  return { child, port, token: token ?? '' };
}

/** CPU time (ms) of every process of the `postgres` user: the throwaway server's. */
function postgresCpuMs(): number | undefined {
  let uid: string;
  try {
    uid = execFileSync('id', ['-u', 'postgres'], { encoding: 'utf8' }).trim();
  } catch {
    return undefined;
  }
  if (uid === String(process.getuid?.())) return undefined; // not told apart from ours
  let ticks = 0;
  for (const pid of readdirSync('/proc').filter((p) => /^\d+$/.test(p))) {
    try {
      if (!new RegExp(`^Uid:\\s+${uid}\\s`, 'm').test(readFileSync(`/proc/${pid}/status`, 'utf8')))
        continue;
      const fields = readFileSync(`/proc/${pid}/stat`, 'utf8').split(') ')[1]!.split(' ');
      ticks += Number(fields[11]) + Number(fields[12]); // utime, stime (fields 14 and 15)
    } catch {
      // a process that ended meanwhile
    }
  }
  return ticks * 10; // USER_HZ is 100 on Linux
}

function quantile(sorted: number[], q: number): number {
  if (sorted.length === 0) return Number.NaN;
  return sorted[Math.min(sorted.length - 1, Math.max(0, Math.ceil(q * sorted.length) - 1))]!;
}

interface Result {
  name: string;
  p50: number;
  p99: number;
  events: number;
  expected: number;
  hubCpuPct: number;
  pgCpuPct: number | undefined;
}

/** Clients watch `watched`'s benches `bench-a1…` through `served`; all hubs report CPU. */
async function measure(name: string, hubs: Hub[], watched: Hub, served: Hub): Promise<Result> {
  const received: { benchId: string; n: number; at: number }[] = [];
  let recording = false;
  const sockets: Socket[] = [];
  for (let i = 0; i < BENCHES; i += 1) {
    const benchId = `bench-a${i + 1}`;
    const socket = io(`http://127.0.0.1:${served.port}/live`, {
      query: { benchId },
      auth: { token: served.token },
      transports: ['websocket'],
    });
    socket.on('reading', (r: { netG: number }) => {
      if (recording) received.push({ benchId, n: Math.round(r.netG * 100), at: nowMs() });
    });
    sockets.push(socket);
  }
  await Promise.all(
    sockets.map(
      (s) =>
        new Promise<void>((done, fail) => {
          if (s.connected) return done();
          s.once('connect', () => done());
          s.once('connect_error', fail);
        }),
    ),
  );
  await new Promise((r) => setTimeout(r, WARMUP_MS));
  recording = true;
  const pgBefore = postgresCpuMs();
  const wallBefore = performance.now();
  for (const hub of hubs) hub.child.send({ type: 'start-window' } satisfies ParentMessage);
  await new Promise((r) => setTimeout(r, WINDOW_MS));
  recording = false;
  const reports: Report[] = [];
  for (const hub of hubs) {
    const report = waitMessage(hub.child, 'report');
    hub.child.send({ type: 'end-window' } satisfies ParentMessage);
    reports.push(await report);
  }
  const pgAfter = postgresCpuMs();
  const wall = performance.now() - wallBefore;
  for (const s of sockets) s.disconnect();
  const written = new Map(
    Object.entries(reports[hubs.indexOf(watched)]!.written).map(([id, e]) => [id, new Map(e)]),
  );
  const latencies = received
    .map((r) => r.at - (written.get(r.benchId)?.get(r.n) ?? Number.NaN))
    .filter(Number.isFinite)
    .sort((a, b) => a - b);
  return {
    name,
    p50: quantile(latencies, 0.5),
    p99: quantile(latencies, 0.99),
    events: latencies.length,
    expected: Math.round((BENCHES * RATE_HZ * WINDOW_MS) / 1000),
    hubCpuPct: reports.reduce((sum, r) => sum + (r.cpuMs / r.wallMs) * 100, 0),
    pgCpuPct:
      pgBefore !== undefined && pgAfter !== undefined
        ? ((pgAfter - pgBefore) / wall) * 100
        : undefined,
  };
}

async function stop(hubs: Hub[]): Promise<void> {
  await Promise.all(
    hubs.map(
      (hub) =>
        new Promise<void>((done) => {
          hub.child.once('exit', () => done());
          hub.child.send({ type: 'exit' } satisfies ParentMessage);
        }),
    ),
  );
}

async function newDatabase(adminUrl: string, name: string): Promise<string> {
  const client = new pg.Client({ connectionString: adminUrl });
  await client.connect();
  await client.query(`create database ${name}`).finally(() => client.end());
  const url = new URL(adminUrl);
  url.pathname = `/${name}`;
  return url.toString();
}

const loadBefore = loadavg()[0]!;
const cluster = await startPgCluster();
const results: Result[] = [];
try {
  // The same 100 benches on one hub (embedded PGlite, then a server): clients watch 50 of them.
  {
    const one = await startHub('a,b', { TARELINE_HUB_ID: 'one' });
    results.push(await measure('one hub, PGlite: 100 benches, clients on it', [one], one, one));
    await stop([one]);
  }
  {
    const url = await newDatabase(cluster.adminUrl, 'bench_one');
    const one = await startHub('a,b', { DATABASE_URL: url, ...SECRETS, TARELINE_HUB_ID: 'one' });
    results.push(await measure('one hub, PostgreSQL: 100 benches, clients on it', [one], one, one));
    await stop([one]);
  }
  // Two hubs, 50 benches each; clients on hall-b watch hall-a's benches.
  {
    const url = await newDatabase(cluster.adminUrl, 'bench_two');
    const env = { DATABASE_URL: url, ...SECRETS };
    const hallA = await startHub('a', { ...env, TARELINE_HUB_ID: 'hall-a' });
    const hallB = await startHub('b', { ...env, TARELINE_HUB_ID: 'hall-b' });
    // hall-b learns hall-a's benches from its heartbeat (every second).
    await new Promise((r) => setTimeout(r, 3_000));
    results.push(
      await measure(
        "two hubs, 50 benches each: hall-a's benches, clients on hall-b",
        [hallA, hallB],
        hallA,
        hallB,
      ),
    );
    await stop([hallA, hallB]);
  }
} finally {
  cluster.stop();
}

const loadAfter = loadavg()[0]!;
for (const r of results) {
  process.stdout.write(
    `${r.name}: p50 ${r.p50.toFixed(2)} ms, p99 ${r.p99.toFixed(2)} ms, hubs ${r.hubCpuPct.toFixed(1)} %, ` +
      `PostgreSQL ${r.pgCpuPct?.toFixed(1) ?? 'n/a'} %, ${r.events}/${r.expected} events\n`,
  );
}
const cpu = cpus()[0]?.model ?? 'unknown CPU';
const machine =
  `${cpus().length} × ${cpu.trim()}, ${(totalmem() / 2 ** 30).toFixed(1)} GiB RAM, ${type()} ${release()}, ` +
  `Node.js ${process.versions.node}`;
const rows = results.map(
  (r) =>
    `| ${r.name} | ${r.p50.toFixed(2)} | ${r.p99.toFixed(2)} | ${r.hubCpuPct.toFixed(1)} % | ` +
    `${r.pgCpuPct === undefined ? 'n/a' : `${r.pgCpuPct.toFixed(1)} %`} | ${r.events} / ${r.expected} |`,
);
const section = `<!-- bench:multi-hub start -->
## Several hubs on one PostgreSQL: readings across hubs (\`npm run bench:multi-hub\`)

Run on ${new Date().toISOString().slice(0, 10)}: ${machine}. Load average (1 min) ${loadBefore.toFixed(1)}
before the run and ${loadAfter.toFixed(1)} after it.

Each bench is a mock serial port written with \`headered\` lines at ${RATE_HZ} lines a second, as in
the live-weights benchmark; ${BENCHES} socket.io clients (one per bench of hall-a, in the
benchmark's own process) receive the readings. Latency is from the moment a line is written into
a port to the moment the client receives the event. CPU is user + system time of the hub
processes (summed) over the ${WINDOW_MS / 1000} s window after ${WARMUP_MS / 1000} s of warm-up, as a share of one core,
line writers included; **PostgreSQL** is the throwaway server's processes (the NOTIFY traffic of
the socket.io adapter, the heartbeats). The PostgreSQL server is a throwaway cluster on the same
machine with fsync off.

| setup | p50 ms | p99 ms | hubs CPU | PostgreSQL CPU | events / lines expected |
| --- | ---: | ---: | ---: | ---: | ---: |
${rows.join('\n')}

The machine is shared (2 cores, other work running), so single runs vary; rerun to compare.
<!-- bench:multi-hub end -->
`;
let doc = await readFile(docPath, 'utf8').catch(() => '# Benchmarks\n');
const marked = /<!-- bench:multi-hub start -->[\s\S]*<!-- bench:multi-hub end -->\n?/;
doc = marked.test(doc) ? doc.replace(marked, section) : `${doc.trimEnd()}\n\n${section}`;
await writeFile(docPath, doc);
process.stdout.write(`Results written to ${docPath}\n`);
