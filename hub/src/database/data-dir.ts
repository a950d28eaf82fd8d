import * as fs from 'node:fs';
import { chmod, mkdir, readdir, readFile, utimes } from 'node:fs/promises';
import { hostname } from 'node:os';
import { join } from 'node:path';
import { isMainThread } from 'node:worker_threads';
import lockfile from 'proper-lockfile';
import { z } from 'zod';

/** A second hub on the same data folder would corrupt it; this says so instead. */
export class DataDirInUseError extends Error {
  constructor(readonly dir: string) {
    super(
      `The data folder ${dir} is already in use by another Tareline hub. ` +
        'Stop that hub first, or start this one with another TARELINE_DATA_DIR.',
    );
    this.name = 'DataDirInUseError';
  }
}

// ---------------------------------------------------------------------------------------------
// Permissions: the folder holds password and PIN hashes (in the tables and in the write-ahead
// log) and the signing secrets, so nobody but the hub's own user may read or change any of it.

/** New files readable and writable by the hub's user only, whatever umask it was started with. */
export function createFilesPrivately(): void {
  // Worker threads share the process's umask and may not set it; the main thread does.
  if (isMainThread) process.umask(0o077);
}

/**
 * Creates `dir` if needed and makes it and everything in it private: folders 0700, files 0600.
 * PGlite writes its initial files with mode 0666 whatever the umask, and a folder may have been
 * copied with looser modes, so this runs at every open and close.
 */
export async function makePrivate(dir: string): Promise<void> {
  await mkdir(dir, { recursive: true, mode: 0o700 });
  await chmod(dir, 0o700);
  for (const entry of await readdir(dir, { recursive: true, withFileTypes: true })) {
    const path = join(entry.parentPath, entry.name);
    const mode = entry.isDirectory() ? 0o700 : entry.isFile() ? 0o600 : undefined;
    // A file the database removed meanwhile (a recycled log segment) needs nothing.
    if (mode !== undefined) await chmod(path, mode).catch(ignoreMissing);
  }
}

function ignoreMissing(err: NodeJS.ErrnoException): void {
  if (err.code !== 'ENOENT') throw err;
}

// ---------------------------------------------------------------------------------------------
// The lock: `hub.lock` (a folder, proper-lockfile's atomic mkdir), refreshed every 2 s and stale
// after 10 s without a refresh. It also names its holder, so a hub that was killed (kill -9, a
// crash) does not keep the folder shut for those 10 s: a holder that is no longer running on this
// computer leaves a lock that is stale at once.

const LOCK_NAME = 'hub.lock';
const HOLDER_FILE = 'holder.json';
const holderSchema = z.object({ pid: z.number().int().positive(), host: z.string() });

/** Lock folders this process holds, to tell itself from an earlier process with the same pid. */
const heldHere = new Set<string>();

type Callback = (err: NodeJS.ErrnoException | null) => void;

/**
 * The file system as proper-lockfile sees it, with the holder file inside the lock folder: written
 * as part of taking the lock (before the lock's first refresh dates the folder, since adding a
 * file changes a folder's modification time, which the lock checks as its own), and removed with
 * it.
 */
const lockFs = {
  ...fs,
  mkdir: (path: string, callback: Callback) =>
    fs.mkdir(path, (err) => {
      if (err) return callback(err);
      const holder = JSON.stringify({
        pid: process.pid,
        host: hostname(),
      } satisfies z.infer<typeof holderSchema>);
      fs.writeFile(join(path, HOLDER_FILE), holder, { mode: 0o600 }, (writeErr) => {
        if (!writeErr) return callback(null);
        fs.rm(path, { recursive: true, force: true }, () => callback(writeErr));
      });
    }),
  rmdir: (path: string, callback: Callback) =>
    fs.rm(path, { recursive: true, force: true }, callback),
};

/**
 * Takes the data folder's lock, or throws {@link DataDirInUseError} when a running hub holds it.
 * Returns the release.
 */
export async function lockDataDir(
  dir: string,
  onCompromised: (err: Error) => void,
): Promise<() => Promise<void>> {
  const lockPath = join(dir, LOCK_NAME);
  const options: lockfile.LockOptions = {
    lockfilePath: lockPath,
    // A hub that died leaves its lock; after this long without a refresh it counts as gone.
    stale: 10_000,
    update: 2_000,
    retries: 0,
    realpath: false,
    fs: lockFs,
    onCompromised,
  };
  let release: () => Promise<void>;
  try {
    release = await lockfile.lock(dir, options);
  } catch (err) {
    if ((err as NodeJS.ErrnoException).code !== 'ELOCKED') throw err;
    if (!(await holderIsGone(lockPath))) throw new DataDirInUseError(dir);
    // proper-lockfile's own takeover of a stale lock, with the lock dated as long stale.
    await utimes(lockPath, new Date(0), new Date(0)).catch(ignoreMissing);
    try {
      release = await lockfile.lock(dir, options);
    } catch (again) {
      if ((again as NodeJS.ErrnoException).code === 'ELOCKED') throw new DataDirInUseError(dir);
      throw again;
    }
  }
  heldHere.add(lockPath);
  return async () => {
    heldHere.delete(lockPath);
    await release();
  };
}

/**
 * True when the lock names a holder on this computer that is no longer running. A lock without
 * a readable holder (one being taken right now, or left by an older hub) waits for staleness.
 */
async function holderIsGone(lockPath: string): Promise<boolean> {
  let holder: z.infer<typeof holderSchema>;
  try {
    holder = holderSchema.parse(JSON.parse(await readFile(join(lockPath, HOLDER_FILE), 'utf8')));
  } catch {
    return false;
  }
  if (holder.host !== hostname()) return false;
  // Our own pid without our own lock: an earlier process that had this pid (a restarted container).
  if (holder.pid === process.pid) return !heldHere.has(lockPath);
  try {
    process.kill(holder.pid, 0);
    return false;
  } catch (err) {
    // EPERM: it runs, as another user.
    return (err as NodeJS.ErrnoException).code === 'ESRCH';
  }
}
