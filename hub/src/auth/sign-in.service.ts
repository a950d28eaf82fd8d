import { Inject, Injectable } from '@nestjs/common';
import {
  PIN_NEEDED_PATH,
  type BadgeSignInRequest,
  type LoginRequest,
  type MeResponse,
  type SessionBench,
  type SignInResponse,
} from '@tareline/protocol';
import { NotAllowed, NotFound, NotSignedIn } from '../common/domain-errors.js';
import { PeopleRepository, type PersonRow } from '../people/people.repository.js';
import type { AuthUser } from './auth-user.js';
import { BadgeLockout } from './badge-lockout.js';
import { CredentialHasher } from './credential-hasher.js';
import { SignInRepository, type BenchRow } from './sign-in.repository.js';
import { TokenService } from './token.service.js';

const NOT_RECOGNISED_BADGE = 'Badge or PIN not recognised';
const NOT_RECOGNISED_LOGIN = 'E-mail or password not recognised';
const SWITCHED_OFF = 'Your sign-in has been switched off: ask an admin';

/**
 * The sign-in rules. An unknown badge, and the badge of someone switched off, are handled exactly
 * like a known badge with a PIN (asked for a PIN, checked against a dummy hash, counted towards a
 * lock), so answers and timing say nothing about which badges exist or who is switched off.
 */
@Injectable()
export class SignInService {
  constructor(
    @Inject(PeopleRepository) private readonly people: PeopleRepository,
    @Inject(SignInRepository) private readonly signIns: SignInRepository,
    @Inject(CredentialHasher) private readonly hasher: CredentialHasher,
    @Inject(TokenService) private readonly tokens: TokenService,
    @Inject(BadgeLockout) private readonly lockout: BadgeLockout,
  ) {}

  async badge(request: BadgeSignInRequest): Promise<SignInResponse> {
    const bench = await this.signIns.findBench(request.benchId);
    if (!bench || !bench.active) {
      throw new NotFound(`No bench called "${request.benchId}": check the bench setting`, [
        { path: 'benchId', message: 'Unknown bench' },
      ]);
    }
    const badgeHash = this.hasher.badgeHash(request.badge);
    const person = await this.people.findByBadgeHash(badgeHash);
    const needsPin = !person?.active || bench.pinRequired || person.pinHash !== null;
    const pinRight = await this.lockout.attempt(badgeHash, async () => {
      if (!needsPin) return null;
      if (request.pin === undefined) {
        throw new NotSignedIn('Enter your PIN', [
          { path: PIN_NEEDED_PATH, message: 'Enter your PIN' },
        ]);
      }
      // Always one scrypt check: a dummy one when there is no PIN to compare with.
      return this.hasher.verifySecret(request.pin, person?.pinHash);
    });
    if (pinRight === false || !person) throw new NotSignedIn(NOT_RECOGNISED_BADGE);
    // Only someone holding the badge and its PIN learns that it is switched off.
    if (!person.active) throw new NotAllowed(SWITCHED_OFF);
    return this.session(person, bench);
  }

  async login(request: LoginRequest): Promise<SignInResponse> {
    const person = await this.people.findByEmail(request.email);
    const ok = await this.hasher.verifySecret(request.password, person?.passwordHash);
    if (!ok || !person) throw new NotSignedIn(NOT_RECOGNISED_LOGIN);
    if (!person.active) throw new NotAllowed(SWITCHED_OFF);
    return this.session(person, undefined);
  }

  /**
   * Checks the signed-in person's password again, to sign a record (an electronic signature).
   * A wrong one is refused like a wrong sign-in, but the session goes on.
   */
  async confirmPassword(user: AuthUser, password: string): Promise<void> {
    const person = await this.people.findById(user.id);
    const ok = await this.hasher.verifySecret(password, person?.passwordHash);
    if (!ok || !person?.active) {
      throw new NotSignedIn('Password not recognised: the decision is not signed', [
        { path: 'password', message: 'Password not recognised' },
      ]);
    }
  }

  /**
   * A lead's e-mail and password given at someone else's screen, to let something through that
   * needs a lead (a batch too small for the bench's scale). A wrong pair is refused like a wrong
   * sign-in; a right one from someone who is not a lead is refused as not theirs to give.
   */
  async confirmLead(
    credentials: LoginRequest,
    what: string,
  ): Promise<{ id: string; name: string; role: PersonRow['role'] }> {
    const person = await this.people.findByEmail(credentials.email);
    const ok = await this.hasher.verifySecret(credentials.password, person?.passwordHash);
    if (!ok || !person) {
      throw new NotSignedIn(`${NOT_RECOGNISED_LOGIN}: ${what} is not allowed`, [
        { path: 'override.password', message: NOT_RECOGNISED_LOGIN },
      ]);
    }
    if (!person.active) throw new NotAllowed(SWITCHED_OFF);
    if (person.role !== 'lead' && person.role !== 'admin') {
      throw new NotAllowed(`Only a lead can allow this: ${what} is not allowed`, [
        { path: 'override.email', message: 'Ask a lead to enter their own e-mail and password' },
      ]);
    }
    return { id: person.id, name: person.name, role: person.role };
  }

  async me(user: AuthUser): Promise<MeResponse> {
    const bench = user.benchId ? await this.signIns.findBench(user.benchId) : undefined;
    return {
      user: { id: user.id, name: user.name, role: user.role },
      expiresAt: user.expiresAt,
      ...(bench ? { bench: toSessionBench(bench) } : {}),
    };
  }

  logout(user: AuthUser): Promise<void> {
    return this.tokens.revoke(user);
  }

  private async session(person: PersonRow, bench: BenchRow | undefined): Promise<SignInResponse> {
    const { token, expiresAt } = await this.tokens.issue(person, bench?.id);
    return {
      token,
      expiresAt,
      user: { id: person.id, name: person.name, role: person.role },
      ...(bench ? { bench: toSessionBench(bench) } : {}),
    };
  }
}

function toSessionBench(bench: BenchRow): SessionBench {
  return {
    id: bench.id,
    name: bench.name,
    pinRequired: bench.pinRequired,
    idleSignOutMin: bench.idleSignOutMin,
  };
}
