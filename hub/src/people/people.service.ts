import { Inject, Injectable } from '@nestjs/common';
import type { Person, Role } from '@tareline/protocol';
import type { AuthUser } from '../auth/auth-user.js';
import { CredentialHasher } from '../auth/credential-hasher.js';
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
  ) {}

  async list(): Promise<Person[]> {
    return (await this.people.list()).map(toPerson);
  }

  async create(input: NewPerson): Promise<Person> {
    return toPerson(await this.people.insert(await this.newRow(input)));
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
    return this.change(id, {
      ...(changes.name !== undefined ? { name: changes.name } : {}),
      email,
      role,
      active,
    });
  }

  async assignBadge(id: string, badge: string): Promise<Person> {
    const person = await this.get(id);
    const badgeHash = this.hasher.badgeHash(badge);
    if (person.badgeHash !== badgeHash) await this.assertFree({ email: undefined, badgeHash });
    return this.change(id, { badgeHash });
  }

  async setPin(id: string, pin: string | null): Promise<Person> {
    await this.get(id);
    const pinHash = pin === null ? null : await this.hasher.hashSecret(pin);
    return this.change(id, { pinHash });
  }

  async setPassword(id: string, password: string): Promise<Person> {
    await this.get(id);
    const passwordHash = await this.hasher.hashSecret(password);
    return this.change(id, { passwordHash });
  }

  private async get(id: string): Promise<PersonRow> {
    return (await this.people.findById(id)) ?? notFound(id);
  }

  /** Writes changes; a person removed meanwhile is as unknown as one who never was. */
  private async change(id: string, values: Partial<NewPersonRow>): Promise<Person> {
    return toPerson((await this.people.update(id, values)) ?? notFound(id));
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
