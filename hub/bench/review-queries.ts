/**
 * How the lead's desk queries hold up on many batches. Opens a fresh data folder (migrated),
 * writes N invented batches in 1,000-row inserts, then times through the repository (no HTTP):
 * the first page of the list with each sort and each filter, a page deep in a cursor walk, the
 * CSV export of everything (rows a second, peak RSS) and the accuracy query per group.
 *
 *   npx tsx --conditions=@tareline/source hub/bench/review-queries.ts [N]
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
import { BatchDeskService } from '../src/batches/batch-desk.service.js';
import { BatchesRepository, type BatchSearch } from '../src/batches/batches.repository.js';
import type { BatchesService } from '../src/batches/batches.service.js';
import type { SignInService } from '../src/auth/sign-in.service.js';
import { systemClock } from '../src/common/clock.js';
import { Database } from '../src/database/database.js';
import { batches, benches, materials } from '../src/database/schema/index.js';

const repoRoot = resolve(import.meta.dirname, '..', '..');
const count = Number(process.argv[2] ?? 100_000);
const RUNS = 15;

/** A small deterministic generator, so every run seeds the same batches. */
function random(seed: number) {
  let s = seed >>> 0;
  return () => {
    s = (Math.imul(s, 1_664_525) + 1_013_904_223) >>> 0;
    return s / 2 ** 32;
  };
}

async function seed(database: Database): Promise<void> {
  const db = database.db;
  await db
    .insert(benches)
    .values(
      ['bench-1', 'bench-2', 'bench-3', 'bench-4'].map((id, i) => ({ id, name: `Bench ${i + 1}` })),
    );
  const materialIds = ['m-1', 'm-2', 'm-3', 'm-4', 'm-5'];
  await db.insert(materials).values(
    materialIds.map((id) => ({
      id,
      name: `Material ${id}`,
      ratioBasis: 'weight' as const,
      ratioParts: [100, 14],
      tolerancePct: 1,
    })),
  );
  const next = random(42);
  const start = Date.parse('2025-01-01T06:00:00Z');
  for (let first = 0; first < count; first += 1000) {
    const rows = [];
    for (let i = first; i < Math.min(count, first + 1000); i += 1) {
      const r = next();
      const state = r < 0.04 ? 'abandoned' : 'saved';
      // Roughly normal deviations (sum of uniforms), sd about 0.5 %.
      const dev = state === 'saved' ? (next() + next() + next() - 1.5) * 1.0 : null;
      const createdAt = new Date(start + i * 5 * 60_000);
      rows.push({
        id: i + 1,
        benchId: `bench-${1 + Math.floor(next() * 4)}`,
        operatorId: `p-${Math.floor(next() * 20)}`,
        operatorName: 'Invented operator',
        materialId: materialIds[Math.floor(next() * 5)]!,
        materialName: 'Invented material',
        state: state as 'saved' | 'abandoned',
        verdict: dev === null ? null : Math.abs(dev) > 1 ? ('NO-GO' as const) : ('GO' as const),
        totalMassG: 114,
        weightRatio: [100, 14],
        tolerancePct: 1,
        readabilityG: 0.01,
        ratioDeviationPct: dev,
        detail: {
          parts: [
            { label: 'Part A', targetG: 100, actualG: 100 },
            { label: 'Part B', targetG: 14, actualG: 14 * (1 + (dev ?? 0) / 100) },
          ],
          active: null,
          topUpQueue: [],
          rescue: null,
          steps: { created: createdAt.toISOString() },
          lots: [
            { part: 0, code: `A-${i % 997}`, lotId: null, warnings: [] },
            { part: 1, code: `B-${i % 991}`, lotId: null, warnings: [] },
          ],
          potLifeMin: null,
          potLifeMassG: null,
        },
        createdAt,
        savedAt: state === 'saved' ? createdAt : null,
      });
    }
    await db.insert(batches).values(rows);
  }
}

async function time(run: () => Promise<unknown>): Promise<{ p50: number; p95: number }> {
  await run();
  const ms: number[] = [];
  for (let i = 0; i < RUNS; i += 1) {
    const t = performance.now();
    await run();
    ms.push(performance.now() - t);
  }
  ms.sort((a, b) => a - b);
  const at = (q: number) => ms[Math.min(ms.length - 1, Math.ceil(q * ms.length) - 1)]!;
  return { p50: at(0.5), p95: at(0.95) };
}

async function main(): Promise<void> {
  const dir = await mkdtemp(join(tmpdir(), 'tareline-review-bench-'));
  const database = await Database.open(dir, resolve(repoRoot, 'drizzle'));
  try {
    const seeding = performance.now();
    await seed(database);
    console.log(
      `seeded ${count} batches in ${((performance.now() - seeding) / 1000).toFixed(1)} s`,
    );
    const repo = new BatchesRepository(database);
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
      ['one week (from, to)', { from: '2025-03-01T00:00:00Z', to: '2025-03-08T00:00:00Z' }],
      ['materialId', { materialId: 'm-3' }],
      ['benchId', { benchId: 'bench-2' }],
      ['operatorId', { operatorId: 'p-7' }],
      ['verdict NO-GO', { verdict: 'NO-GO' }],
      ['state abandoned', { state: 'abandoned' }],
      ['disposition none', { disposition: 'none' }],
      ['lot', { lot: 'A-123' }],
      ['NO-GO, worst first', { verdict: 'NO-GO', sort: '-absDeviation' }],
    ];
    console.log('\n| list (50 a page) | p50 ms | p95 ms |\n| --- | ---: | ---: |');
    for (const [name, q] of rows) {
      const t = await time(() => repo.search({ ...base, ...q }));
      console.log(`| ${name} | ${t.p50.toFixed(1)} | ${t.p95.toFixed(1)} |`);
    }
    // A page far down a cursor walk costs what the first does (keyset, no OFFSET).
    const deep = await repo.search({ ...base, limit: Math.min(count - 1, 50_000) });
    const last = deep.at(-1)!;
    const t = await time(() => repo.search({ ...base, after: { key: last.key, id: last.row.id } }));
    console.log(`| page after ${deep.length} rows | ${t.p50.toFixed(1)} | ${t.p95.toFixed(1)} |`);

    console.log('\n| accuracy per | bucket | ms (p50 of runs) |\n| --- | --- | ---: |');
    for (const groupBy of ['material', 'bench', 'operator'] as const) {
      for (const bucket of ['week', 'day'] as const) {
        const a = await time(() => repo.accuracy({ groupBy, bucket }));
        console.log(`| ${groupBy} | ${bucket} | ${a.p50.toFixed(0)} |`);
      }
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
    const exportStart = performance.now();
    await pipeline(
      desk.exportCsv({ sort: '-createdAt' }),
      new Writable({
        write(chunk: Buffer, _enc, done) {
          bytes += chunk.length;
          peakRss = Math.max(peakRss, process.memoryUsage().rss);
          done();
        },
      }),
    );
    const s = (performance.now() - exportStart) / 1000;
    console.log(
      `\nCSV export of ${count} batches: ${s.toFixed(1)} s, ${Math.round(count / s)} rows/s, ` +
        `${(bytes / 1e6).toFixed(1)} MB, RSS ${(rssBefore / 2 ** 20).toFixed(0)} MiB before, ` +
        `peak ${(peakRss / 2 ** 20).toFixed(0)} MiB`,
    );
  } finally {
    await database.close();
    await rm(dir, { recursive: true, force: true });
  }
}

await main();
