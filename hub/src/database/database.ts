import { join } from 'node:path';
import { PGlite } from '@electric-sql/pglite';
import { sql } from 'drizzle-orm';
import { drizzle, type PgliteDatabase } from 'drizzle-orm/pglite';
import { migrate } from 'drizzle-orm/pglite/migrator';
import { createFilesPrivately, lockDataDir, makePrivate } from './data-dir.js';
import * as schema from './schema/index.js';

export type Db = PgliteDatabase<typeof schema>;
/** The database or a transaction on it: what a repository method that may join a transaction takes. */
export type DbOrTx = Db | Parameters<Parameters<Db['transaction']>[0]>[0];

/**
 * The embedded PostgreSQL (PGlite) in a data folder on disk, reached only through Drizzle.
 * Opening takes an exclusive lock on the folder and applies pending migrations. The folder and
 * its files are the hub user's alone (0700 and 0600).
 */
export class Database {
  private constructor(
    readonly db: Db,
    private readonly client: PGlite,
    private readonly releaseLock: () => Promise<void>,
    readonly dir: string,
  ) {}

  static async open(dir: string, migrationsFolder: string): Promise<Database> {
    createFilesPrivately();
    // Also creates the folder: PGlite does not create parent folders.
    await makePrivate(dir);
    const releaseLock = await lockDataDir(dir, (err) => {
      // Another process took the folder from under us: stop before writing anything more.
      process.emitWarning(`Lost the lock on ${dir}: ${err.message}`);
    });
    let client: PGlite | undefined;
    try {
      client = new PGlite(join(dir, 'pg'));
      await client.waitReady;
      const db = drizzle({ client, schema });
      await migrate(db, { migrationsFolder });
      // A new folder's first files come from PGlite with mode 0666.
      await makePrivate(dir);
      return new Database(db, client, releaseLock, dir);
    } catch (err) {
      await client?.close().catch(() => undefined);
      await releaseLock();
      throw err;
    }
  }

  /**
   * A consistent copy of the whole database as a gzipped tarball of its data folder (PGlite's
   * own dump): taken between two statements of the single connection, so no write is half in.
   */
  async dump(): Promise<Blob> {
    return this.client.dumpDataDir('gzip');
  }

  /** Bulk load: rows as CSV text into `table`'s `columns`, one COPY (the batch seed script). */
  async copyCsv(table: string, columns: readonly string[], csv: string): Promise<void> {
    const list = columns.map((c) => `"${c}"`).join(', ');
    await this.client.query(`copy "${table}" (${list}) from '/dev/blob' with (format csv)`, [], {
      blob: new Blob([csv]),
    });
  }

  /** True when the database answers a trivial query. */
  async ping(): Promise<void> {
    await this.db.execute(sql`select 1`);
  }

  async close(): Promise<void> {
    try {
      if (!this.client.closed) await this.client.close();
      // PGlite rewrites some files (relation caches) with mode 0644 while it runs.
      await makePrivate(this.dir);
    } finally {
      await this.releaseLock().catch(() => undefined);
    }
  }
}
