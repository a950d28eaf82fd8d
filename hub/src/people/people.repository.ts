import { Inject, Injectable } from '@nestjs/common';
import { asc, count, eq, sql } from 'drizzle-orm';
import { Database } from '../database/database.js';
import { people } from '../database/schema/index.js';
import { guardStore, type UniqueClashes } from '../database/store-errors.js';

export type PersonRow = typeof people.$inferSelect;
export type NewPersonRow = typeof people.$inferInsert;

export const EMAIL_TAKEN = 'Someone else already has this e-mail';
export const BADGE_TAKEN = 'This badge belongs to someone else: take it off them first';

/** Two admins giving away the same e-mail or badge at the same moment: the second one hears why. */
const CLASHES: UniqueClashes = {
  people_email_unique: { path: 'email', message: EMAIL_TAKEN },
  people_badge_hash_unique: { path: 'badge', message: BADGE_TAKEN },
};

/**
 * The only place that reads and writes the people table (sign-in and the people routes). Throws
 * domain errors only: a clash as Conflict, a store that fails as StoreUnavailable.
 */
@Injectable()
export class PeopleRepository {
  constructor(@Inject(Database) private readonly database: Database) {}

  private get db() {
    return this.database.db;
  }

  count(): Promise<number> {
    return guardStore(async () => {
      const [row] = await this.db.select({ n: count() }).from(people);
      return row?.n ?? 0;
    });
  }

  findById(id: string): Promise<PersonRow | undefined> {
    return guardStore(async () => {
      const [row] = await this.db.select().from(people).where(eq(people.id, id));
      return row;
    });
  }

  findByBadgeHash(badgeHash: string): Promise<PersonRow | undefined> {
    return guardStore(async () => {
      const [row] = await this.db.select().from(people).where(eq(people.badgeHash, badgeHash));
      return row;
    });
  }

  findByEmail(email: string): Promise<PersonRow | undefined> {
    return guardStore(async () => {
      const [row] = await this.db.select().from(people).where(eq(people.email, email));
      return row;
    });
  }

  list(): Promise<PersonRow[]> {
    return guardStore(() => this.db.select().from(people).orderBy(asc(people.name)));
  }

  insert(values: NewPersonRow): Promise<PersonRow> {
    return guardStore(async () => {
      const [row] = await this.db.insert(people).values(values).returning();
      return row!;
    }, CLASHES);
  }

  insertMany(values: NewPersonRow[]): Promise<void> {
    return guardStore(async () => {
      if (values.length > 0) await this.db.insert(people).values(values);
    }, CLASHES);
  }

  update(id: string, values: Partial<NewPersonRow>): Promise<PersonRow | undefined> {
    return guardStore(async () => {
      const [row] = await this.db
        .update(people)
        .set({ ...values, updatedAt: sql`now()` })
        .where(eq(people.id, id))
        .returning();
      return row;
    }, CLASHES);
  }

  countActiveAdmins(): Promise<number> {
    return guardStore(async () => {
      const [row] = await this.db
        .select({ n: count() })
        .from(people)
        .where(sql`${people.role} = 'admin' and ${people.active}`);
      return row?.n ?? 0;
    });
  }
}
