/**
 * `npm run bench:live`: latency from a line written into the serial side to the socket.io event
 * received by a client (p50, p99), and the CPU of the process serving them, for 1, 10 and 50
 * benches at 20 lines a second — the real hub side by side with a bare relay (line in, raw line
 * out) in the same run. Writes docs/benchmarks.md (the live-scale section).
 */
import { fork, type ChildProcess } from 'node:child_process';
import { readFile, writeFile } from 'node:fs/promises';
import { cpus, loadavg, release, totalmem, type } from 'node:os';
import { resolve } from 'node:path';
import { io, type Socket } from 'socket.io-client';
import { nowMs, type ChildMessage, type ParentMessage } from './line-source.js';

const RATE_HZ = 20;
const BENCH_COUNTS = (process.env.BENCH_LIVE_BENCHES ?? '1,10,50').split(',').map(Number);
const WARMUP_MS = 3_000;
// A shorter window for a quick look: BENCH_LIVE_WINDOW_S=3 npm run bench:live
const WINDOW_MS = Number(process.env.BENCH_LIVE_WINDOW_S ?? 15) * 1000;
const here = import.meta.dirname;
const docPath = resolve(here, '..', '..', 'docs', 'benchmarks.md');

interface Result {
  variant: 'relay' | 'hub';
  benches: number;
  events: number;
  expected: number;
  p50: number;
  p99: number;
  max: number;
  cpuPct: number;
}

function quantile(sorted: number[], q: number): number {
  if (sorted.length === 0) return Number.NaN;
  const index = Math.min(sorted.length - 1, Math.max(0, Math.ceil(q * sorted.length) - 1));
  return sorted[index]!;
}

function waitMessage<T extends ChildMessage['type']>(
  child: ChildProcess,
  type: T,
): Promise<Extract<ChildMessage, { type: T }>> {
  return new Promise((done, fail) => {
    const onMessage = (message: ChildMessage) => {
      if (message.type === type) {
        child.off('message', onMessage);
        done(message as Extract<ChildMessage, { type: T }>);
      }
    };
    child.on('message', onMessage);
    child.once('exit', (code) => fail(new Error(`benchmark process exited with ${code}`)));
  });
}

async function run(variant: 'relay' | 'hub', benches: number): Promise<Result> {
  const script = resolve(here, variant === 'hub' ? 'hub-child.ts' : 'relay-child.ts');
  const child = fork(script, [String(benches), String(RATE_HZ)], {
    // ESM hooks only: tsx's CommonJS hook would load a second @nestjs/core for the CommonJS
    // packages (throttler), and Nest would not recognise its own Reflector.
    execArgv: ['--import', 'tsx/esm'],
    stdio: ['ignore', 'inherit', 'inherit', 'ipc'],
  });
  const { port, token } = await waitMessage(child, 'ready');
  const received: { benchId: string; n: number; at: number }[] = [];
  let recording = false;
  const sockets: Socket[] = [];
  for (let i = 0; i < benches; i += 1) {
    const benchId = `bench-b${i + 1}`;
    const socket = io(`http://127.0.0.1:${port}/live`, {
      query: { benchId },
      auth: token ? { token } : {},
      transports: ['websocket'],
    });
    const record = (n: number) => {
      if (recording) received.push({ benchId, n, at: nowMs() });
    };
    socket.on('reading', (r: { netG: number }) => record(Math.round(r.netG * 100)));
    socket.on('line', (m: { line: string }) => {
      const value = /[+-]\d+\.\d+/.exec(m.line)?.[0];
      if (value) record(Math.round(Number(value) * 100));
    });
    sockets.push(socket);
  }
  await Promise.all(
    sockets.map((s) =>
      s.connected ? undefined : new Promise<void>((r) => s.once('connect', () => r())),
    ),
  );
  await new Promise((r) => setTimeout(r, WARMUP_MS));
  recording = true;
  child.send({ type: 'start-window' } satisfies ParentMessage);
  await new Promise((r) => setTimeout(r, WINDOW_MS));
  recording = false;
  child.send({ type: 'end-window' } satisfies ParentMessage);
  const report = await waitMessage(child, 'report');
  for (const s of sockets) s.disconnect();
  child.send({ type: 'exit' } satisfies ParentMessage);

  const written = new Map(Object.entries(report.written).map(([id, e]) => [id, new Map(e)]));
  const latencies = received
    .map((r) => r.at - (written.get(r.benchId)?.get(r.n) ?? Number.NaN))
    .filter(Number.isFinite)
    .sort((a, b) => a - b);
  return {
    variant,
    benches,
    events: latencies.length,
    expected: Math.round((benches * RATE_HZ * WINDOW_MS) / 1000),
    p50: quantile(latencies, 0.5),
    p99: quantile(latencies, 0.99),
    max: latencies.at(-1) ?? Number.NaN,
    cpuPct: (report.cpuMs / report.wallMs) * 100,
  };
}

