import { join } from 'node:path';
import { PGlite } from '@electric-sql/pglite';
import { sql, type SQL } from 'drizzle-orm';
import { drizzle as drizzleNodePg } from 'drizzle-orm/node-postgres';
import { migrate as migrateNodePg } from 'drizzle-orm/node-postgres/migrator';
import type { PgDatabase, PgQueryResultHKT } from 'drizzle-orm/pg-core';
import { drizzle as drizzlePglite } from 'drizzle-orm/pglite';
import { migrate as migratePglite } from 'drizzle-orm/pglite/migrator';
import pg from 'pg';
import { createFilesPrivately, lockDataDir, makePrivate } from './data-dir.js';
import * as schema from './schema/index.js';

/**
 * The database as every repository sees it: Drizzle's PostgreSQL base type, the same for the
 * embedded PGlite and a server reached through node-postgres, so one code path serves both.
 */
export type Db = PgDatabase<PgQueryResultHKT, typeof schema>;
/** The database or a transaction on it: what a repository method that may join a transaction takes. */
export type DbOrTx = Db | Parameters<Parameters<Db['transaction']>[0]>[0];

/**
 * Keys of the PostgreSQL advisory locks the hubs sharing a server take (one 64-bit number each,
 * picked for this program). On PGlite, one process alone, they are taken all the same and cost
 * nothing.
 */
export const ADVISORY_LOCKS = {
  /** Migrations and the demo shop's seeding at start: one hub at a time. */
  startup: 0x7461_7265_0001n,
  /** The audit trail's head: the entry read as the last stays the last until this one is in. */
  auditHead: 0x7461_7265_0002n,
  /** Batch numbers: the highest number read stays the highest until the new batch is in. */
  batchNumber: 0x7461_7265_0003n,
  /** The outbox: one hub sends at a time, so no mail goes twice. */
  outbox: 0x7461_7265_0004n,
} as const;

/** Takes a transaction-scoped advisory lock: held until the transaction ends, then let go. */
export function lockForTransaction(tx: DbOrTx, key: bigint): Promise<unknown> {
  return tx.execute(sql`select pg_advisory_xact_lock(${key.toString()}::bigint)`);
}

interface Engine {
  kind: 'pglite' | 'postgres';
  /** Runs `work` while holding a session advisory lock (a server) or the folder lock (PGlite). */
  underLock<T>(key: bigint, work: () => Promise<T>): Promise<T>;
  close(): Promise<void>;
}

/**
 * The hub's PostgreSQL, reached only through Drizzle: the embedded PGlite in a data folder on
 * disk (the default; opening takes an exclusive lock on the folder, whose files are the hub
 * user's alone), or a server PostgreSQL shared by several hubs (`DATABASE_URL`). Opening applies
 * pending migrations, on a server under an advisory lock so hubs starting together do not race.
 */
export class Database {
  private constructor(
    readonly db: Db,
    private readonly engine: Engine,
    /** PGlite's own client, for its dump; undefined on a server. */
    private readonly pglite: PGlite | undefined,
    /** The node-postgres pool of a server; undefined on PGlite. */
    readonly pool: pg.Pool | undefined,
    readonly dir: string,
  ) {}

  /** `embedded` is the PGlite folder; PostgreSQL at `url` instead when one is given. */
  static async open(dir: string, migrationsFolder: string, url?: string): Promise<Database> {
    return url
      ? Database.openServer(url, dir, migrationsFolder)
      : Database.openPglite(dir, migrationsFolder);
  }

  private static async openPglite(dir: string, migrationsFolder: string): Promise<Database> {
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
      const db = drizzlePglite({ client, schema });
      await migratePglite(db, { migrationsFolder });
      // A new folder's first files come from PGlite with mode 0666.
      await makePrivate(dir);
      const opened = client;
      const engine: Engine = {
        kind: 'pglite',
        // The folder lock already keeps every other process out.
        underLock: (_key, work) => work(),
        close: async () => {
          try {
            if (!opened.closed) await opened.close();
            // PGlite rewrites some files (relation caches) with mode 0644 while it runs.
            await makePrivate(dir);
          } finally {
            await releaseLock().catch(() => undefined);
          }
        },
      };
      return new Database(db, engine, client, undefined, dir);
    } catch (err) {
      await client?.close().catch(() => undefined);
      await releaseLock();
      throw err;
    }
  }

  private static async openServer(
    url: string,
    dir: string,
    migrationsFolder: string,
  ): Promise<Database> {
    const pool = new pg.Pool({ connectionString: url, max: 10 });
    // An idle connection the server dropped must not take the hub down with it.
    pool.on('error', () => undefined);
    const engine: Engine = {
      kind: 'postgres',
      underLock: (key, work) => withSessionLock(pool, key, work),
      close: () => pool.end(),
    };
    try {
      const db = drizzleNodePg({ client: pool, schema });
      await engine.underLock(ADVISORY_LOCKS.startup, () => migrateNodePg(db, { migrationsFolder }));
      return new Database(db, engine, undefined, pool, dir);
    } catch (err) {
      await pool.end().catch(() => undefined);
      throw err;
    }
  }

  get driver(): 'pglite' | 'postgres' {
    return this.engine.kind;
  }

  /**
   * Runs `work` while no other hub on the same database runs work under the same key (a session
   * advisory lock on a server; on PGlite the data folder's lock already ensures it).
   */
  underLock<T>(key: bigint, work: () => Promise<T>): Promise<T> {
    return this.engine.underLock(key, work);
  }

  /**
   * A consistent copy of the whole database as a gzipped tarball of its data folder (PGlite's
   * own dump): taken between two statements of the single connection, so no write is half in.
   * A server PostgreSQL is backed up with its own tools (pg_dump): undefined there.
   */
  async dump(): Promise<Blob | undefined> {
    return this.pglite?.dumpDataDir('gzip');
  }

  /**
   * Bulk load: rows as CSV text into `table`'s `columns`, one COPY (the batch seed script). PGlite
   * only: a server is seeded through its own tools (psql's \copy).
   */
  async copyCsv(table: string, columns: readonly string[], csv: string): Promise<void> {
    if (!this.pglite) throw new Error('Bulk loading is for the embedded database only');
    const list = columns.map((c) => `"${c}"`).join(', ');
    await this.pglite.query(`copy "${table}" (${list}) from '/dev/blob' with (format csv)`, [], {
      blob: new Blob([csv]),
    });
  }

  /** True when the database answers a trivial query. */
  async ping(): Promise<void> {
    await this.db.execute(sql`select 1`);
  }

  /** Rows of a query in the one shape both drivers answer with. */
  async rows<T>(query: SQL): Promise<T[]> {
    const result = (await this.db.execute(query)) as unknown as { rows: T[] };
    return result.rows;
  }

  async close(): Promise<void> {
    await this.engine.close();
  }
}

async function withSessionLock<T>(pool: pg.Pool, key: bigint, work: () => Promise<T>): Promise<T> {
  // A session lock lives on one connection: held on its own, while `work` uses the pool.
  const client = await pool.connect();
  try {
    await client.query('select pg_advisory_lock($1::bigint)', [key.toString()]);
    try {
      return await work();
    } finally {
      await client.query('select pg_advisory_unlock($1::bigint)', [key.toString()]);
    }
  } finally {
    client.release();
  }
}
