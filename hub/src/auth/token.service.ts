import { randomUUID } from 'node:crypto';
import { Inject, Injectable } from '@nestjs/common';
import { JwtService } from '@nestjs/jwt';
import { APP_CONFIG, type AppConfig } from '../config/app-config.js';
import type { AuthUser, TokenClaims } from './auth-user.js';
import { CLOCK, type Clock } from './clock.js';
import { PeopleRepository } from './people.repository.js';
import { AUTH_KEYS, type AuthKeys } from './secrets.js';
import { SignInRepository } from './sign-in.repository.js';

/** Why a token no longer opens anything; the message is what the person reads. */
export class SessionEndedError extends Error {
  constructor(message = 'Your session has ended: sign in again') {
    super(message);
    this.name = 'SessionEndedError';
  }
}

/** Issues, checks and revokes session tokens (HS256 JWTs with an id for sign-out). */
@Injectable()
export class TokenService {
  constructor(
    @Inject(JwtService) private readonly jwt: JwtService,
    @Inject(AUTH_KEYS) private readonly keys: AuthKeys,
    @Inject(APP_CONFIG) private readonly config: AppConfig,
    @Inject(CLOCK) private readonly clock: Clock,
    @Inject(PeopleRepository) private readonly people: PeopleRepository,
    @Inject(SignInRepository) private readonly signIns: SignInRepository,
  ) {}

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

  /** Checks signature and expiry only. Throws {@link SessionEndedError}. */
  async verify(token: string): Promise<TokenClaims> {
    try {
      return await this.jwt.verifyAsync<TokenClaims>(token, {
        secret: this.keys.jwtSecret,
        algorithms: ['HS256'],
      });
    } catch {
      throw new SessionEndedError();
    }
  }

  /**
   * The person behind verified claims, with their current name and role; throws
   * {@link SessionEndedError} when the token was revoked or the person is gone or deactivated.
   */
  async resolve(claims: TokenClaims): Promise<AuthUser> {
    if (claims.exp * 1000 <= this.clock.now()) throw new SessionEndedError();
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

  async revoke(user: AuthUser): Promise<void> {
    await this.signIns.revokeToken(
      user.tokenId,
      new Date(user.expiresAt),
      new Date(this.clock.now()),
    );
  }
}
