import 'reflect-metadata';
import { access, cp, mkdtemp, readdir, readFile, rm, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import type { INestApplication } from '@nestjs/common';
import pg from 'pg';
import lockfile from 'proper-lockfile';
import { inject } from 'vitest';
import { createApp } from '../../src/app.js';
import { loadConfig, type AppConfig } from '../../src/config/app-config.js';

export interface TestHub {
  app: INestApplication;
  config: AppConfig;
  url: string;
  close(): Promise<void>;
}

/** A temporary data folder, removed by the returned function. */
export async function tempDataDir(): Promise<{ dir: string; remove: () => Promise<void> }> {
  const dir = await mkdtemp(join(tmpdir(), 'tareline-test-'));
  return { dir, remove: () => rm(dir, { recursive: true, force: true }) };
}

async function isEmpty(dir: string): Promise<boolean> {
  return (await readdir(dir).catch(() => [])).length === 0;
}

/**
 * Boots the real hub on a loopback port with its database in `dataDir`. An empty folder starts
 * as a copy of the run's template (with the demo shop, or without it for `TARELINE_DEMO=0`);
 * `template: 'none'` makes the hub migrate and seed it itself, for tests of exactly that.
 */
export async function startTestHub(
  dataDir: string,
  env: Record<string, string> = {},
  options: { template?: 'auto' | 'none' } = {},
): Promise<TestHub> {
  const pgAdminUrl = providedPgAdminUrl();
  if (pgAdminUrl && !env.DATABASE_URL) {
    // The PostgreSQL suite: the same hub on a server database of its own.
    // A hub started again on the same folder finds the same database, as a restart would.
    const remembered = join(dataDir, 'test-database-url');
    let url = await readFile(remembered, 'utf8').catch(() => undefined);
    if (!url) {
      const kind = env.TARELINE_DEMO === '0' ? 'migrated' : 'demo';
      const template = options.template === 'none' ? undefined : await templateDatabase(kind);
      url = await createDatabase(pgAdminUrl, template);
      await writeFile(remembered, url);
    }
    env = { ...serverEnv(url), ...env };
  } else if (!env.DATABASE_URL && options.template !== 'none' && (await isEmpty(dataDir))) {
    const template = await templateFolder(env.TARELINE_DEMO === '0' ? 'migrated' : 'demo');
    if (template) await cp(template, dataDir, { recursive: true });
  }
  const config = loadConfig({
    PORT: '0',
    HOST: '127.0.0.1',
    LOG_LEVEL: process.env.TEST_LOG ?? 'silent',
    TARELINE_DATA_DIR: dataDir,
    ...env,
  });
  const app = await createApp(config);
  await app.listen(0, '127.0.0.1');
  const address = app.getHttpServer().address() as { port: number };
  return {
    app,
    config,
    url: `http://127.0.0.1:${address.port}`,
    close: () => app.close(),
  };
}

/** The run's throwaway PostgreSQL server (the PostgreSQL suite), else undefined. */
export function providedPgAdminUrl(): string | undefined {
  try {
    return inject('pgAdminUrl') || undefined;
  } catch {
    return undefined;
  }
}

/** Secrets every hub on one server shares (a server database requires them set). */
export const SHARED_SECRETS = {
  TARELINE_JWT_SECRET: 'test-jwt-secret-shared-by-every-hub-0123456789',
  TARELINE_BADGE_KEY: 'test-badge-key-shared-by-every-hub-0123456789',
} as const;

/** The environment of a hub on the server database `url`. */
export function serverEnv(url: string): Record<string, string> {
  return { DATABASE_URL: url, ...SHARED_SECRETS };
}

/** A new, empty database on the run's server (a copy of `template` when named); its URL. */
export async function createDatabase(adminUrl: string, template?: string): Promise<string> {
  const name = `t_${Date.now().toString(36)}_${Math.random().toString(36).slice(2, 8)}`;
  const client = new pg.Client({ connectionString: adminUrl });
  await client.connect();
  try {
    for (let attempt = 1; ; attempt += 1) {
      try {
        await client.query(`create database ${name}${template ? ` template ${template}` : ''}`);
        break;
      } catch (err) {
        // Two copies of one template at the same moment: the second waits its turn.
        if (attempt >= 20 || !/being accessed by other users/.test((err as Error).message)) {
          throw err;
        }
        await new Promise((r) => setTimeout(r, 100 * attempt));
      }
    }
  } finally {
    await client.end();
  }
  const url = new URL(adminUrl);
  url.pathname = `/${name}`;
  return url.toString();
}

/**
 * A database migrated (and seeded, for `demo`) once per run, to copy as a template: the
 * server-side twin of {@link templateFolder}.
 */
async function templateDatabase(kind: 'demo' | 'migrated'): Promise<string> {
  const adminUrl = providedPgAdminUrl()!;
  const root = inject('dataTemplatesDir');
  const name = `tpl_${kind}`;
  const ready = join(root, `${name}.ready`);
  const release = await lockfile.lock(root, {
    lockfilePath: join(root, `${name}.lock`),
    realpath: false,
    stale: 300_000,
    update: 10_000,
    retries: { retries: 3000, minTimeout: 50, maxTimeout: 200 },
    onCompromised: () => undefined,
  });
  try {
    const made = await access(ready).then(
      () => true,
      () => false,
    );
    if (!made) {
      const url = new URL(adminUrl);
      url.pathname = `/${name}`;
      const client = new pg.Client({ connectionString: adminUrl });
      await client.connect();
      await client.query(`create database ${name}`).finally(() => client.end());
      const data = await tempDataDir();
      try {
        const hub = await startTestHub(
          data.dir,
          { ...serverEnv(url.toString()), ...(kind === 'migrated' ? { TARELINE_DEMO: '0' } : {}) },
          { template: 'none' },
        );
        await hub.close();
      } finally {
        await data.remove();
      }
      // Copies start with no hub known and no bench taken: each test's hubs take them.
      const template = new pg.Client({ connectionString: url.toString() });
      await template.connect();
      await template
        .query('delete from hubs; update benches set hub_id = null')
        .finally(() => template.end());
      await writeFile(ready, '');
    }
  } finally {
    await release();
  }
  return name;
}

/** Fills an empty folder with a copy of the run's migrated template (no demo shop). */
export async function copyMigratedTemplate(dir: string): Promise<void> {
  const template = await templateFolder('migrated');
  if (template) await cp(template, dir, { recursive: true });
}

/**
 * A data folder migrated (and seeded with the demo shop, for `demo`) once per run: opening and
 * migrating a new PGlite folder takes seconds, copying one a few milliseconds. The first worker
 * that needs it makes it, under a lock; the others wait and copy.
 */
async function templateFolder(kind: 'demo' | 'migrated'): Promise<string | undefined> {
  let root: string;
  try {
    root = inject('dataTemplatesDir');
  } catch {
    return undefined; // a run without the global setup (the serial-port suite): start empty
  }
  if (!root) return undefined;
  const dir = join(root, kind);
  const ready = join(root, `${kind}.ready`);
  const release = await lockfile.lock(root, {
    lockfilePath: join(root, `${kind}.lock`),
    realpath: false,
    // Making a template takes seconds, many on a loaded machine: a generous staleness, so a
    // waiting worker never takes the lock from one still making it.
    stale: 300_000,
    update: 10_000,
    retries: { retries: 3000, minTimeout: 50, maxTimeout: 200 },
    onCompromised: () => undefined,
  });
  try {
    const made = await access(ready).then(
      () => true,
      () => false,
    );
    if (!made) {
      const hub = await startTestHub(dir, kind === 'migrated' ? { TARELINE_DEMO: '0' } : {}, {
        template: 'none',
      });
      await hub.close();
      await writeFile(ready, '');
    }
  } finally {
    await release();
  }
  return dir;
}
