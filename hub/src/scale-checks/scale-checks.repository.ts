import { Inject, Injectable } from '@nestjs/common';
import { and, desc, eq, inArray, min } from 'drizzle-orm';
import { Database, type DbOrTx } from '../database/database.js';
import { benches, materials, scaleChecks } from '../database/schema/index.js';

export type ScaleCheckRow = typeof scaleChecks.$inferSelect;
export type NewScaleCheckRow = typeof scaleChecks.$inferInsert;
export type BenchCheckPolicy = Pick<
  typeof benches.$inferSelect,
  | 'id'
  | 'checkEveryHours'
  | 'blockWhenDue'
  | 'checkToleranceG'
  | 'calibrationDueOn'
  | 'repeatabilitySdG'
  | 'repeatabilityAt'
>;
export type BenchPolicyUpdate = Partial<
  Pick<
    typeof benches.$inferInsert,
    'checkEveryHours' | 'blockWhenDue' | 'checkToleranceG' | 'calibrationDueOn'
  >
>;

/** The only place that talks SQL about scale checks and the benches' check policy. */
@Injectable()
export class ScaleChecksRepository {
  constructor(@Inject(Database) private readonly database: Database) {}

  private get db() {
    return this.database.db;
  }

  async insert(row: NewScaleCheckRow): Promise<ScaleCheckRow> {
    const [inserted] = await this.db.insert(scaleChecks).values(row).returning();
    return inserted!;
  }

  async update(id: number, changes: Partial<NewScaleCheckRow>): Promise<ScaleCheckRow> {
    const [row] = await this.db
      .update(scaleChecks)
      .set(changes)
      .where(eq(scaleChecks.id, id))
      .returning();
    return row!;
  }

  async find(benchId: string, id: number): Promise<ScaleCheckRow | undefined> {
    const [row] = await this.db
      .select()
      .from(scaleChecks)
      .where(and(eq(scaleChecks.benchId, benchId), eq(scaleChecks.id, id)));
    return row;
  }

  /** The bench's checks, newest first. */
  list(benchId: string, limit: number): Promise<ScaleCheckRow[]> {
    return this.db
      .select()
      .from(scaleChecks)
      .where(eq(scaleChecks.benchId, benchId))
      .orderBy(desc(scaleChecks.id))
      .limit(limit);
  }

  /** The latest finished (passed or failed) check of a kind at the bench. */
  async latestFinished(
    benchId: string,
    kind: ScaleCheckRow['kind'],
    states: ScaleCheckRow['state'][] = ['passed', 'failed'],
  ): Promise<ScaleCheckRow | undefined> {
    const [row] = await this.db
      .select()
      .from(scaleChecks)
      .where(
        and(
          eq(scaleChecks.benchId, benchId),
          eq(scaleChecks.kind, kind),
          inArray(scaleChecks.state, states),
        ),
      )
      .orderBy(desc(scaleChecks.id))
      .limit(1);
    return row;
  }

  /** Checks left waiting by a hub that stopped: they can no longer finish. */
  async interruptWaiting(note: string, at: Date): Promise<number> {
    const rows = await this.db
      .update(scaleChecks)
      .set({ state: 'interrupted', note, finishedAt: at })
      .where(eq(scaleChecks.state, 'waiting'))
      .returning({ id: scaleChecks.id });
    return rows.length;
  }

  async policy(benchId: string): Promise<BenchCheckPolicy | undefined> {
    const [row] = await this.db
      .select({
        id: benches.id,
        checkEveryHours: benches.checkEveryHours,
        blockWhenDue: benches.blockWhenDue,
        checkToleranceG: benches.checkToleranceG,
        calibrationDueOn: benches.calibrationDueOn,
        repeatabilitySdG: benches.repeatabilitySdG,
        repeatabilityAt: benches.repeatabilityAt,
      })
      .from(benches)
      .where(eq(benches.id, benchId));
    return row;
  }

  /** In the caller's transaction when given one (the audit trail appends in the same). */
  async updatePolicy(
    benchId: string,
    changes: BenchPolicyUpdate,
    db: DbOrTx = this.db,
  ): Promise<void> {
    await db.update(benches).set(changes).where(eq(benches.id, benchId));
  }

  /** A finished repeatability test and the bench's new s, together. */
  async finishRepeatability(
    id: number,
    changes: Partial<NewScaleCheckRow>,
    bench: { benchId: string; sdG: number; at: Date },
  ): Promise<ScaleCheckRow> {
    return this.db.transaction(async (tx) => {
      const [row] = await tx
        .update(scaleChecks)
        .set(changes)
        .where(eq(scaleChecks.id, id))
        .returning();
      await tx
        .update(benches)
        .set({ repeatabilitySdG: bench.sdG, repeatabilityAt: bench.at })
        .where(eq(benches.id, bench.benchId));
      return row!;
    });
  }

  /** The tightest tolerance of the materials in use, %, or null when there are none. */
  async tightestTolerancePct(): Promise<number | null> {
    const [row] = await this.db
      .select({ pct: min(materials.tolerancePct) })
      .from(materials)
      .where(eq(materials.active, true));
    return row?.pct ?? null;
  }
}
