import { Inject, Injectable } from '@nestjs/common';
import type { TokenClaims } from './auth-user.js';
import { CLOCK, type Clock } from '../common/clock.js';
import {
  SocketRefusedError,
  type SocketAuthenticator,
  type SocketPrincipal,
} from './socket-authenticator.js';
import { SessionEndedError, TokenService } from './token.service.js';

/** What the authenticator keeps to re-check a socket later; a SocketPrincipal plus the token id. */
interface TrackedPrincipal extends SocketPrincipal {
  tokenId: string;
}

/**
 * The live socket's door: a valid session token, and a bench the role may watch. Operators only
 * the bench they signed in at; leads and admins any bench.
 */
@Injectable()
export class JwtSocketAuthenticator implements SocketAuthenticator {
  constructor(
    @Inject(TokenService) private readonly tokens: TokenService,
    @Inject(CLOCK) private readonly clock: Clock,
  ) {}

  async authenticate(handshake: {
    token: string | undefined;
    benchId: string;
  }): Promise<SocketPrincipal> {
    if (!handshake.token) throw new SocketRefusedError('Sign in first');
    let claims: TokenClaims;
    try {
      claims = await this.tokens.verify(handshake.token);
      const user = await this.tokens.resolve(claims);
      if (user.role === 'operator' && user.benchId !== handshake.benchId) {
        throw new SocketRefusedError(
          `An operator may only watch the bench they signed in at (${user.benchId ?? 'none'})`,
        );
      }
      const principal: TrackedPrincipal = {
        userId: user.id,
        name: user.name,
        role: user.role,
        expiresAt: user.expiresAt,
        tokenId: user.tokenId,
        atBench: user.benchId === handshake.benchId,
      };
      return principal;
    } catch (err) {
      if (err instanceof SessionEndedError) throw new SocketRefusedError(err.message);
      throw err;
    }
  }

  onSessionEnded(listener: () => void): () => void {
    return this.tokens.onSessionEnded(listener);
  }

  async stillValid(principal: SocketPrincipal): Promise<boolean> {
    if (principal.expiresAt <= this.clock.now()) return false;
    const tokenId = (principal as Partial<TrackedPrincipal>).tokenId;
    if (!tokenId) return false;
    try {
      const user = await this.tokens.resolve({
        sub: principal.userId,
        role: principal.role,
        jti: tokenId,
        exp: Math.floor(principal.expiresAt / 1000),
        iat: 0,
      });
      // A role change takes effect at the next handshake; a demotion ends the socket now.
      return user.role === principal.role;
    } catch (err) {
      if (err instanceof SessionEndedError) return false;
      throw err;
    }
  }
}
