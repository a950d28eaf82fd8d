/**
 * `npm run backup -- FILE`: writes a consistent copy of the hub's database to FILE (a gzipped
 * tarball of the embedded PostgreSQL's data folder).
 *
 * A running hub is asked for it (`GET /api/backup`, as an admin: TARELINE_BACKUP_EMAIL and
 * TARELINE_BACKUP_PASSWORD, at TARELINE_HUB_URL, default http://127.0.0.1:$PORT or :3000). With
 * no hub running, the data folder (TARELINE_DATA_DIR, default ./data) is opened and dumped
 * directly, under the same lock a hub takes.
 */
import { writeFile } from 'node:fs/promises';
import { resolve } from 'node:path';
import { backupOf } from '../src/backup/backup.js';
import { Database } from '../src/database/database.js';

const repoRoot = resolve(import.meta.dirname, '..', '..');

async function fromRunningHub(url: string): Promise<Buffer | undefined> {
  const alive = await fetch(`${url}/api/health`).then(
    (r) => r.ok,
    () => false,
  );
  if (!alive) return undefined;
  const email = process.env.TARELINE_BACKUP_EMAIL;
  const password = process.env.TARELINE_BACKUP_PASSWORD;
  if (!email || !password) {
    throw new Error(
      `A hub is running at ${url}: set TARELINE_BACKUP_EMAIL and TARELINE_BACKUP_PASSWORD ` +
        '(an admin) so it hands over a backup',
    );
  }
  const login = await fetch(`${url}/api/auth/login`, {
    method: 'POST',
    headers: { 'Content-Type': 'application/json' },
    body: JSON.stringify({ email, password }),
  });
  if (!login.ok) throw new Error(`Sign-in refused: ${login.status} ${await login.text()}`);
  const { token } = (await login.json()) as { token: string };
  const res = await fetch(`${url}/api/backup`, { headers: { Authorization: `Bearer ${token}` } });
  if (!res.ok) throw new Error(`Backup refused: ${res.status} ${await res.text()}`);
  return Buffer.from(await res.arrayBuffer());
}

async function fromDataFolder(dir: string): Promise<Buffer> {
  const database = await Database.open(dir, resolve(repoRoot, 'drizzle'));
  try {
    return await backupOf(database);
  } finally {
    await database.close();
  }
}

async function main(): Promise<void> {
  const [file] = process.argv.slice(2);
  if (!file) {
    console.error('Usage: npm run backup -- FILE');
    process.exit(2);
  }
  if (process.env.DATABASE_URL) {
    console.error(
      'DATABASE_URL is set: the data is in a PostgreSQL server, not a data folder. ' +
        'Back it up with pg_dump (docs/multi-site.md, Backups).',
    );
    process.exit(2);
  }
  const url = process.env.TARELINE_HUB_URL ?? `http://127.0.0.1:${process.env.PORT ?? 3000}`;
  const dir = resolve(process.env.TARELINE_DATA_DIR ?? resolve(repoRoot, 'data'));
  const running = await fromRunningHub(url);
  const backup = running ?? (await fromDataFolder(dir));
  await writeFile(file, backup, { mode: 0o600 });
  console.log(
    `Backup of ${running ? `the hub at ${url}` : dir} written to ${file} (${backup.length} bytes)`,
  );
}

main().catch((err: unknown) => {
  console.error(err instanceof Error ? err.message : String(err));
  process.exit(1);
});
