/**
 * How the lead's desk queries hold up on many batches. Opens a fresh data folder (migrated),
 * seeds N invented batches with the seed script's generator (`hub/scripts/batch-seed.ts`, COPY
 * chunks), then times through the desk repository (no HTTP): the first page of the list with
 * each sort and each filter, a page deep in a cursor walk, the accuracy query per group (from the
 * daily roll-up, and from the batches themselves), and the CSV export of everything (rows a
 * second, peak RSS).
 *
 *   npm run bench:review -- [N]        (default 1,000,000)
 *
 * Results go in docs/benchmarks.md by hand, with the machine they ran on.
 */
import { mkdtemp, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { Writable } from 'node:stream';
import { pipeline } from 'node:stream/promises';
import type { BatchSort } from '@tareline/protocol';
import { AuditRepository } from '../src/audit/audit.repository.js';
import type { SignInService } from '../src/auth/sign-in.service.js';
import { BatchDeskRepository, type BatchSearch } from '../src/batches/batch-desk.repository.js';
import { BatchDeskService } from '../src/batches/batch-desk.service.js';
import type { BatchesRepository } from '../src/batches/batches.repository.js';
import type { BatchesService } from '../src/batches/batches.service.js';
import { systemClock } from '../src/common/clock.js';
import { Database } from '../src/database/database.js';
import { seedBatches } from '../scripts/batch-seed.js';

const repoRoot = resolve(import.meta.dirname, '..', '..');
const count = Number(process.argv[2] ?? 1_000_000);
const RUNS = 15;
const mib = (bytes: number) => (bytes / 2 ** 20).toFixed(0);

/**
 * p50 and p95 of the wall time of `run`, and the p50 of the CPU time this process spent in it
 * (PGlite runs inside it, so that is the query's own work): on a shared, loaded machine the wall
 * time also counts the waits for a core, the CPU time does not.
 */
async function time(
  run: () => Promise<unknown>,
): Promise<{ p50: number; p95: number; cpu50: number }> {
  await run();
  const ms: number[] = [];
  const cpu: number[] = [];
  for (let i = 0; i < RUNS; i += 1) {
    const t = performance.now();
    const c = process.cpuUsage();
    await run();
    ms.push(performance.now() - t);
    const used = process.cpuUsage(c);
    cpu.push((used.user + used.system) / 1000);
  }
  const at = (xs: number[], q: number) =>
    [...xs].sort((a, b) => a - b)[Math.min(xs.length - 1, Math.ceil(q * xs.length) - 1)]!;
  return { p50: at(ms, 0.5), p95: at(ms, 0.95), cpu50: at(cpu, 0.5) };
}

async function main(): Promise<void> {
  const dir = await mkdtemp(join(tmpdir(), 'tareline-review-bench-'));
  const database = await Database.open(dir, resolve(repoRoot, 'drizzle'));
  try {
    const seeding = performance.now();
    const seeded = await seedBatches(database, {
      count,
      end: new Date('2026-12-01T00:00:00Z'),
      onProgress: (n) => {
        if (n % 100_000 === 0) console.log(`${n} written`);
      },
    });
    console.log(
      `seeded ${count} batches in ${((performance.now() - seeding) / 1000).toFixed(1)} s:`,
      JSON.stringify(seeded),
    );
    const repo = new BatchDeskRepository(database, {} as BatchesRepository);
    const base: BatchSearch = { sort: '-createdAt', limit: 50 };
    const rows: [string, Partial<BatchSearch>][] = [
      ...(
        [
          '-createdAt',
          'createdAt',
          'ratioDeviationPct',
          '-ratioDeviationPct',
          'absDeviation',
          '-absDeviation',
        ] as BatchSort[]
      ).map((sort): [string, Partial<BatchSearch>] => [`sort ${sort}`, { sort }]),
      ['one week (from, to)', { from: '2026-03-02T00:00:00Z', to: '2026-03-09T00:00:00Z' }],
      ['materialId', { materialId: 'seed-mat-epoxy-lam' }],
      ['benchId', { benchId: 'seed-bench-2' }],
      ['operatorId', { operatorId: 'seed-op-06' }],
      ['verdict NO-GO', { verdict: 'NO-GO' }],
      ['state abandoned', { state: 'abandoned' }],
      ['disposition none', { disposition: 'none' }],
      ['disposition hold', { disposition: 'hold' }],
      ['lot (any case)', { lot: 'ure-a2410' }],
      ['NO-GO, worst first', { verdict: 'NO-GO', sort: '-absDeviation' }],
      [
        'bench + NO-GO + one month',
        {
          benchId: 'seed-bench-1',
          verdict: 'NO-GO',
          from: '2026-10-01T00:00:00Z',
          to: '2026-11-01T00:00:00Z',
        },
      ],
    ];
    console.log(
      '\n| list (50 a page) | p50 ms | p95 ms | CPU p50 ms |\n| --- | ---: | ---: | ---: |',
    );
    for (const [name, q] of rows) {
      const t = await time(() => repo.search({ ...base, ...q }));
      console.log(
        `| ${name} | ${t.p50.toFixed(1)} | ${t.p95.toFixed(1)} | ${t.cpu50.toFixed(1)} |`,
      );
    }
    // A page far down a cursor walk costs what the first does (keyset, no OFFSET).
    const deep = await repo.search({ ...base, limit: Math.min(count - 1, 50_000) });
    const last = deep.at(-1)!;
    const t = await time(() => repo.search({ ...base, after: { key: last.key, id: last.row.id } }));
    console.log(
      `| page after ${deep.length} rows | ${t.p50.toFixed(1)} | ${t.p95.toFixed(1)} | ${t.cpu50.toFixed(1)} |`,
    );

    // The whole history, and the last twelve weeks (whole UTC days: the roll-up's path).
    const ranges = [
      ['whole history', {}],
      ['12 weeks', { from: '2026-09-08T00:00:00Z', to: '2026-12-01T00:00:00Z' }],
    ] as const;
    console.log(
      '\n| accuracy per | bucket | range | rows | roll-up p50 ms | roll-up p95 ms | CPU p50 ms |',
    );
    console.log('| --- | --- | --- | ---: | ---: | ---: | ---: |');
    for (const groupBy of ['material', 'bench', 'operator'] as const) {
      for (const bucket of ['week', 'day'] as const) {
        for (const [name, range] of ranges) {
          const q = { groupBy, bucket, ...range };
          const rows = (await repo.accuracyFromRollUp(q)).length;
          const a = await time(() => repo.accuracyFromRollUp(q));
          console.log(
            `| ${groupBy} | ${bucket} | ${name} | ${rows} | ${a.p50.toFixed(0)} | ${a.p95.toFixed(0)} | ${a.cpu50.toFixed(0)} |`,
          );
        }
      }
    }
    console.log(
      '\n| accuracy from the batches (exact p95) | range | ms (one run) |\n| --- | --- | ---: |',
    );
    for (const [name, range] of ranges) {
      const t0 = performance.now();
      await repo.accuracyFromBatches({ groupBy: 'material', bucket: 'week', ...range });
      console.log(`| material, week | ${name} | ${(performance.now() - t0).toFixed(0)} |`);
    }

    const desk = new BatchDeskService(
      repo,
      {} as BatchesService,
      {} as SignInService,
      new AuditRepository(database),
      systemClock,
    );
    let bytes = 0;
    // PGlite runs in this process: its memory (the seeded database) is in the RSS already.
    const rssBefore = process.memoryUsage().rss;
    let peakRss = rssBefore;
    // The JavaScript heap apart from memory outside it (PGlite's WebAssembly memory is there).
    const before = process.memoryUsage();
    let peakHeap = before.heapUsed;
    let peakExternal = before.external;
    const gc = (globalThis as { gc?: () => void }).gc;
    gc?.();
    const liveBefore = process.memoryUsage().heapUsed;
    let peakLive = liveBefore;
    let rowsSeen = 0;
    let lastGc = 0;
    const exportStart = performance.now();
    await pipeline(
      desk.exportCsv({ sort: '-createdAt' }),
      new Writable({
        write(chunk: Buffer, _enc, done) {
          bytes += chunk.length;
          rowsSeen += (chunk.toString('utf8').match(/\r\n/g) ?? []).length;
          // With --expose-gc: what the heap holds live every 10,000 rows, garbage collected.
          if (gc && rowsSeen - lastGc >= 10_000) {
            lastGc = rowsSeen;
            gc();
            peakLive = Math.max(peakLive, process.memoryUsage().heapUsed);
          }
          const m = process.memoryUsage();
          peakRss = Math.max(peakRss, m.rss);
          peakHeap = Math.max(peakHeap, m.heapUsed);
          peakExternal = Math.max(peakExternal, m.external);
          done();
        },
      }),
    );
    const s = (performance.now() - exportStart) / 1000;
    if (gc) {
      console.log(
        `live JS heap (after a full GC every 10,000 rows): ${mib(liveBefore)} MiB before, ` +
          `peak ${mib(peakLive)} MiB`,
      );
    }
    console.log(
      `\nCSV export of ${count} batches: ${s.toFixed(1)} s, ${Math.round(count / s)} rows/s, ` +
        `${(bytes / 1e6).toFixed(1)} MB, RSS ${(rssBefore / 2 ** 20).toFixed(0)} MiB before, ` +
        `peak ${(peakRss / 2 ** 20).toFixed(0)} MiB; JS heap ${mib(before.heapUsed)} → peak ` +
        `${mib(peakHeap)} MiB, external ${mib(before.external)} → peak ${mib(peakExternal)} MiB`,
    );
  } finally {
    await database.close();
    await rm(dir, { recursive: true, force: true });
  }
}

await main();
