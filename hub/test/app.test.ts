import { mkdir, readFile, writeFile } from 'node:fs/promises';
import { join } from 'node:path';
import { healthResponseSchema } from '@tareline/protocol';
import { sql } from 'drizzle-orm';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { DataDirInUseError } from '../src/database/data-dir.js';
import { Database } from '../src/database/database.js';
import { startTestHub, tempDataDir, type TestHub } from './support/test-app.js';

describe('hub, booted for real on a temporary PGlite folder', () => {
  let hub: TestHub;
  let data: Awaited<ReturnType<typeof tempDataDir>>;
  let station: Awaited<ReturnType<typeof tempDataDir>>;

  beforeAll(async () => {
    data = await tempDataDir();
    // A stand-in for the built station, so its page is served whether or not it was built.
    station = await tempDataDir();
    await mkdir(join(station.dir, 'assets'));
    await writeFile(join(station.dir, 'index.html'), '<!doctype html><title>Tareline</title>');
    hub = await startTestHub(data.dir, { TARELINE_STATION_DIR: station.dir });
  });

  afterAll(async () => {
    await hub?.close();
    await data?.remove();
    await station?.remove();
  });

  it.each(['/', '/bench', '/api/health'])(
    'sends security headers with %s: scripts, styles and connections from the hub only',
    async (path) => {
      const res = await fetch(`${hub.url}${path}`);
      expect(res.status).toBe(200);
      const policy = new Map(
        (res.headers.get('content-security-policy') ?? '').split(';').map((directive) => {
          const [name, ...sources] = directive.trim().split(/\s+/u);
          return [name, sources] as const;
        }),
      );
      expect(policy.get('default-src')).toEqual(["'self'"]);
      expect(policy.get('script-src')).toEqual(["'self'"]);
      expect(policy.get('script-src-attr')).toEqual(["'none'"]);
      expect(policy.get('style-src')).toEqual(["'self'"]);
      expect(policy.get('connect-src')).toEqual(["'self'"]);
      expect(policy.get('object-src')).toEqual(["'none'"]);
      expect(policy.get('frame-ancestors')).toEqual(["'none'"]);
      // The hub is reached over plain HTTP on the shop network.
      expect(policy.has('upgrade-insecure-requests')).toBe(false);
      expect(res.headers.get('strict-transport-security')).toBeNull();
      expect(res.headers.get('x-content-type-options')).toBe('nosniff');
      expect(res.headers.get('referrer-policy')).toBe('no-referrer');
      expect(res.headers.get('x-frame-options')).toBe('DENY');
      expect(res.headers.get('x-powered-by')).toBeNull();
    },
  );

  it('answers /api/health with the database ok', async () => {
    const res = await fetch(`${hub.url}/api/health`);
    expect(res.status).toBe(200);
    const body = healthResponseSchema.parse(await res.json());
    expect(body.status).toBe('ok');
    expect(body.db).toEqual({ ok: true, driver: 'pglite' });
    expect(body.version).toBe(hub.config.version);
  });

  it('has applied every migration in drizzle/', async () => {
    const journal = JSON.parse(
      await readFile(join(hub.config.paths.migrations, 'meta', '_journal.json'), 'utf8'),
    ) as { entries: unknown[] };
    const database = hub.app.get(Database);
    const applied = await database.rows<{ n: number }>(
      sql`select count(*)::int as n from drizzle.__drizzle_migrations`,
    );
    expect(applied[0]?.n).toBe(journal.entries.length);
    const tables = await database.rows<{ table_name: string }>(
      sql`select table_name from information_schema.tables where table_schema = 'public'`,
    );
    expect(tables.map((r) => r.table_name)).toContain('benches');
  });

  it('refuses a second hub on the same data folder with a clear message', async () => {
    await expect(startTestHub(data.dir)).rejects.toThrow(DataDirInUseError);
    await expect(startTestHub(data.dir)).rejects.toThrow(/already in use by another Tareline hub/);
    // The first hub is unharmed.
    const res = await fetch(`${hub.url}/api/health`);
    expect(((await res.json()) as { status: string }).status).toBe('ok');
  });

  it('answers an unknown API route with 404 in the error shape, not the station page', async () => {
    const res = await fetch(`${hub.url}/api/no-such-thing`);
    expect(res.status).toBe(404);
    const body = (await res.json()) as { message: string; errors: unknown[] };
    expect(body.message).toMatch(/Cannot GET/);
    expect(body.errors).toEqual([]);
  });

  it('reports degraded, not a crash, when the database stops answering', async () => {
    const database = hub.app.get(Database);
    const original = database.ping.bind(database);
    database.ping = () => Promise.reject(new Error('database closed'));
    try {
      const res = await fetch(`${hub.url}/api/health`);
      expect(res.status).toBe(200);
      const body = healthResponseSchema.parse(await res.json());
      expect(body.status).toBe('degraded');
      expect(body.db.ok).toBe(false);
    } finally {
      database.ping = original;
    }
  });
});

describe('data folder', () => {
  it('keeps its data across a close and a reopen', async () => {
    const data = await tempDataDir();
    try {
      const migrations = join(import.meta.dirname, '..', '..', 'drizzle');
      const first = await Database.open(data.dir, migrations);
      await first.db.execute(sql`insert into benches (id, name) values ('bench-9', 'Resin bench')`);
      await first.close();
      const second = await Database.open(data.dir, migrations);
      const rows = await second.rows<{ name: string }>(
        sql`select name from benches where id = 'bench-9'`,
      );
      await second.close();
      expect(rows).toEqual([{ name: 'Resin bench' }]);
    } finally {
      await data.remove();
    }
  });
});
