import { Inject, Injectable } from '@nestjs/common';
import { asc, eq } from 'drizzle-orm';
import { Database, type DbOrTx } from '../database/database.js';
import { benches } from '../database/schema/index.js';

export type BenchRow = typeof benches.$inferSelect;
export type NewBenchRow = typeof benches.$inferInsert;

/** The only place that talks SQL about benches. */
@Injectable()
export class BenchesRepository {
  constructor(@Inject(Database) private readonly database: Database) {}

  private get db() {
    return this.database.db;
  }

  /** Adds a bench unless one with its id exists; answers the new row, undefined if it existed. */
  async insertIfMissing(bench: NewBenchRow, db: DbOrTx = this.db): Promise<BenchRow | undefined> {
    const [row] = await db.insert(benches).values(bench).onConflictDoNothing().returning();
    return row;
  }

  async findById(id: string): Promise<BenchRow | undefined> {
    const [row] = await this.db.select().from(benches).where(eq(benches.id, id));
    return row;
  }

  listActive(): Promise<BenchRow[]> {
    return this.db.select().from(benches).where(eq(benches.active, true)).orderBy(asc(benches.id));
  }
}
