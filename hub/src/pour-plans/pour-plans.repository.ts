import { Inject, Injectable } from '@nestjs/common';
import { asc, desc, eq } from 'drizzle-orm';
import { Database } from '../database/database.js';
import { batches, pourPlans } from '../database/schema/index.js';

export type PourPlanRow = typeof pourPlans.$inferSelect;
export type NewPourPlanRow = typeof pourPlans.$inferInsert;

/** The only place that talks SQL about pour plans, and the batches poured from them. */
@Injectable()
export class PourPlansRepository {
  constructor(@Inject(Database) private readonly database: Database) {}

  private get db() {
    return this.database.db;
  }

  list(): Promise<PourPlanRow[]> {
    return this.db.select().from(pourPlans).orderBy(asc(pourPlans.name), asc(pourPlans.id));
  }

  async findById(id: string): Promise<PourPlanRow | undefined> {
    const [row] = await this.db.select().from(pourPlans).where(eq(pourPlans.id, id));
    return row;
  }

  async insert(values: NewPourPlanRow): Promise<PourPlanRow> {
    const [row] = await this.db.insert(pourPlans).values(values).returning();
    return row!;
  }

  async update(id: string, values: Partial<NewPourPlanRow>): Promise<PourPlanRow | undefined> {
    const [row] = await this.db
      .update(pourPlans)
      .set(values)
      .where(eq(pourPlans.id, id))
      .returning();
    return row;
  }

  /** The batches started from a plan, newest first. */
  batchesOf(planId: string) {
    return this.db
      .select({
        id: batches.id,
        state: batches.state,
        verdict: batches.verdict,
        totalMassG: batches.totalMassG,
        operatorName: batches.operatorName,
        createdAt: batches.createdAt,
      })
      .from(batches)
      .where(eq(batches.planId, planId))
      .orderBy(desc(batches.createdAt), desc(batches.id));
  }
}
