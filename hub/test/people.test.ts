import type { Person } from '@tareline/protocol';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { badgeSignIn, call, DEMO, login } from './support/auth-helpers.js';
import { startTestHub, tempDataDir, type TestHub } from './support/test-app.js';

describe('people routes (admins)', () => {
  let hub: TestHub;
  let data: Awaited<ReturnType<typeof tempDataDir>>;
  let admin: string;

  beforeAll(async () => {
    data = await tempDataDir();
    hub = await startTestHub(data.dir, { TARELINE_SIGN_IN_LIMIT: '1000' });
    admin = await login(hub, DEMO.admin.email, DEMO.admin.password);
  });

  afterAll(async () => {
    await hub?.close();
    await data?.remove();
  });

  const asAdmin = <T = Person>(method: string, path: string, body?: unknown) =>
    call<T & { message: string; errors: { path: string; message: string }[] }>(hub, method, path, {
      token: admin,
      body,
    });

  it('lists the demo shop with what each person has, never the secrets', async () => {
    const answer = await asAdmin<Person[]>('GET', '/api/people');
    expect(answer.status).toBe(200);
    expect(answer.body.map((p) => `${p.name} (${p.role})`)).toEqual([
      'Ilse Varga (lead)',
      'Joss Whitcombe (operator)',
      'Oda Fenwick (admin)',
      'Priya Sandell (operator)',
      'Tomas Reyl (operator)',
    ]);
    const joss = answer.body.find((p) => p.name === 'Joss Whitcombe')!;
    expect(joss).toMatchObject({ hasBadge: true, hasPin: false, hasPassword: false, active: true });
    expect(JSON.stringify(answer.body)).not.toMatch(/Hash|HR-1003/);
  });

  it('adds an operator with a badge and PIN, who can then sign in at a bench', async () => {
    const added = await asAdmin('POST', '/api/people', {
      name: 'Wren Castellan',
      role: 'operator',
      badge: 'HR-1010',
      pin: '8080',
    });
    expect(added.status).toBe(201);
    expect(added.body).toMatchObject({ name: 'Wren Castellan', hasBadge: true, hasPin: true });
    const signIn = await badgeSignIn(hub, 'HR-1010', '8080');
    expect(signIn.status).toBe(200);
    expect(signIn.body.user.name).toBe('Wren Castellan');
  });

  it('names each bad field, and wants an e-mail and password for a lead', async () => {
    const answer = await asAdmin('POST', '/api/people', {
      name: '',
      role: 'lead',
      pin: '12a4',
    });
    expect(answer.status).toBe(400);
    expect(answer.body.errors).toEqual(
      expect.arrayContaining([
        { path: 'name', message: 'Enter a name' },
        { path: 'pin', message: 'A PIN is 4 to 8 digits' },
        { path: 'email', message: 'A lead or admin needs an e-mail' },
        { path: 'password', message: 'A lead or admin needs a password' },
      ]),
    );
  });

  it('refuses a badge that already belongs to someone', async () => {
    const answer = await asAdmin('POST', '/api/people', {
      name: 'Badge Borrower',
      role: 'operator',
      badge: DEMO.tomas.badge,
    });
    expect(answer.status).toBe(409);
    expect(answer.body.errors[0]).toMatchObject({ path: 'badge' });
  });

  it('gives an e-mail to one of two people added with it at the same moment, and says why to the other', async () => {
    const lead = (name: string) => ({
      name,
      role: 'lead',
      email: 'bench.lead@hollin-ridge.example',
      password: 'a desk password',
    });
    const answers = await Promise.all([
      asAdmin('POST', '/api/people', lead('Rowan Tilley')),
      asAdmin('POST', '/api/people', lead('Rowan Tilly')),
    ]);
    expect(answers.map((a) => a.status).sort()).toEqual([201, 409]);
    const refused = answers.find((a) => a.status === 409)!;
    expect(refused.body.errors).toEqual([
      { path: 'email', message: 'Someone else already has this e-mail' },
    ]);
  });

  it('assigns a new badge: the old one stops working, the new one signs in', async () => {
    const joss = (await asAdmin<Person[]>('GET', '/api/people')).body.find(
      (p) => p.name === 'Joss Whitcombe',
    )!;
    expect(
      (await asAdmin('PUT', `/api/people/${joss.id}/badge`, { badge: 'HR-2003' })).status,
    ).toBe(200);
    expect((await badgeSignIn(hub, 'HR-2003')).status).toBe(200);
    expect((await badgeSignIn(hub, DEMO.joss.badge)).status).toBe(401);
    await asAdmin('PUT', `/api/people/${joss.id}/badge`, { badge: DEMO.joss.badge });
  });

  it('resets a PIN: the new one works, the old one does not; null removes it', async () => {
    const priya = (await asAdmin<Person[]>('GET', '/api/people')).body.find(
      (p) => p.name === 'Priya Sandell',
    )!;
    const reset = await asAdmin('PUT', `/api/people/${priya.id}/pin`, { pin: '5555' });
    expect(reset.status).toBe(200);
    expect((await badgeSignIn(hub, DEMO.priya.badge, '5555')).status).toBe(200);
    expect((await badgeSignIn(hub, DEMO.priya.badge, DEMO.priya.pin)).status).toBe(401);
    const removed = await asAdmin('PUT', `/api/people/${priya.id}/pin`, { pin: null });
    expect(removed.body.hasPin).toBe(false);
    expect((await badgeSignIn(hub, DEMO.priya.badge)).status).toBe(200);
    await asAdmin('PUT', `/api/people/${priya.id}/pin`, { pin: DEMO.priya.pin });
  });

  it('promotes an operator to lead only once they have an e-mail and a password', async () => {
    const tomas = (await asAdmin<Person[]>('GET', '/api/people')).body.find(
      (p) => p.name === 'Tomas Reyl',
    )!;
    const tooSoon = await asAdmin('PATCH', `/api/people/${tomas.id}`, { role: 'lead' });
    expect(tooSoon.status).toBe(409);
    expect(tooSoon.body.message).toContain('give Tomas Reyl an e-mail and a password first');

    const password = await asAdmin('PUT', `/api/people/${tomas.id}/password`, {
      password: 'tomas desk password',
    });
    expect(password.body.hasPassword).toBe(true);
    const promoted = await asAdmin('PATCH', `/api/people/${tomas.id}`, {
      role: 'lead',
      email: 'tomas.reyl@hollin-ridge.example',
    });
    expect(promoted.status).toBe(200);
    expect(promoted.body.role).toBe('lead');
    const token = await login(hub, 'tomas.reyl@hollin-ridge.example', 'tomas desk password');
    const me = await call<{ user: { role: string } }>(hub, 'GET', '/api/me', { token });
    expect(me.body.user.role).toBe('lead');
    await asAdmin('PATCH', `/api/people/${tomas.id}`, { role: 'operator' });
  });

  it('deactivates a person: their badge no longer signs in; reactivating restores it', async () => {
    const wren = (await asAdmin<Person[]>('GET', '/api/people')).body.find(
      (p) => p.name === 'Wren Castellan',
    )!;
    const off = await asAdmin('PATCH', `/api/people/${wren.id}`, { active: false });
    expect(off.body.active).toBe(false);
    expect((await badgeSignIn(hub, 'HR-1010', '8080')).status).toBe(403);
    await asAdmin('PATCH', `/api/people/${wren.id}`, { active: true });
    expect((await badgeSignIn(hub, 'HR-1010', '8080')).status).toBe(200);
  });

  it('keeps the admin from locking themselves out', async () => {
    const oda = (await asAdmin<Person[]>('GET', '/api/people')).body.find(
      (p) => p.name === 'Oda Fenwick',
    )!;
    const answer = await asAdmin('PATCH', `/api/people/${oda.id}`, { active: false });
    expect(answer.status).toBe(409);
    expect(answer.body.message).toBe(
      'You cannot remove your own admin rights or switch yourself off',
    );
  });

  it('answers an unknown person with 404 and an empty change with 400', async () => {
    expect((await asAdmin('PATCH', '/api/people/no-such-person', { name: 'X' })).status).toBe(404);
    const empty = await asAdmin('PATCH', '/api/people/no-such-person', {});
    expect(empty.status).toBe(400);
    expect(empty.body.message).toBe('Some fields are not valid');
  });

  it('refuses a lead', async () => {
    const lead = await login(hub, DEMO.lead.email, DEMO.lead.password);
    const answer = await call<{ message: string }>(hub, 'GET', '/api/people', { token: lead });
    expect(answer).toEqual({
      status: 403,
      body: { message: 'Your role (lead) may not do this', errors: [] },
    });
  });
});
