import { JwtService } from '@nestjs/jwt';
import { afterAll, afterEach, beforeAll, describe, expect, it, vi } from 'vitest';
import { CLOCK, type Clock } from '../src/common/clock.js';
import { PeopleRepository } from '../src/people/people.repository.js';
import { AUTH_KEYS, type AuthKeys } from '../src/auth/secrets.js';
import {
  SOCKET_AUTHENTICATOR,
  SocketRefusedError,
  type SocketAuthenticator,
} from '../src/auth/socket-authenticator.js';
import { badgeSignIn, call, DEMO, login } from './support/auth-helpers.js';
import { startTestHub, tempDataDir, type TestHub } from './support/test-app.js';

describe('live socket authenticator (SOCKET_AUTHENTICATOR)', () => {
  let hub: TestHub;
  let data: Awaited<ReturnType<typeof tempDataDir>>;
  let sockets: SocketAuthenticator;
  let clock: Clock;

  beforeAll(async () => {
    data = await tempDataDir();
    hub = await startTestHub(data.dir, { TARELINE_SIGN_IN_LIMIT: '1000' });
    sockets = hub.app.get(SOCKET_AUTHENTICATOR);
    clock = hub.app.get(CLOCK);
  });

  afterAll(async () => {
    await hub?.close();
    await data?.remove();
  });

  afterEach(() => {
    vi.restoreAllMocks();
  });

  async function operatorToken(benchId = 'bench-1'): Promise<string> {
    const answer = await badgeSignIn(hub, DEMO.tomas.badge, DEMO.tomas.pin, benchId);
    expect(answer.status).toBe(200);
    return answer.body.token;
  }

  it('refuses a handshake without a token, or with a token that is not one', async () => {
    await expect(sockets.authenticate({ token: undefined, benchId: 'bench-1' })).rejects.toThrow(
      new SocketRefusedError('Sign in first'),
    );
    await expect(
      sockets.authenticate({ token: 'not.a.token', benchId: 'bench-1' }),
    ).rejects.toBeInstanceOf(SocketRefusedError);
  });

  it('refuses a correctly signed token that has no expiry', async () => {
    const keys = hub.app.get<AuthKeys>(AUTH_KEYS);
    const lead = (await hub.app.get(PeopleRepository).list()).find((p) => p.role === 'lead')!;
    const forever = await new JwtService().signAsync(
      { sub: lead.id, role: 'lead', jti: 'no-expiry', iat: Math.floor(Date.now() / 1000) },
      { secret: keys.jwtSecret },
    );
    await expect(sockets.authenticate({ token: forever, benchId: 'bench-1' })).rejects.toThrow(
      new SocketRefusedError('Your session has ended: sign in again'),
    );
  });

  it('lets an operator watch the bench they signed in at, and no other', async () => {
    const token = await operatorToken('bench-1');
    const principal = await sockets.authenticate({ token, benchId: 'bench-1' });
    expect(principal).toMatchObject({ name: 'Tomas Reyl', role: 'operator' });
    expect(principal.expiresAt).toBeGreaterThan(Date.now());
    await expect(sockets.authenticate({ token, benchId: 'bench-2' })).rejects.toThrow(
      'An operator may only watch the bench they signed in at (bench-1)',
    );
  });

  it('lets a lead and an admin signed in at a desk watch any bench', async () => {
    for (const who of [DEMO.lead, DEMO.admin]) {
      const token = await login(hub, who.email, who.password);
      for (const benchId of ['bench-1', 'bench-2']) {
        await expect(sockets.authenticate({ token, benchId })).resolves.toHaveProperty('role');
      }
    }
  });

  it('stays valid until sign-out, then says to disconnect', async () => {
    const token = await operatorToken();
    const principal = await sockets.authenticate({ token, benchId: 'bench-1' });
    expect(await sockets.stillValid(principal)).toBe(true);
    expect((await call(hub, 'POST', '/api/auth/logout', { token })).status).toBe(204);
    expect(await sockets.stillValid(principal)).toBe(false);
    await expect(sockets.authenticate({ token, benchId: 'bench-1' })).rejects.toBeInstanceOf(
      SocketRefusedError,
    );
  });

  it('says to disconnect once the token has run out', async () => {
    const principal = await sockets.authenticate({
      token: await operatorToken(),
      benchId: 'bench-1',
    });
    vi.spyOn(clock, 'now').mockReturnValue(principal.expiresAt + 1);
    expect(await sockets.stillValid(principal)).toBe(false);
  });

  it('says to disconnect once the person is deactivated', async () => {
    const principal = await sockets.authenticate({
      token: await operatorToken(),
      benchId: 'bench-1',
    });
    const people = hub.app.get(PeopleRepository);
    await people.update(principal.userId, { active: false }, () => []);
    try {
      expect(await sockets.stillValid(principal)).toBe(false);
    } finally {
      await people.update(principal.userId, { active: true }, () => []);
    }
  });
});
