import { Inject, Injectable } from '@nestjs/common';
import type { Person, Role } from '@tareline/protocol';
import type { AuthUser } from '../auth/auth-user.js';
import { actorOf, type Actor, type AuditInput } from '../audit/audit.repository.js';
import { CredentialHasher } from '../auth/credential-hasher.js';
import { CLOCK, type Clock } from '../common/clock.js';
import { Conflict, NotFound } from '../common/domain-errors.js';
import {
  BADGE_TAKEN,
  EMAIL_TAKEN,
  PeopleRepository,
  type NewPersonRow,
  type PersonRow,
} from './people.repository.js';

export interface NewPerson {
  name: string;
  role: Role;
  email?: string | undefined;
  password?: string | undefined;
  badge?: string | undefined;
  pin?: string | undefined;
}

export interface PersonChanges {
  name?: string | undefined;
  email?: string | null | undefined;
  role?: Role | undefined;
  active?: boolean | undefined;
}

/** People, badges, PINs and passwords, as admins manage them. */
@Injectable()
export class PeopleService {
  constructor(
    @Inject(PeopleRepository) private readonly people: PeopleRepository,
    @Inject(CredentialHasher) private readonly hasher: CredentialHasher,
    @Inject(CLOCK) private readonly clock: Clock,
  ) {}

  async list(): Promise<Person[]> {
    return (await this.people.list()).map(toPerson);
  }

  /** Adds a person; `by` is the admin who did (null: the hub's first start). */
  async create(input: NewPerson, by: Actor): Promise<Person> {
    const row = await this.people.insert(await this.newRow(input), (stored) =>
      this.entry(by, stored.id, 'person.created', personFacts(stored)),
    );
    return toPerson(row);
  }

  /** Adds people in one insert (demo seeding), each with its audit entry. */
  async createMany(rows: NewPersonRow[], by: Actor): Promise<void> {
    await this.people.insertMany(rows, (stored) =>
      stored.map((p) => this.entry(by, p.id, 'person.created', personFacts(p))),
    );
  }

  /** Rows for a bulk insert (demo seeding); the same checks as {@link create}. */
  async newRow(input: NewPerson): Promise<NewPersonRow> {
    const badgeHash = input.badge ? this.hasher.badgeHash(input.badge) : null;
    await this.assertFree({ email: input.email, badgeHash });
    return {
      name: input.name,
      role: input.role,
      email: input.email ?? null,
      passwordHash: input.password ? await this.hasher.hashSecret(input.password) : null,
      badgeHash,
      pinHash: input.pin ? await this.hasher.hashSecret(input.pin) : null,
    };
  }

  async update(id: string, changes: PersonChanges, actor: AuthUser): Promise<Person> {
    const person = await this.get(id);
    const role = changes.role ?? person.role;
    const active = changes.active ?? person.active;
    const email = changes.email === undefined ? person.email : changes.email;
    if (email !== person.email && email) await this.assertFree({ email, badgeHash: null });
    if (role !== 'operator' && (!email || !person.passwordHash)) {
      throw conflict(
        `A ${role} signs in at a desk: give ${person.name} an e-mail and a password first`,
        !email ? 'email' : 'role',
      );
    }
    const losesAdmin = person.role === 'admin' && person.active && (role !== 'admin' || !active);
    if (losesAdmin && person.id === actor.id) {
      throw conflict('You cannot remove your own admin rights or switch yourself off', 'role');
    }
    if (losesAdmin && (await this.people.countActiveAdmins()) <= 1) {
      throw conflict('This is the last active admin: make someone else admin first', 'role');
    }
    return this.change(
      id,
      { ...(changes.name !== undefined ? { name: changes.name } : {}), email, role, active },
      actorOf(actor),
      'person.changed',
    );
  }

  async assignBadge(id: string, badge: string, by: Actor): Promise<Person> {
    const person = await this.get(id);
    const badgeHash = this.hasher.badgeHash(badge);
    if (person.badgeHash !== badgeHash) await this.assertFree({ email: undefined, badgeHash });
    return this.change(id, { badgeHash }, by, 'person.badge');
  }

  async setPin(id: string, pin: string | null, by: Actor): Promise<Person> {
    await this.get(id);
    const pinHash = pin === null ? null : await this.hasher.hashSecret(pin);
    return this.change(id, { pinHash }, by, pin === null ? 'person.pin-cleared' : 'person.pin');
  }

  async setPassword(id: string, password: string, by: Actor): Promise<Person> {
    await this.get(id);
    const passwordHash = await this.hasher.hashSecret(password);
    return this.change(id, { passwordHash }, by, 'person.password');
  }

  private async get(id: string): Promise<PersonRow> {
    return (await this.people.findById(id)) ?? notFound(id);
  }

  /**
   * Writes changes and their audit entry (what the person was and is, never a secret or its
   * hash); a person removed meanwhile is as unknown as one who never was.
   */
  private async change(
    id: string,
    values: Partial<NewPersonRow>,
    by: Actor,
    action: string,
  ): Promise<Person> {
    const row = await this.people.update(id, values, (before, after) =>
      this.entry(by, id, action, { before: personFacts(before), after: personFacts(after) }),
    );
    return toPerson(row ?? notFound(id));
  }

  private entry(by: Actor, id: string, action: string, data: unknown): AuditInput {
    const at = new Date(this.clock.now()).toISOString();
    return { at, actor: by, entity: 'person', entityId: id, action, data };
  }

  private async assertFree(taken: {
    email: string | null | undefined;
    badgeHash: string | null;
  }): Promise<void> {
    if (taken.email && (await this.people.findByEmail(taken.email))) {
      throw conflict(EMAIL_TAKEN, 'email');
    }
    if (taken.badgeHash && (await this.people.findByBadgeHash(taken.badgeHash))) {
      throw conflict(BADGE_TAKEN, 'badge');
    }
  }
}

function conflict(message: string, path: string): Conflict {
  return new Conflict(message, [{ path, message }]);
}

function notFound(id: string): never {
  throw new NotFound(`No person with id ${id}`);
}

/** What the audit trail keeps of a person: who they are and may do, whether secrets are set. */
function personFacts(row: PersonRow) {
  return {
    name: row.name,
    role: row.role,
    active: row.active,
    email: row.email,
    hasBadge: row.badgeHash !== null,
    hasPin: row.pinHash !== null,
    hasPassword: row.passwordHash !== null,
  };
}

export function toPerson(row: PersonRow): Person {
  return {
    id: row.id,
    name: row.name,
    role: row.role,
    active: row.active,
    email: row.email,
    hasBadge: row.badgeHash !== null,
    hasPin: row.pinHash !== null,
    hasPassword: row.passwordHash !== null,
    createdAt: row.createdAt.toISOString(),
  };
}
