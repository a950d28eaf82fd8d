import {
  ExecutionContext,
  ForbiddenException,
  Inject,
  Injectable,
  UnauthorizedException,
} from '@nestjs/common';
import { Reflector } from '@nestjs/core';
import { AuthGuard } from '@nestjs/passport';
import { WsException } from '@nestjs/websockets';
import type { Role } from '@tareline/protocol';
import { ACCESS_POLICY, type AccessPolicy } from './access.decorator.js';
import type { AuthUser } from './auth-user.js';
import type { SocketPrincipal } from './socket-authenticator.js';

/** Where the live gateway keeps the accepted {@link SocketPrincipal}: `socket.data.principal`. */
export const SOCKET_PRINCIPAL_KEY = 'principal';

/**
 * Enforces `@Public()` / `@Roles(...)` on every route and socket event. Deny by default: a
 * handler without a policy is refused, so a forgotten declaration fails closed.
 */
@Injectable()
export class AccessGuard extends AuthGuard('jwt') {
  constructor(@Inject(Reflector) private readonly reflector: Reflector) {
    super();
  }

  override async canActivate(context: ExecutionContext): Promise<boolean> {
    const policy = this.reflector.getAllAndOverride<AccessPolicy | undefined>(ACCESS_POLICY, [
      context.getHandler(),
      context.getClass(),
    ]);
    const ws = context.getType() === 'ws';
    if (!policy) {
      const message = 'This action declares no access policy, so nobody may use it';
      throw ws ? new WsException(message) : new ForbiddenException(message);
    }
    if (policy.kind === 'public') return true;
    if (ws) {
      const client = context.switchToWs().getClient<{ data?: Record<string, unknown> }>();
      const principal = client.data?.[SOCKET_PRINCIPAL_KEY] as SocketPrincipal | undefined;
      if (!principal) throw new WsException('Sign in first');
      if (!policy.roles.includes(principal.role)) throw new WsException(refusal(principal.role));
      return true;
    }
    await (super.canActivate(context) as Promise<boolean>);
    const user = context.switchToHttp().getRequest<{ user?: AuthUser }>().user;
    if (!user) throw new UnauthorizedException('Sign in first');
    if (!policy.roles.includes(user.role)) throw new ForbiddenException(refusal(user.role));
    return true;
  }

  override handleRequest<TUser = AuthUser>(err: unknown, user: TUser, info: unknown): TUser {
    if (err) throw err;
    if (!user) {
      const noToken = info instanceof Error && /no auth token/i.test(info.message);
      throw new UnauthorizedException(
        noToken ? 'Sign in first' : 'Your session has ended: sign in again',
      );
    }
    return user;
  }
}

function refusal(role: Role): string {
  return `Your role (${role}) may not do this`;
}
