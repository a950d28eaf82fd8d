/**
 * Takes a data folder's lock in a process of its own and keeps it until killed:
 * `node --import tsx hold-data-dir.ts <dir>` prints "locked" once it holds it.
 */
import { lockDataDir } from '../../src/database/data-dir.js';

const dir = process.argv[2];
if (!dir) throw new Error('Name the data folder');
await lockDataDir(dir, () => undefined);
process.stdout.write('locked\n');
setInterval(() => undefined, 60_000);
