import { spawn } from 'node:child_process';
import { chmod, mkdir, readdir, stat, writeFile } from 'node:fs/promises';
import { join } from 'node:path';
import { sql } from 'drizzle-orm';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { DataDirInUseError } from '../src/database/data-dir.js';
import { Database } from '../src/database/database.js';
import { copyMigratedTemplate, tempDataDir } from './support/test-app.js';

const migrations = join(import.meta.dirname, '..', '..', 'drizzle');

/** Every folder and file below `dir` (and `dir` itself) whose mode is not 0700 or 0600. */
async function notPrivate(dir: string): Promise<string[]> {
  const loose: string[] = [];
  const check = async (path: string) => {
    const info = await stat(path);
    const wanted = info.isDirectory() ? 0o700 : 0o600;
    if ((info.mode & 0o777) !== wanted) loose.push(`${path} ${(info.mode & 0o777).toString(8)}`);
  };
  await check(dir);
  for (const entry of await readdir(dir, { recursive: true, withFileTypes: true })) {
    if (entry.isDirectory() || entry.isFile()) await check(join(entry.parentPath, entry.name));
  }
  return loose;
}

describe('data folder permissions, with a permissive umask', { timeout: 60_000 }, () => {
  let previousUmask: number;
  let data: Awaited<ReturnType<typeof tempDataDir>>;

  beforeEach(async () => {
    previousUmask = process.umask(0);
    data = await tempDataDir();
  });

  afterEach(async () => {
    process.umask(previousUmask);
    await data.remove();
  });

  it('makes a new folder and every file in it private to the hub user', async () => {
    const dir = join(data.dir, 'new');
    const database = await Database.open(dir, migrations);
    try {
      expect(await notPrivate(dir)).toEqual([]);
      // New tables are new files.
      await database.db.execute(sql`create table scratch (note text)`);
      await database.db.execute(sql`insert into scratch select 'x' from generate_series(1, 500)`);
    } finally {
      await database.close();
    }
    expect(await notPrivate(dir)).toEqual([]);
  });

  it('closes up a folder whose files were left open to everyone', async () => {
    const dir = join(data.dir, 'copied');
    await copyMigratedTemplate(dir);
    // What an earlier hub (or a careless copy) left: everything readable and writable by all.
    for (const entry of await readdir(dir, { recursive: true, withFileTypes: true })) {
      await chmod(join(entry.parentPath, entry.name), entry.isDirectory() ? 0o777 : 0o666);
    }
    await chmod(dir, 0o777);
    await mkdir(join(dir, 'notes'), { mode: 0o777 });
    await writeFile(join(dir, 'notes', 'readme.txt'), 'left here', { mode: 0o666 });

    const database = await Database.open(dir, migrations);
    try {
      expect(await notPrivate(dir)).toEqual([]);
    } finally {
      await database.close();
    }
  });
});

describe('data folder lock', { timeout: 60_000 }, () => {
  it('opens at once after the hub holding the folder was killed', async () => {
    const data = await tempDataDir();
    await copyMigratedTemplate(data.dir);
    const holder = spawn(
      process.execPath,
      ['--import', 'tsx', join(import.meta.dirname, 'support', 'hold-data-dir.ts'), data.dir],
      { cwd: import.meta.dirname, stdio: ['ignore', 'pipe', 'inherit'] },
    );
    const exited = new Promise((resolve) => holder.once('exit', resolve));
    try {
      await new Promise<void>((resolve, reject) => {
        holder.stdout.on('data', (chunk: Buffer) => {
          if (chunk.toString().includes('locked')) resolve();
        });
        holder.once('exit', (code) => reject(new Error(`holder exited early (${code})`)));
      });
      // While it runs, the folder is its.
      await expect(Database.open(data.dir, migrations)).rejects.toThrow(DataDirInUseError);

      holder.kill('SIGKILL');
      await exited;
      const database = await Database.open(data.dir, migrations);
      await database.close();
    } finally {
      holder.kill('SIGKILL');
      await data.remove();
    }
  });
});