const loadBefore = loadavg()[0]!;
const results: Result[] = [];
for (const benches of BENCH_COUNTS) {
  for (const variant of ['relay', 'hub'] as const) {
    const result = await run(variant, benches);
    results.push(result);
    process.stdout.write(
      `${variant.padEnd(5)} ${String(benches).padStart(2)} benches: p50 ${result.p50.toFixed(2)} ms, ` +
        `p99 ${result.p99.toFixed(2)} ms, max ${result.max.toFixed(1)} ms, CPU ${result.cpuPct.toFixed(1)} % of one core, ` +
        `${result.events}/${result.expected} events\n`,
    );
  }
}

const cpu = cpus()[0]?.model ?? 'unknown CPU';
const machine =
  `${cpus().length} × ${cpu.trim()}, ${(totalmem() / 2 ** 30).toFixed(1)} GiB RAM, ${type()} ${release()}, ` +
  `Node.js ${process.versions.node}`;
const rows = BENCH_COUNTS.map((benches) => {
  const relay = results.find((r) => r.variant === 'relay' && r.benches === benches)!;
  const hub = results.find((r) => r.variant === 'hub' && r.benches === benches)!;
  const f = (x: number) => x.toFixed(2);
  return (
    `| ${benches} | ${f(relay.p50)} | ${f(relay.p99)} | ${relay.cpuPct.toFixed(1)} % | ` +
    `${f(hub.p50)} | ${f(hub.p99)} | ${hub.cpuPct.toFixed(1)} % | ${f(hub.p99 - relay.p99)} | ` +
    `${hub.events} / ${hub.expected} |`
  );
});
const section = `<!-- bench:live start -->
## Live weights: serial line to socket event (\`npm run bench:live\`)

Run on ${new Date().toISOString().slice(0, 10)}: ${machine}. Load average (1 min) ${loadBefore.toFixed(1)}
before the run and ${loadavg()[0]!.toFixed(1)} after it.

Each bench is a mock serial port (serialport's mock binding) written with \`headered\` lines at
${RATE_HZ} lines a second; one socket.io client per bench, in another process, receives the
events. Latency is from the moment a line is written into the port to the moment the client
receives the event (both clocks are \`performance.timeOrigin + performance.now()\` on the same
machine). CPU is the serving process's user + system time over the ${WINDOW_MS / 1000} s window
(after ${WARMUP_MS / 1000} s of warm-up), as a share of one core; it includes the line writers,
which are the same in both columns. **Relay** reads a line and emits it raw (no decoding,
judging or throttle); **hub** is the built hub: scale link, codec, stability, the 25-a-second
throttle and the live gateway.

| benches | relay p50 ms | relay p99 ms | relay CPU | hub p50 ms | hub p99 ms | hub CPU | hub p99 − relay p99 ms | hub events / lines expected |
| ---: | ---: | ---: | ---: | ---: | ---: | ---: | ---: | ---: |
${rows.join('\n')}

Targets: hub p99 within 5 ms of the relay; 50 benches under a quarter of one core.
The machine is shared (2 cores, other work running), so single runs vary; rerun to compare.
<!-- bench:live end -->
`;
let doc = await readFile(docPath, 'utf8').catch(() => '# Benchmarks\n');
doc = /<!-- bench:live start -->[\s\S]*<!-- bench:live end -->\n?/.test(doc)
  ? doc.replace(/<!-- bench:live start -->[\s\S]*<!-- bench:live end -->\n?/, section)
  : `${doc.trimEnd()}\n\n${section}`;
await writeFile(docPath, doc);
process.stdout.write(`Results written to ${docPath}\n`);
