import { Inject, Injectable, UnauthorizedException } from '@nestjs/common';
import { PassportStrategy } from '@nestjs/passport';
import { ExtractJwt, Strategy } from 'passport-jwt';
import type { AuthUser } from './auth-user.js';
import { AUTH_KEYS, type AuthKeys } from './secrets.js';
import { SessionEndedError, TokenService } from './token.service.js';

/** `Authorization: Bearer <token>`: signature and expiry by passport-jwt, the rest by the hub. */
@Injectable()
export class JwtStrategy extends PassportStrategy(Strategy, 'jwt') {
  constructor(
    @Inject(AUTH_KEYS) keys: AuthKeys,
    @Inject(TokenService) private readonly tokens: TokenService,
  ) {
    super({
      jwtFromRequest: ExtractJwt.fromAuthHeaderAsBearerToken(),
      secretOrKey: keys.jwtSecret,
      algorithms: ['HS256'],
      ignoreExpiration: false,
    });
  }

  /** `payload` is whatever the signed token holds; `resolve` checks its claims. */
  async validate(payload: unknown): Promise<AuthUser> {
    try {
      return await this.tokens.resolve(payload);
    } catch (err) {
      if (err instanceof SessionEndedError) throw new UnauthorizedException(err.message);
      throw err;
    }
  }
}
