import { Inject, Injectable } from '@nestjs/common';
import { asc, count, eq, sql } from 'drizzle-orm';
import { Database } from '../database/database.js';
import { people } from '../database/schema/index.js';

export type PersonRow = typeof people.$inferSelect;
export type NewPersonRow = typeof people.$inferInsert;

/** The only place that reads and writes the people table (sign-in and the people routes). */
@Injectable()
export class PeopleRepository {
  constructor(@Inject(Database) private readonly database: Database) {}

  private get db() {
    return this.database.db;
  }

  async count(): Promise<number> {
    const [row] = await this.db.select({ n: count() }).from(people);
    return row?.n ?? 0;
  }

  async findById(id: string): Promise<PersonRow | undefined> {
    const [row] = await this.db.select().from(people).where(eq(people.id, id));
    return row;
  }

  async findByBadgeHash(badgeHash: string): Promise<PersonRow | undefined> {
    const [row] = await this.db.select().from(people).where(eq(people.badgeHash, badgeHash));
    return row;
  }

  async findByEmail(email: string): Promise<PersonRow | undefined> {
    const [row] = await this.db.select().from(people).where(eq(people.email, email));
    return row;
  }

  list(): Promise<PersonRow[]> {
    return this.db.select().from(people).orderBy(asc(people.name));
  }

  async insert(values: NewPersonRow): Promise<PersonRow> {
    const [row] = await this.db.insert(people).values(values).returning();
    return row!;
  }

  async insertMany(values: NewPersonRow[]): Promise<void> {
    if (values.length > 0) await this.db.insert(people).values(values);
  }

  async update(id: string, values: Partial<NewPersonRow>): Promise<PersonRow | undefined> {
    const [row] = await this.db
      .update(people)
      .set({ ...values, updatedAt: sql`now()` })
      .where(eq(people.id, id))
      .returning();
    return row;
  }

  async countActiveAdmins(): Promise<number> {
    const [row] = await this.db
      .select({ n: count() })
      .from(people)
      .where(sql`${people.role} = 'admin' and ${people.active}`);
    return row?.n ?? 0;
  }
}
