import { stat } from 'node:fs/promises';
import { join } from 'node:path';
import { JwtService } from '@nestjs/jwt';
import { afterAll, afterEach, beforeAll, describe, expect, it, vi } from 'vitest';
import { CLOCK, type Clock } from '../src/common/clock.js';
import { CredentialHasher } from '../src/auth/credential-hasher.js';
import { PeopleRepository } from '../src/people/people.repository.js';
import { AUTH_KEYS, type AuthKeys } from '../src/auth/secrets.js';
import { BADGE_LOCK_MS } from '../src/auth/badge-lockout.js';
import { badgeSignIn, call, DEMO, login } from './support/auth-helpers.js';
import { startTestHub, tempDataDir, type TestHub } from './support/test-app.js';

describe('sign-in, on a hub with the demo shop', () => {
  let hub: TestHub;
  let data: Awaited<ReturnType<typeof tempDataDir>>;
  let clock: Clock;

  beforeAll(async () => {
    data = await tempDataDir();
    hub = await startTestHub(data.dir, { TARELINE_SIGN_IN_LIMIT: '1000' });
    clock = hub.app.get(CLOCK);
  });

  afterAll(async () => {
    await hub?.close();
    await data?.remove();
  });

  afterEach(() => {
    vi.restoreAllMocks();
  });

  function rawBadgeSignIn(badge: string, pin: string): Promise<Response> {
    return fetch(`${hub.url}/api/auth/badge`, {
      method: 'POST',
      headers: { 'Content-Type': 'application/json' },
      body: JSON.stringify({ benchId: 'bench-1', badge, pin }),
    });
  }

  it('signs an operator without a PIN in with the badge alone, at the bench scanned', async () => {
    const answer = await badgeSignIn(hub, DEMO.joss.badge);
    expect(answer.status).toBe(200);
    expect(answer.body.user).toMatchObject({ name: 'Joss Whitcombe', role: 'operator' });
    expect(answer.body.bench).toEqual({
      id: 'bench-1',
      name: 'Bench 1',
      pinRequired: false,
      idleSignOutMin: 5,
    });
    const me = await call<{ user: { name: string }; bench?: { id: string } }>(
      hub,
      'GET',
      '/api/me',
      {
        token: answer.body.token,
      },
    );
    expect(me.status).toBe(200);
    expect(me.body.user.name).toBe('Joss Whitcombe');
    expect(me.body.bench?.id).toBe('bench-1');
  });

  it('asks for the PIN of a person who has one, then signs them in with it', async () => {
    const first = await badgeSignIn(hub, DEMO.tomas.badge);
    expect(first.status).toBe(401);
    expect(first.body.errors).toEqual([{ path: 'pin', message: 'Enter your PIN' }]);
    const second = await badgeSignIn(hub, DEMO.tomas.badge, DEMO.tomas.pin);
    expect(second.status).toBe(200);
    expect(second.body.user.name).toBe('Tomas Reyl');
  });

  it('asks everyone for a PIN at a bench that requires one', async () => {
    const answer = await badgeSignIn(hub, DEMO.joss.badge, undefined, 'bench-2');
    expect(answer.status).toBe(401);
    expect(answer.body.errors[0]?.path).toBe('pin');
    // Joss has no PIN, so no PIN opens this bench for him.
    expect((await badgeSignIn(hub, DEMO.joss.badge, '0000', 'bench-2')).status).toBe(401);
  });

  it('treats a badge scanned with spaces around it as the same badge', async () => {
    const answer = await badgeSignIn(hub, `  ${DEMO.tomas.badge} `, DEMO.tomas.pin);
    expect(answer.status).toBe(200);
  });

  it('answers an unknown badge exactly like a known badge, and checks a PIN for both', async () => {
    const hasher = hub.app.get(CredentialHasher);
    const verify = vi.spyOn(hasher, 'verifySecret');

    const unknownNoPin = await badgeSignIn(hub, 'ZZ-9999');
    const knownNoPin = await badgeSignIn(hub, DEMO.priya.badge);
    expect(unknownNoPin).toEqual(knownNoPin);

    const unknownWithPin = await badgeSignIn(hub, 'ZZ-9999', '2468');
    const wrongPin = await badgeSignIn(hub, DEMO.priya.badge, '9999');
    expect(unknownWithPin).toEqual(wrongPin);
    expect(wrongPin).toEqual({
      status: 401,
      body: { message: 'Badge or PIN not recognised', errors: [] },
    });
    // Both paths pay for one scrypt check, so neither answers faster.
    expect(verify).toHaveBeenCalledTimes(2);
    // The wrong PIN counted; clear it for the other tests.
    expect((await badgeSignIn(hub, DEMO.priya.badge, DEMO.priya.pin)).status).toBe(200);
  });

  it('locks a badge for five minutes after five wrong PINs, then lets the right PIN in', async () => {
    for (let i = 1; i <= 4; i += 1) {
      expect((await badgeSignIn(hub, DEMO.priya.badge, '0000')).status).toBe(401);
    }
    const fifth = await badgeSignIn(hub, DEMO.priya.badge, '0000');
    expect(fifth.status).toBe(423);
    expect(fifth.body.message).toBe('Too many wrong PINs: this badge is locked for 5 more minutes');
    // Even the right PIN waits out the lock.
    expect((await badgeSignIn(hub, DEMO.priya.badge, DEMO.priya.pin)).status).toBe(423);

    const now = Date.now();
    vi.spyOn(clock, 'now').mockReturnValue(now + BADGE_LOCK_MS - 30_000);
    const nearlyOver = await badgeSignIn(hub, DEMO.priya.badge, DEMO.priya.pin);
    expect(nearlyOver.status).toBe(423);
    expect(nearlyOver.body.message).toContain('locked for 1 more minute');

    vi.spyOn(clock, 'now').mockReturnValue(now + BADGE_LOCK_MS + 1_000);
    const after = await badgeSignIn(hub, DEMO.priya.badge, DEMO.priya.pin);
    expect(after.status).toBe(200);
    expect(after.body.user.name).toBe('Priya Sandell');
  });

  it('locks an unknown badge the same way, so a lock says nothing about the badge', async () => {
    const answers = [];
    for (let i = 0; i < 5; i += 1) answers.push((await badgeSignIn(hub, 'ZZ-4242', '1111')).status);
    expect(answers).toEqual([401, 401, 401, 401, 423]);
  });

  it('counts at most five of thirty wrong PINs sent at once, then refuses even the right PIN', async () => {
    const hasher = hub.app.get(CredentialHasher);
    const verify = vi.spyOn(hasher, 'verifySecret');
    const answers = await Promise.all(
      Array.from({ length: 30 }, () => badgeSignIn(hub, DEMO.ilse.badge, '0000')),
    );
    const statuses = answers.map((a) => a.status).sort();
    // Four wrong PINs refused as such, the fifth locks the badge, the rest meet the lock.
    expect(statuses).toEqual([...Array(4).fill(401), ...Array(26).fill(423)]);
    expect(verify).toHaveBeenCalledTimes(5);
    const right = await badgeSignIn(hub, DEMO.ilse.badge, DEMO.ilse.pin);
    expect(right.status).toBe(423);
    expect(right.body.message).toBe('Too many wrong PINs: this badge is locked for 5 more minutes');

    vi.spyOn(clock, 'now').mockReturnValue(Date.now() + BADGE_LOCK_MS + 1_000);
    expect((await badgeSignIn(hub, DEMO.ilse.badge, DEMO.ilse.pin)).status).toBe(200);
  });

  it('tells the locked-out bench when to try again', async () => {
    const answers = [];
    for (let i = 0; i < 5; i += 1) answers.push(await rawBadgeSignIn('ZZ-5150', '2222'));
    const locked = answers.at(-1)!;
    expect(locked.status).toBe(423);
    // Five minutes, in seconds (the lock's length).
    expect(locked.headers.get('retry-after')).toBe(String(BADGE_LOCK_MS / 1000));
  });

  it('answers the badge of a switched-off person without a PIN exactly like an unknown badge', async () => {
    const people = hub.app.get(PeopleRepository);
    const joss = (await people.list()).find((p) => p.name === 'Joss Whitcombe')!;
    await people.update(joss.id, { active: false }, () => []);
    try {
      const unknownScan = await badgeSignIn(hub, 'ZZ-7777');
      const switchedOffScan = await badgeSignIn(hub, DEMO.joss.badge);
      expect(switchedOffScan).toEqual(unknownScan);
      expect(switchedOffScan.status).toBe(401);
      const unknownWithPin = await badgeSignIn(hub, 'ZZ-7777', '1234');
      const switchedOffWithPin = await badgeSignIn(hub, DEMO.joss.badge, '1234');
      expect(switchedOffWithPin).toEqual(unknownWithPin);
      expect(switchedOffWithPin).toEqual({
        status: 401,
        body: { message: 'Badge or PIN not recognised', errors: [] },
      });
    } finally {
      await people.update(joss.id, { active: true }, () => []);
    }
  });

  it('refuses a person who was deactivated, and ends their open session', async () => {
    const signedIn = await badgeSignIn(hub, DEMO.tomas.badge, DEMO.tomas.pin);
    const people = hub.app.get(PeopleRepository);
    const tomas = (await people.list()).find((p) => p.name === 'Tomas Reyl')!;
    await people.update(tomas.id, { active: false }, () => []);
    try {
      const again = await badgeSignIn(hub, DEMO.tomas.badge, DEMO.tomas.pin);
      expect(again.status).toBe(403);
      expect(again.body.message).toBe('Your sign-in has been switched off: ask an admin');
      const me = await call<{ message: string }>(hub, 'GET', '/api/me', {
        token: signedIn.body.token,
      });
      expect(me.status).toBe(401);
      expect(me.body.message).toBe('Your sign-in has been switched off: ask an admin');
    } finally {
      await people.update(tomas.id, { active: true }, () => []);
    }
  });

  it('refuses an expired token', async () => {
    const keys = hub.app.get<AuthKeys>(AUTH_KEYS);
    const people = hub.app.get(PeopleRepository);
    const joss = (await people.list()).find((p) => p.name === 'Joss Whitcombe')!;
    const past = Math.floor(Date.now() / 1000) - 3600;
    const expired = await new JwtService().signAsync(
      { sub: joss.id, role: 'operator', jti: 'expired-one', iat: past - 60, exp: past },
      { secret: keys.jwtSecret },
    );
    const me = await call<{ message: string }>(hub, 'GET', '/api/me', { token: expired });
    expect(me.status).toBe(401);
    expect(me.body.message).toBe('Your session has ended: sign in again');
  });

  it('refuses a correctly signed token that never runs out (no expiry in it)', async () => {
    const keys = hub.app.get<AuthKeys>(AUTH_KEYS);
    const people = hub.app.get(PeopleRepository);
    const admin = (await people.list()).find((p) => p.role === 'admin')!;
    const forever = await new JwtService().signAsync(
      { sub: admin.id, role: 'admin', jti: 'never-expires', iat: Math.floor(Date.now() / 1000) },
      { secret: keys.jwtSecret },
    );
    const answer = await call<{ message: string }>(hub, 'GET', '/api/people', { token: forever });
    expect(answer.status).toBe(401);
    expect(answer.body.message).toBe('Your session has ended: sign in again');
  });

  it('refuses a token signed with another secret', async () => {
    const people = hub.app.get(PeopleRepository);
    const admin = (await people.list()).find((p) => p.role === 'admin')!;
    const forged = await new JwtService().signAsync(
      { sub: admin.id, role: 'admin', jti: 'forged' },
      { secret: 'not-the-hub-secret-not-the-hub-secret', expiresIn: 600 },
    );
    expect((await call(hub, 'GET', '/api/people', { token: forged })).status).toBe(401);
  });

  it('says "sign in first" to a request without a token', async () => {
    const me = await call<{ message: string }>(hub, 'GET', '/api/me');
    expect(me).toEqual({ status: 401, body: { message: 'Sign in first', errors: [] } });
  });

  it('signs out: the token stops working, another session of the person does not', async () => {
    const bench = (await badgeSignIn(hub, DEMO.joss.badge)).body.token;
    const other = (await badgeSignIn(hub, DEMO.joss.badge)).body.token;
    expect((await call(hub, 'POST', '/api/auth/logout', { token: bench })).status).toBe(204);
    expect((await call(hub, 'GET', '/api/me', { token: bench })).status).toBe(401);
    expect((await call(hub, 'GET', '/api/me', { token: other })).status).toBe(200);
  });

  it('signs a lead in at a desk with e-mail and password, any letter case in the e-mail', async () => {
    const answer = await call<{ user: { name: string; role: string }; bench?: unknown }>(
      hub,
      'POST',
      '/api/auth/login',
      { body: { email: 'Ilse.Varga@Hollin-Ridge.example', password: DEMO.lead.password } },
    );
    expect(answer.status).toBe(200);
    expect(answer.body.user).toMatchObject({ name: 'Ilse Varga', role: 'lead' });
    expect(answer.body.bench).toBeUndefined();
  });

  it('answers a wrong password and an unknown e-mail alike', async () => {
    const wrong = await call(hub, 'POST', '/api/auth/login', {
      body: { email: DEMO.lead.email, password: 'not the password' },
    });
    const unknown = await call(hub, 'POST', '/api/auth/login', {
      body: { email: 'nobody@hollin-ridge.example', password: 'not the password' },
    });
    expect(wrong).toEqual(unknown);
    expect(wrong).toEqual({
      status: 401,
      body: { message: 'E-mail or password not recognised', errors: [] },
    });
  });

  it('names every bad field of a sign-in body', async () => {
    const answer = await call<{ errors: { path: string }[] }>(hub, 'POST', '/api/auth/badge', {
      body: { benchId: '', badge: 'x', pin: '12' },
    });
    expect(answer.status).toBe(400);
    expect(answer.body.errors.map((e) => e.path).sort()).toEqual(['badge', 'benchId', 'pin']);
  });

  it('refuses a badge at a bench that does not exist', async () => {
    const answer = await badgeSignIn(hub, DEMO.joss.badge, undefined, 'bench-99');
    expect(answer.status).toBe(404);
    expect(answer.body.message).toContain('No bench called "bench-99"');
  });

  it('stores no badge code, PIN or password as given, and keeps its secrets private', async () => {
    const rows = await hub.app.get(PeopleRepository).list();
    const stored = JSON.stringify(rows);
    for (const secret of ['HR-1001', '1357', DEMO.admin.password]) {
      expect(stored).not.toContain(secret);
    }
    for (const file of ['jwt-secret', 'badge-key']) {
      const info = await stat(join(data.dir, file));
      expect(info.mode & 0o777).toBe(0o600);
    }
  });
});

