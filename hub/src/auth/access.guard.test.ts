import 'reflect-metadata';
import { ForbiddenException } from '@nestjs/common';
import { Reflector } from '@nestjs/core';
import { WsException } from '@nestjs/websockets';
import { describe, expect, it } from 'vitest';
import { Public, Roles } from './access.decorator.js';
import { AccessGuard, SOCKET_PRINCIPAL_KEY } from './access.guard.js';

// Decorators applied by hand: this test file is outside the tsconfig that turns decorators on.
class Sample {
  forgotten() {}
  open() {}
  review() {}
}
const describeMethod = (name: keyof Sample) =>
  Object.getOwnPropertyDescriptor(Sample.prototype, name)!;
Public()(Sample.prototype, 'open', describeMethod('open'));
Roles('lead', 'admin')(Sample.prototype, 'review', describeMethod('review'));

function wsContext(handler: () => void, principal?: { role: string }) {
  return {
    getType: () => 'ws',
    getHandler: () => handler,
    getClass: () => Sample,
    switchToWs: () => ({
      getClient: () => ({ data: principal ? { [SOCKET_PRINCIPAL_KEY]: principal } : {} }),
    }),
  } as never;
}

function httpContext(handler: () => void) {
  return {
    getType: () => 'http',
    getHandler: () => handler,
    getClass: () => Sample,
  } as never;
}

describe('AccessGuard', () => {
  const guard = new AccessGuard(new Reflector());

  it('refuses a route that declares no policy, even before looking for a token', async () => {
    await expect(guard.canActivate(httpContext(Sample.prototype.forgotten))).rejects.toThrow(
      ForbiddenException,
    );
    await expect(guard.canActivate(httpContext(Sample.prototype.forgotten))).rejects.toThrow(
      'This action declares no access policy, so nobody may use it',
    );
  });

  it('lets anyone through a public route', async () => {
    await expect(guard.canActivate(httpContext(Sample.prototype.open))).resolves.toBe(true);
  });

  it('checks a socket event against the role of the accepted socket', async () => {
    await expect(
      guard.canActivate(wsContext(Sample.prototype.review, { role: 'lead' })),
    ).resolves.toBe(true);
    await expect(
      guard.canActivate(wsContext(Sample.prototype.review, { role: 'operator' })),
    ).rejects.toThrow(WsException);
    await expect(guard.canActivate(wsContext(Sample.prototype.review))).rejects.toThrow(
      'Sign in first',
    );
    await expect(
      guard.canActivate(wsContext(Sample.prototype.forgotten, { role: 'admin' })),
    ).rejects.toThrow('declares no access policy');
  });
});
