import type { Batch, Material } from '@tareline/protocol';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { restoreBackup, RestoreTargetNotEmptyError } from '../src/backup/backup.js';
import { badgeSignIn, call, DEMO, login } from './support/auth-helpers.js';
import { startTestHub, tempDataDir, type TestHub } from './support/test-app.js';

describe('backup of a running hub, restored into an empty folder', () => {
  let data: Awaited<ReturnType<typeof tempDataDir>>;
  let restored: Awaited<ReturnType<typeof tempDataDir>>;
  let hub: TestHub;

  beforeAll(async () => {
    data = await tempDataDir();
    restored = await tempDataDir();
    hub = await startTestHub(data.dir);
  });

  afterAll(async () => {
    await hub?.close();
    await data?.remove();
    await restored?.remove();
  });

  it('keeps every batch and person', async () => {
    const joss = await badgeSignIn(hub, DEMO.joss.badge);
    const token = joss.body.token;
    const materials = await call<Material[]>(hub, 'GET', '/api/materials', { token });
    const batch = await call<Batch>(hub, 'POST', '/api/batches', {
      token,
      body: { benchId: 'bench-1', materialId: materials.body[0]!.id, totalMassG: 50 },
    });
    await call(hub, 'POST', `/api/batches/${batch.body.id}/abandon`, {
      token,
      body: { reason: 'Kept for the backup test' },
    });
    const admin = await login(hub, DEMO.admin.email, DEMO.admin.password);
    // Operators and leads get no backup: it holds every record, hashes included.
    const refused = await fetch(`${hub.url}/api/backup`, {
      headers: { Authorization: `Bearer ${token}` },
    });
    expect(refused.status).toBe(403);
    const res = await fetch(`${hub.url}/api/backup`, {
      headers: { Authorization: `Bearer ${admin}` },
    });
    expect(res.status).toBe(200);
    expect(res.headers.get('content-disposition')).toMatch(
      /attachment; filename="tareline-backup-/,
    );
    const backup = Buffer.from(await res.arrayBuffer());
    const people = await call<{ name: string }[]>(hub, 'GET', '/api/people', { token: admin });

    await restoreBackup(restored.dir, backup);
    await expect(restoreBackup(restored.dir, backup)).rejects.toThrow(RestoreTargetNotEmptyError);
    const second = await startTestHub(restored.dir, {}, { template: 'none' });
    try {
      const lead = await login(second, DEMO.lead.email, DEMO.lead.password);
      const back = await call<Batch>(second, 'GET', `/api/batches/${batch.body.id}`, {
        token: lead,
      });
      expect(back.body).toMatchObject({
        state: 'abandoned',
        abandonReason: 'Kept for the backup test',
        operator: { name: 'Joss Whitcombe' },
      });
      const adminThere = await login(second, DEMO.admin.email, DEMO.admin.password);
      const peopleThere = await call<{ name: string }[]>(second, 'GET', '/api/people', {
        token: adminThere,
      });
      expect(peopleThere.body.map((p) => p.name).sort()).toEqual(
        people.body.map((p) => p.name).sort(),
      );
      // Badges still sign in: the keys that check them came along.
      expect((await badgeSignIn(second, DEMO.joss.badge)).status).toBe(200);
    } finally {
      await second.close();
    }
  });
});