describe('sign-in rate limit', () => {
  it('refuses the fourth sign-in attempt in a minute from one address when the limit is 3', async () => {
    const data = await tempDataDir();
    const hub = await startTestHub(data.dir, { TARELINE_SIGN_IN_LIMIT: '3' });
    try {
      const statuses = [];
      for (let i = 0; i < 3; i += 1) statuses.push((await badgeSignIn(hub, 'ZZ-0001')).status);
      const fourth = await badgeSignIn(hub, DEMO.joss.badge);
      expect(statuses).toEqual([401, 401, 401]);
      expect(fourth.status).toBe(429);
      expect(fourth.body.message).toBe(
        'Too many sign-in attempts from this device: wait a minute and try again',
      );
      // Desk sign-in shares the limit; other routes do not.
      expect((await call(hub, 'POST', '/api/auth/login', { body: DEMO.lead })).status).toBe(429);
      expect((await call(hub, 'GET', '/api/health')).status).toBe(200);
    } finally {
      await hub.close();
      await data.remove();
    }
  });
});

describe('first start without the demo shop', () => {
  it('creates the first admin from the environment and nobody else', async () => {
    const data = await tempDataDir();
    const hub = await startTestHub(data.dir, {
      TARELINE_DEMO: '0',
      TARELINE_ADMIN_EMAIL: 'first.admin@example.test',
      TARELINE_ADMIN_PASSWORD: 'a long first password',
    });
    try {
      const token = await login(hub, 'first.admin@example.test', 'a long first password');
      const people = await call<{ name: string; role: string }[]>(hub, 'GET', '/api/people', {
        token,
      });
      expect(people.body).toEqual([
        expect.objectContaining({ name: 'Administrator', role: 'admin' }),
      ]);
    } finally {
      await hub.close();
      await data.remove();
    }
  });
});
