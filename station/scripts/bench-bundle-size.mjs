// Sums the gzip size of the JavaScript the bench screen loads before it can draw: the entry
// chunk of index.html and every chunk it imports statically, read from Vite's build manifest.
// Chunks behind a dynamic import (the lazily loaded pages) are left out; they load on demand.
// Run `npm run build -w station` first, then `npm run size -w station`.
import { readFile } from 'node:fs/promises';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { gzipSync } from 'node:zlib';

// Kilobytes of 1,000 bytes, as Vite reports them.
const BUDGET_BYTES = 200_000;
const dist = join(dirname(fileURLToPath(import.meta.url)), '..', 'dist');

/** @type {Record<string, { file: string; isEntry?: boolean; imports?: string[]; dynamicImports?: string[] }>} */
const manifest = JSON.parse(await readFile(join(dist, '.vite', 'manifest.json'), 'utf8'));

const entries = Object.keys(manifest).filter((key) => manifest[key].isEntry);
if (entries.length === 0) throw new Error('The build manifest has no entry chunk');

const needed = new Set();
const visit = (key) => {
  if (needed.has(key)) return;
  needed.add(key);
  for (const imported of manifest[key].imports ?? []) visit(imported);
};
entries.forEach(visit);

const lazy = new Set(
  Object.keys(manifest).filter((key) => !needed.has(key) && manifest[key].file.endsWith('.js')),
);

const gzipBytes = async (file) => gzipSync(await readFile(join(dist, file))).length;
const kb = (bytes) => `${(bytes / 1000).toFixed(1)} kB`;

let total = 0;
console.log('Bench route (entry and its static imports):');
for (const key of needed) {
  const { file } = manifest[key];
  const size = await gzipBytes(file);
  total += size;
  console.log(`  ${file.padEnd(48)} ${kb(size).padStart(10)} gzip`);
}
console.log(`  ${'total'.padEnd(48)} ${kb(total).padStart(10)} gzip (budget ${kb(BUDGET_BYTES)})`);

let lazyTotal = 0;
for (const key of lazy) lazyTotal += await gzipBytes(manifest[key].file);
console.log(`Loaded on demand: ${lazy.size} chunks, ${kb(lazyTotal)} gzip`);

if (total > BUDGET_BYTES) {
  console.error(`The bench route needs ${kb(total)} gzip, over the ${kb(BUDGET_BYTES)} budget.`);
  process.exitCode = 1;
}
