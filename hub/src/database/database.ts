import { mkdir } from 'node:fs/promises';
import { join } from 'node:path';
import { PGlite } from '@electric-sql/pglite';
import { sql } from 'drizzle-orm';
import { drizzle, type PgliteDatabase } from 'drizzle-orm/pglite';
import { migrate } from 'drizzle-orm/pglite/migrator';
import lockfile from 'proper-lockfile';
import * as schema from './schema/index.js';

export type Db = PgliteDatabase<typeof schema>;

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

/**
 * The embedded PostgreSQL (PGlite) in a data folder on disk, reached only through Drizzle.
 * Opening takes an exclusive lock on the folder and applies pending migrations.
 */
export class Database {
  private constructor(
    readonly db: Db,
    private readonly client: PGlite,
    private readonly releaseLock: () => Promise<void>,
    readonly dir: string,
  ) {}

  static async open(dir: string, migrationsFolder: string): Promise<Database> {
    // PGlite does not create parent folders.
    await mkdir(dir, { recursive: true });
    let releaseLock: () => Promise<void>;
    try {
      releaseLock = await lockfile.lock(dir, {
        lockfilePath: join(dir, 'hub.lock'),
        // A hub that died leaves its lock; after this long without a refresh it counts as gone.
        stale: 10_000,
        update: 2_000,
        retries: 0,
        realpath: false,
        onCompromised: (err) => {
          // Another process took the folder from under us: stop before writing anything more.
          process.emitWarning(`Lost the lock on ${dir}: ${err.message}`);
        },
      });
    } catch (err) {
      if ((err as NodeJS.ErrnoException).code === 'ELOCKED') throw new DataDirInUseError(dir);
      throw err;
    }
    let client: PGlite | undefined;
    try {
      client = new PGlite(join(dir, 'pg'));
      await client.waitReady;
      const db = drizzle({ client, schema });
      await migrate(db, { migrationsFolder });
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

  /** True when the database answers a trivial query. */
  async ping(): Promise<void> {
    await this.db.execute(sql`select 1`);
  }

  async close(): Promise<void> {
    try {
      if (!this.client.closed) await this.client.close();
    } finally {
      await this.releaseLock().catch(() => undefined);
    }
  }
}
