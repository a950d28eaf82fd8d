/**
 * `npm run seed:batches -- --count N --data-dir DIR [--seed S] [--every MIN]`: fills a data
 * folder (created and migrated if new) with N invented batches, one every MIN minutes (default
 * 5) up to now, across a few invented benches, materials and operators, with some NO-GO,
 * abandoned and decided batches. The folder then opens with `TARELINE_DATA_DIR=DIR node
 * hub/dist/main.js`; on its first start the hub adds the demo shop (people to sign in with)
 * as on any empty folder. Run it with no hub on the folder: it takes the folder's lock.
 */
import { resolve } from 'node:path';
import { parseArgs } from 'node:util';
import { Database } from '../src/database/database.js';
import { seedBatches } from './batch-seed.js';

const repoRoot = resolve(import.meta.dirname, '..', '..');

function usage(problem: string): never {
  console.error(
    `${problem}\nUsage: npm run seed:batches -- --count N --data-dir DIR [--seed S] [--every MIN]`,
  );
  process.exit(2);
}

const { values } = parseArgs({
  options: {
    count: { type: 'string' },
    'data-dir': { type: 'string' },
    seed: { type: 'string' },
    every: { type: 'string' },
  },
});
const count = Number(values.count);
if (!Number.isSafeInteger(count) || count < 1) usage('--count must be a whole number above 0');
if (!values['data-dir']) usage('--data-dir is required');
const seed = values.seed === undefined ? undefined : Number(values.seed);
if (seed !== undefined && !Number.isSafeInteger(seed)) usage('--seed must be a whole number');
const spacingMin = values.every === undefined ? 5 : Number(values.every);
if (!(spacingMin > 0)) usage('--every must be a number of minutes above 0');

const dir = resolve(values['data-dir']);
const started = performance.now();
const database = await Database.open(dir, resolve(repoRoot, 'drizzle'));
try {
  let shown = 0;
  const result = await seedBatches(database, {
    count,
    spacingMin,
    ...(seed !== undefined ? { seed } : {}),
    onProgress: (written) => {
      if (written - shown >= 50_000 || written === count) {
        shown = written;
        console.log(`${written} of ${count} batches written`);
      }
    },
  });
  const s = ((performance.now() - started) / 1000).toFixed(1);
  console.log(
    `Seeded batches ${result.firstId}–${result.lastId} into ${dir} in ${s} s: ` +
      `${result.saved} saved (${result.noGo} NO-GO), ${result.abandoned} abandoned, ` +
      `${result.dispositions} decisions.`,
  );
} finally {
  await database.close();
}
