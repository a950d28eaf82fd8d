import { randomUUID } from 'node:crypto';
import { Inject, Injectable, type OnModuleDestroy } from '@nestjs/common';
import { JwtService } from '@nestjs/jwt';
import { roleSchema } from '@tareline/protocol';
import { z } from 'zod';
import { CLOCK, type Clock } from '../common/clock.js';
import { NotSignedIn, StoreUnavailable } from '../common/domain-errors.js';
import { APP_CONFIG, type AppConfig } from '../config/app-config.js';
import { PeopleRepository } from '../people/people.repository.js';
import type { AuthUser, TokenClaims } from './auth-user.js';
import { AUTH_KEYS, type AuthKeys } from './secrets.js';
import { SignInRepository } from './sign-in.repository.js';
import { UnsavedWrites } from './unsaved-writes.js';

/** Why a token no longer opens anything; the message is what the person reads. */
export class SessionEndedError extends NotSignedIn {
  constructor(message = 'Your session has ended: sign in again') {
    super(message);
  }
}

/**
 * What a token the hub issued always holds. A token without `exp` would never run out: the JWT
 * library only checks an expiry that is there, so the hub insists on one.
 */
const tokenClaimsSchema = z.object({
  sub: z.string().min(1),
  role: roleSchema,
  jti: z.string().min(1),
  iat: z.number().int(),
  exp: z.number().int(),
  benchId: z.string().min(1).optional(),
});

/**
 * Issues, checks and revokes session tokens (HS256 JWTs with an id for sign-out). A sign-out
 * takes effect at once in memory, before it is written, so a store that cannot write (a full
 * disk) never leaves a signed-out token working; the write is retried until the store takes it.
 */
@Injectable()
export class TokenService implements OnModuleDestroy {
  /** Token id → epoch ms it runs out: signed out on this hub, saved or not yet. */
  private readonly signedOut = new Map<string, number>();
  private readonly unsaved: UnsavedWrites<number>;
  private readonly endedListeners = new Set<() => void>();

  constructor(
    @Inject(JwtService) private readonly jwt: JwtService,
    @Inject(AUTH_KEYS) private readonly keys: AuthKeys,
    @Inject(APP_CONFIG) private readonly config: AppConfig,
    @Inject(CLOCK) private readonly clock: Clock,
    @Inject(PeopleRepository) private readonly people: PeopleRepository,
    @Inject(SignInRepository) private readonly signIns: SignInRepository,
  ) {
    this.unsaved = new UnsavedWrites('TokenService', (tokenId, expiresAt) =>
      this.signIns.revokeToken(tokenId, new Date(expiresAt), new Date(this.clock.now())),
    );
  }

  async issue(
    person: { id: string; role: AuthUser['role'] },
    benchId?: string,
  ): Promise<{ token: string; expiresAt: number }> {
    const iat = Math.floor(this.clock.now() / 1000);
    const exp = iat + Math.round(this.config.auth.sessionHours * 3600);
    const claims: TokenClaims = {
      sub: person.id,
      role: person.role,
      jti: randomUUID(),
      iat,
      exp,
      ...(benchId ? { benchId } : {}),
    };
    const token = await this.jwt.signAsync(claims, {
      secret: this.keys.jwtSecret,
      algorithm: 'HS256',
    });
    return { token, expiresAt: exp * 1000 };
  }

  /** Checks signature, expiry and claims only. Throws {@link SessionEndedError}. */
  async verify(token: string): Promise<TokenClaims> {
    let payload: unknown;
    try {
      payload = await this.jwt.verifyAsync<object>(token, {
        secret: this.keys.jwtSecret,
        algorithms: ['HS256'],
      });
    } catch {
      throw new SessionEndedError();
    }
    return parseClaims(payload);
  }

  /**
   * The person behind verified claims, with their current name and role; throws
   * {@link SessionEndedError} when the token has no expiry or ran out, was signed out, or the
   * person is gone or deactivated.
   */
  async resolve(payload: unknown): Promise<AuthUser> {
    const claims = parseClaims(payload);
    if (claims.exp * 1000 <= this.clock.now()) throw new SessionEndedError();
    if (this.signedOut.has(claims.jti)) throw new SessionEndedError();
    if (await this.signIns.isRevoked(claims.jti)) throw new SessionEndedError();
    const person = await this.people.findById(claims.sub);
    if (!person || !person.active) {
      throw new SessionEndedError('Your sign-in has been switched off: ask an admin');
    }
    return {
      id: person.id,
      name: person.name,
      role: person.role,
      tokenId: claims.jti,
      expiresAt: claims.exp * 1000,
      ...(claims.benchId ? { benchId: claims.benchId } : {}),
    };
  }

  /**
   * Signs a token out: refused from now on, and listeners (the live socket) told at once. Throws
   * StoreUnavailable when the sign-out could not be written yet; it still holds on this hub.
   */
  async revoke(user: AuthUser): Promise<void> {
    const now = this.clock.now();
    for (const [tokenId, expiresAt] of this.signedOut) {
      if (expiresAt <= now) this.signedOut.delete(tokenId);
    }
    this.signedOut.set(user.tokenId, user.expiresAt);
    for (const listener of this.endedListeners) listener();
    try {
      await this.unsaved.save(user.tokenId, user.expiresAt);
    } catch {
      throw new StoreUnavailable(
        'You are signed out on this hub, but the hub could not save the sign-out yet (its data ' +
          'store is failing; the disk may be full). It keeps trying: tell an admin',
      );
    }
  }

  /** Calls `listener` whenever a session ends early (sign-out); returns the unsubscribe. */
  onSessionEnded(listener: () => void): () => void {
    this.endedListeners.add(listener);
    return () => this.endedListeners.delete(listener);
  }

  /** Writes sign-outs the store refused earlier, now (tests; a timer does it every few seconds). */
  saveUnsaved(): Promise<void> {
    return this.unsaved.retry();
  }

  async onModuleDestroy(): Promise<void> {
    await this.unsaved.close();
  }
}

function parseClaims(payload: unknown): TokenClaims {
  const claims = tokenClaimsSchema.safeParse(payload);
  if (!claims.success) throw new SessionEndedError();
  return claims.data as TokenClaims;
}
