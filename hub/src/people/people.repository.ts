import { Inject, Injectable } from '@nestjs/common';
import { asc, count, eq, sql } from 'drizzle-orm';
import { AuditRepository, type AuditInput } from '../audit/audit.repository.js';
import { Database } from '../database/database.js';
import { people } from '../database/schema/index.js';
import { guardStore, type UniqueClashes } from '../database/store-errors.js';

export type PersonRow = typeof people.$inferSelect;
export type NewPersonRow = typeof people.$inferInsert;

/** The audit entries a write leads to, made from what it stored. */
export type AuditOf<T> = (stored: T) => AuditInput | AuditInput[];

export const EMAIL_TAKEN = 'Someone else already has this e-mail';
export const BADGE_TAKEN = 'This badge belongs to someone else: take it off them first';

/** Two admins giving away the same e-mail or badge at the same moment: the second one hears why. */
const CLASHES: UniqueClashes = {
  people_email_unique: { path: 'email', message: EMAIL_TAKEN },
  people_badge_hash_unique: { path: 'badge', message: BADGE_TAKEN },
};

/**
 * The only place that reads and writes the people table (sign-in and the people routes). Throws
 * domain errors only: a clash as Conflict, a store that fails as StoreUnavailable. Writes an
 * admin makes append their audit entries in the same transaction (`audited`).
 */
@Injectable()
export class PeopleRepository {
  constructor(
    @Inject(Database) private readonly database: Database,
    @Inject(AuditRepository) private readonly audit: AuditRepository,
  ) {}

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

  /** Adds a person and the audit entry `entryOf` makes of the stored row, in one transaction. */
  insert(values: NewPersonRow, entryOf: AuditOf<PersonRow>): Promise<PersonRow> {
    return guardStore(
      () =>
        this.audit.record(async (tx) => {
          const [row] = await tx.insert(people).values(values).returning();
          return row!;
        }, entryOf),
      CLASHES,
    );
  }

  insertMany(values: NewPersonRow[], entriesOf: AuditOf<PersonRow[]>): Promise<void> {
    return guardStore(async () => {
      if (values.length === 0) return;
      await this.audit.record((tx) => tx.insert(people).values(values).returning(), entriesOf);
    }, CLASHES);
  }

  /**
   * Changes a person and appends the entry `entryOf` makes of the row as it was and as it is, in
   * one transaction; undefined (and no entry) when there is no such person.
   */
  update(
    id: string,
    values: Partial<NewPersonRow>,
    entryOf: (before: PersonRow, after: PersonRow) => AuditInput | AuditInput[],
  ): Promise<PersonRow | undefined> {
    // Both the write and the audit append fail on a full disk: one guard turns either into 503.
    return guardStore(
      () =>
        this.audit.record(
          async (tx) => {
            const [before] = await tx.select().from(people).where(eq(people.id, id)).for('update');
            if (!before) return undefined;
            const [after] = await tx
              .update(people)
              .set({ ...values, updatedAt: sql`now()` })
              .where(eq(people.id, id))
              .returning();
            return { before, after: after! };
          },
          (r) => (r ? entryOf(r.before, r.after) : []),
        ),
      CLASHES,
    ).then((r) => r?.after);
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
