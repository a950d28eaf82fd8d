import type { AuditPage, Person } from '@tareline/protocol';
import { afterEach, describe, expect, it, vi } from 'vitest';
import { Database } from '../src/database/database.js';
import { badgeSignIn, call, DEMO, login } from './support/auth-helpers.js';
import { startTestHub, tempDataDir, type TestHub } from './support/test-app.js';

/**
 * A full disk as the hub meets it: every statement that writes fails the way PostgreSQL fails on
 * a full disk (SQLSTATE 53100, disk_full), while reads still answer.
 */
function fillTheDisk(hub: TestHub): void {
  const { db } = hub.app.get(Database);
  const diskFull = () => {
    throw Object.assign(new Error('could not extend file: No space left on device'), {
      code: '53100',
    });
  };
  vi.spyOn(db, 'insert').mockImplementation(diskFull);
  vi.spyOn(db, 'update').mockImplementation(diskFull);
  vi.spyOn(db, 'delete').mockImplementation(diskFull);
  // Writes inside a transaction (a change and its audit entry) go through the transaction's own
  // query builder: a full disk fails those the same way.
  const transaction = db.transaction.bind(db);
  vi.spyOn(db, 'transaction').mockImplementation((work, config) =>
    transaction(async (tx) => {
      vi.spyOn(tx, 'insert').mockImplementation(diskFull);
      vi.spyOn(tx, 'update').mockImplementation(diskFull);
      vi.spyOn(tx, 'delete').mockImplementation(diskFull);
      return work(tx);
    }, config),
  );
}

/** Frees the disk, stops the hub (which writes what waited) and starts it again on its data. */
async function freeTheDiskAndRestart(hub: TestHub, dataDir: string): Promise<TestHub> {
  vi.restoreAllMocks();
  await hub.close();
  return startTestHub(dataDir, { TARELINE_SIGN_IN_LIMIT: '1000' });
}

describe('a hub whose disk is full', { timeout: 90_000 }, () => {
  let hub: TestHub | undefined;
  let data: Awaited<ReturnType<typeof tempDataDir>> | undefined;

  afterEach(async () => {
    vi.restoreAllMocks();
    await hub?.close();
    await data?.remove();
    hub = undefined;
    data = undefined;
  });

  it('refuses a signed-out token at once, says the sign-out is not saved yet, and saves it later', async () => {
    data = await tempDataDir();
    hub = await startTestHub(data.dir, { TARELINE_SIGN_IN_LIMIT: '1000' });
    const token = (await badgeSignIn(hub, DEMO.joss.badge)).body.token;

    fillTheDisk(hub);
    const signOut = await call<{ message: string }>(hub, 'POST', '/api/auth/logout', { token });
    expect(signOut.status).toBe(503);
    expect(signOut.body.message).toContain('You are signed out on this hub');
    expect((await call(hub, 'GET', '/api/me', { token })).status).toBe(401);

    hub = await freeTheDiskAndRestart(hub, data.dir);
    const me = await call<{ message: string }>(hub, 'GET', '/api/me', { token });
    expect(me.status).toBe(401);
    expect(me.body.message).toBe('Your session has ended: sign in again');
  });

  it('still counts wrong PINs, locks the badge, and keeps the lock across a restart', async () => {
    data = await tempDataDir();
    hub = await startTestHub(data.dir, { TARELINE_SIGN_IN_LIMIT: '1000' });

    fillTheDisk(hub);
    const answers = [];
    for (let i = 0; i < 5; i += 1) answers.push(await badgeSignIn(hub, DEMO.tomas.badge, '0000'));
    expect(answers.map((a) => a.status)).toEqual([503, 503, 503, 503, 423]);
    expect(answers[0]!.body.message).toContain('Badge or PIN not recognised');
    expect(answers[0]!.body.message).toContain('could not save this attempt');
    expect((await badgeSignIn(hub, DEMO.tomas.badge, DEMO.tomas.pin)).status).toBe(423);

    hub = await freeTheDiskAndRestart(hub, data.dir);
    expect((await badgeSignIn(hub, DEMO.tomas.badge, DEMO.tomas.pin)).status).toBe(423);
  });

  it('answers a change to a person with 503 in words, and changes nothing', async () => {
    data = await tempDataDir();
    hub = await startTestHub(data.dir, { TARELINE_SIGN_IN_LIMIT: '1000' });
    const admin = await login(hub, DEMO.admin.email, DEMO.admin.password);

    fillTheDisk(hub);
    const added = await call<{ message: string }>(hub, 'POST', '/api/people', {
      token: admin,
      body: { name: 'Noor Ashgrove', role: 'operator', badge: 'HR-1020' },
    });
    expect(added.status).toBe(503);
    expect(added.body.message).toContain('nothing was changed');

    const joss = (await call<Person[]>(hub, 'GET', '/api/people', { token: admin })).body.find(
      (p) => p.name === 'Joss Whitcombe',
    )!;
    const renamed = await call<{ message: string }>(hub, 'PATCH', `/api/people/${joss.id}`, {
      token: admin,
      body: { name: 'Joss Whitcombe-Ash' },
    });
    expect(renamed.status).toBe(503);
    expect(renamed.body.message).toContain('nothing was changed');

    vi.restoreAllMocks();
    const people = await call<Person[]>(hub, 'GET', '/api/people', { token: admin });
    expect(people.body.map((p) => p.name)).not.toContain('Noor Ashgrove');
    expect(people.body.find((p) => p.id === joss.id)).toMatchObject({
      name: 'Joss Whitcombe',
      role: 'operator',
    });
    // Nor did the audit trail keep an entry of either.
    const trail = await call<AuditPage>(hub, 'GET', '/api/audit?entity=person&limit=500', {
      token: admin,
    });
    expect(trail.body.items.filter((e) => e.action !== 'person.created' || e.actor)).toEqual([]);
  });
});
