import { Inject, Injectable } from '@nestjs/common';
import { and, asc, eq, isNull, ne, or } from 'drizzle-orm';
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

  /**
   * Makes `hubId` the hub that reads the scales of the benches no hub reads yet (`all`: of every
   * bench, for a hub alone on its database); answers the benches it took.
   */
  async claim(hubId: string, all: boolean): Promise<string[]> {
    const rows = await this.db
      .update(benches)
      .set({ hubId })
      .where(all ? or(isNull(benches.hubId), ne(benches.hubId, hubId)) : isNull(benches.hubId))
      .returning({ id: benches.id });
    return rows.map((r) => r.id);
  }

  /** The active benches whose scales `hubId` reads. */
  listOwned(hubId: string): Promise<BenchRow[]> {
    return this.db
      .select()
      .from(benches)
      .where(and(eq(benches.active, true), eq(benches.hubId, hubId)))
      .orderBy(asc(benches.id));
  }
}
