/**
 * `npm run restore -- FILE`: brings a backup made by `npm run backup` back into an empty data
 * folder (TARELINE_DATA_DIR, default ./data). Refuses a folder that holds anything.
 */
import { readFile } from 'node:fs/promises';
import { resolve } from 'node:path';
import { restoreBackup } from '../src/backup/backup.js';

const repoRoot = resolve(import.meta.dirname, '..', '..');

async function main(): Promise<void> {
  const [file] = process.argv.slice(2);
  if (!file) {
    console.error('Usage: npm run restore -- FILE');
    process.exit(2);
  }
  const dir = resolve(process.env.TARELINE_DATA_DIR ?? resolve(repoRoot, 'data'));
  await restoreBackup(dir, await readFile(file));
  console.log(`Restored ${file} into ${dir}: start the hub with TARELINE_DATA_DIR=${dir}`);
}

main().catch((err: unknown) => {
  console.error(err instanceof Error ? err.message : String(err));
  process.exit(1);
});
