import { execFileSync, spawnSync } from 'node:child_process';
import { chownSync, existsSync, mkdtempSync, readdirSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { freePort } from '../faults/built-hub.js';

/** A throwaway PostgreSQL server: its own folder, a free loopback port, trust auth. */
export interface PgCluster {
  /** `postgres://postgres@127.0.0.1:PORT/postgres`: the maintenance database. */
  adminUrl: string;
  port: number;
  stop(): void;
}

/** Debian keeps the server programs under /usr/lib/postgresql/<major>/bin, off the PATH. */
function pgBin(program: string): string {
  const root = '/usr/lib/postgresql';
  if (existsSync(root)) {
    const majors = readdirSync(root).sort((a, b) => Number(b) - Number(a));
    for (const major of majors) {
      const path = join(root, major, 'bin', program);
      if (existsSync(path)) return path;
    }
  }
  return program;
}

/** PostgreSQL refuses to run as root: as root, run its programs as the `postgres` user. */
function runAsServerUser(program: string, args: string[]): void {
  const asRoot = process.getuid?.() === 0;
  const [cmd, argv] = asRoot
    ? ['runuser', ['-u', 'postgres', '--', program, ...args]]
    : [program, args];
  const result = spawnSync(cmd, argv, { encoding: 'utf8', stdio: 'pipe' });
  if (result.status !== 0) {
    throw new Error(
      `${program} ${args.join(' ')} failed (${result.status}): ${result.stderr || result.stdout}` +
        (result.error ? ` ${result.error.message}` : '') +
        "\nInstall Debian's postgresql package (apt-get install -y postgresql).",
    );
  }
}

export async function startPgCluster(): Promise<PgCluster> {
  const dir = mkdtempSync(join(tmpdir(), 'tareline-pg-'));
  if (process.getuid?.() === 0) {
    const uid = Number(execFileSync('id', ['-u', 'postgres'], { encoding: 'utf8' }).trim());
    const gid = Number(execFileSync('id', ['-g', 'postgres'], { encoding: 'utf8' }).trim());
    chownSync(dir, uid, gid);
  }
  const data = join(dir, 'data');
  runAsServerUser(pgBin('initdb'), [
    '-D',
    data,
    '-A',
    'trust',
    '-U',
    'postgres',
    '-E',
    'UTF8',
    '--no-sync',
  ]);
  const port = await freePort();
  const options = [
    `-p ${port}`,
    `-k ${dir}`,
    "-c listen_addresses='127.0.0.1'",
    // Throwaway data: durability only costs time here.
    '-c fsync=off',
    '-c synchronous_commit=off',
    '-c full_page_writes=off',
    '-c max_connections=300',
  ].join(' ');
  runAsServerUser(pgBin('pg_ctl'), [
    '-D',
    data,
    '-o',
    options,
    '-l',
    join(dir, 'server.log'),
    '-w',
    'start',
  ]);
  let stopped = false;
  return {
    adminUrl: `postgres://postgres@127.0.0.1:${port}/postgres`,
    port,
    stop: () => {
      if (stopped) return;
      stopped = true;
      try {
        runAsServerUser(pgBin('pg_ctl'), ['-D', data, '-m', 'immediate', '-w', 'stop']);
      } finally {
        rmSync(dir, { recursive: true, force: true });
      }
    },
  };
}
