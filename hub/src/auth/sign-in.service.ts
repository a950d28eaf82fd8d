import {
  ForbiddenException,
  HttpException,
  HttpStatus,
  Inject,
  Injectable,
  NotFoundException,
  UnauthorizedException,
} from '@nestjs/common';
import {
  PIN_NEEDED_PATH,
  type ApiError,
  type BadgeSignInRequest,
  type LoginRequest,
  type MeResponse,
  type SessionBench,
  type SignInResponse,
} from '@tareline/protocol';
import type { AuthUser } from './auth-user.js';
import { CLOCK, type Clock } from './clock.js';
import { CredentialHasher } from './credential-hasher.js';
import { PeopleRepository, type PersonRow } from './people.repository.js';
import { SignInRepository, type BenchRow } from './sign-in.repository.js';
import { TokenService } from './token.service.js';

/** Wrong PINs in a row before a badge locks, and for how long. */
export const MAX_PIN_FAILURES = 5;
export const BADGE_LOCK_MS = 5 * 60_000;

const NOT_RECOGNISED_BADGE = 'Badge or PIN not recognised';
const NOT_RECOGNISED_LOGIN = 'E-mail or password not recognised';
const SWITCHED_OFF = 'Your sign-in has been switched off: ask an admin';

/**
 * The sign-in rules. An unknown badge is handled exactly like a known one with a PIN (asked for a
 * PIN, checked against a dummy hash, counted towards a lock), so answers and timing say nothing
 * about which badges exist.
 */
@Injectable()
export class SignInService {
  constructor(
    @Inject(PeopleRepository) private readonly people: PeopleRepository,
    @Inject(SignInRepository) private readonly signIns: SignInRepository,
    @Inject(CredentialHasher) private readonly hasher: CredentialHasher,
    @Inject(TokenService) private readonly tokens: TokenService,
    @Inject(CLOCK) private readonly clock: Clock,
  ) {}

  async badge(request: BadgeSignInRequest): Promise<SignInResponse> {
    const bench = await this.signIns.findBench(request.benchId);
    if (!bench || !bench.active) {
      throw new NotFoundException({
        message: `No bench called "${request.benchId}": check the bench setting`,
        errors: [{ path: 'benchId', message: 'Unknown bench' }],
      } satisfies ApiError);
    }
    const badgeHash = this.hasher.badgeHash(request.badge);
    const lockedUntil = await this.signIns.lockedUntil(badgeHash);
    if (lockedUntil && lockedUntil.getTime() > this.clock.now())
      throw lockedError(lockedUntil, this.clock.now());

    const person = await this.people.findByBadgeHash(badgeHash);
    const needsPin = !person || bench.pinRequired || person.pinHash !== null;
    if (needsPin) {
      if (request.pin === undefined) {
        throw new UnauthorizedException({
          message: 'Enter your PIN',
          errors: [{ path: PIN_NEEDED_PATH, message: 'Enter your PIN' }],
        } satisfies ApiError);
      }
      // Always one scrypt check: a dummy one when there is no PIN to compare with.
      const ok = await this.hasher.verifySecret(request.pin, person?.pinHash);
      if (!ok) {
        const locked = await this.signIns.recordFailure(
          badgeHash,
          MAX_PIN_FAILURES,
          new Date(this.clock.now() + BADGE_LOCK_MS),
        );
        if (locked) {
          throw lockedError(new Date(this.clock.now() + BADGE_LOCK_MS), this.clock.now());
        }
        throw new UnauthorizedException({
          message: NOT_RECOGNISED_BADGE,
          errors: [],
        } satisfies ApiError);
      }
      await this.signIns.clearFailures(badgeHash);
    }
    // Only someone holding the badge (and its PIN) learns that it is switched off.
    if (!person!.active) throw new ForbiddenException(SWITCHED_OFF);
    return this.session(person!, bench);
  }

  async login(request: LoginRequest): Promise<SignInResponse> {
    const person = await this.people.findByEmail(request.email);
    const ok = await this.hasher.verifySecret(request.password, person?.passwordHash);
    if (!ok || !person) {
      throw new UnauthorizedException({
        message: NOT_RECOGNISED_LOGIN,
        errors: [],
      } satisfies ApiError);
    }
    if (!person.active) throw new ForbiddenException(SWITCHED_OFF);
    return this.session(person, undefined);
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

function lockedError(until: Date, now: number): HttpException {
  const minutes = Math.max(1, Math.ceil((until.getTime() - now) / 60_000));
  return new HttpException(
    {
      message: `Too many wrong PINs: this badge is locked for ${minutes} more minute${minutes === 1 ? '' : 's'}`,
      errors: [],
    } satisfies ApiError,
    HttpStatus.LOCKED,
  );
}
