import { cp, copyFile, mkdir, mkdtemp, readdir, readFile, rm, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { PGlite } from '@electric-sql/pglite';
import * as tar from 'tar';
import { NotApplicable } from '../common/domain-errors.js';
import type { Database } from '../database/database.js';
import { DOCUMENTS_FOLDER } from '../documents/document-files.js';

/** Said when a backup is asked of a hub on a server PostgreSQL, which has its own tools. */
export const SERVER_BACKUP_REFUSAL =
  'This hub keeps its data in a PostgreSQL server (DATABASE_URL), not in its data folder: ' +
  'back that server up with pg_dump (docs/multi-site.md, Backups)';

/** The data folder's own secrets: without them restored badges and sessions would not check. */
const SECRET_FILES = ['jwt-secret', 'badge-key'] as const;
const DATABASE_ENTRY = 'database.tar.gz';
/** The data sheets' PDFs, kept beside the database rows that name them. */
const DOCUMENTS_ENTRY = DOCUMENTS_FOLDER;

/** A restore was asked into a data folder that already holds something. */
export class RestoreTargetNotEmptyError extends Error {
  constructor(readonly dir: string) {
    super(
      `The data folder ${dir} is not empty: restore only into a new or empty folder, so nothing ` +
        'is overwritten (move the old folder aside first).',
    );
    this.name = 'RestoreTargetNotEmptyError';
  }
}

async function inTempFolder<T>(run: (dir: string) => Promise<T>): Promise<T> {
  const dir = await mkdtemp(join(tmpdir(), 'tareline-backup-'));
  try {
    return await run(dir);
  } finally {
    await rm(dir, { recursive: true, force: true });
  }
}

/**
 * A backup of a hub's data as a gzipped tarball: the embedded PostgreSQL's own dump (taken
 * between two statements of its single connection, so consistent), the folder's secrets and
 * the data sheets' PDFs.
 */
export function backupOf(database: Database): Promise<Buffer> {
  return inTempFolder(async (work) => {
    const dump = await database.dump();
    if (!dump) throw new NotApplicable(SERVER_BACKUP_REFUSAL);
    await writeFile(join(work, DATABASE_ENTRY), Buffer.from(await dump.arrayBuffer()), {
      mode: 0o600,
    });
    const entries: string[] = [DATABASE_ENTRY];
    for (const name of SECRET_FILES) {
      const copied = await copyFile(join(database.dir, name), join(work, name)).then(
        () => true,
        () => false, // a secret set in the environment has no file
      );
      if (copied) entries.push(name);
    }
    const documents = await cp(join(database.dir, DOCUMENTS_ENTRY), join(work, DOCUMENTS_ENTRY), {
      recursive: true,
    }).then(
      () => true,
      () => false, // no sheet uploaded yet
    );
    if (documents) entries.push(DOCUMENTS_ENTRY);
    const out = join(work, 'backup.tar.gz');
    await tar.c({ gzip: true, file: out, cwd: work, portable: true }, entries);
    return readFile(out);
  });
}

/** Brings a backup back into an empty data folder; the hub started on it migrates as usual. */
export async function restoreBackup(dir: string, backup: Buffer): Promise<void> {
  const present = await readdir(dir).catch(() => []);
  if (present.length > 0) throw new RestoreTargetNotEmptyError(dir);
  await inTempFolder(async (work) => {
    const file = join(work, 'backup.tar.gz');
    await writeFile(file, backup);
    await tar.x({ file, cwd: work, strict: true });
    const dump = await readFile(join(work, DATABASE_ENTRY));
    await mkdir(dir, { recursive: true, mode: 0o700 });
    const client = new PGlite(join(dir, 'pg'), { loadDataDir: new Blob([dump]) });
    await client.waitReady;
    await client.close();
    for (const name of SECRET_FILES) {
      await copyFile(join(work, name), join(dir, name)).catch(() => undefined);
    }
    await cp(join(work, DOCUMENTS_ENTRY), join(dir, DOCUMENTS_ENTRY), { recursive: true }).catch(
      () => undefined, // a backup from before sheets were kept, or with none
    );
  });
}
